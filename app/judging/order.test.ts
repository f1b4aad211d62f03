import { describe, expect, it } from "vitest";
import { fnv1a32, ORDER_SEED_V2, orderSeedFor, seededOrder } from "./order";

const ids = Array.from({ length: 12 }, (_, i) => `entry-${i}`);

describe("seeded presentation order", () => {
  it("hashes with FNV-1a 32-bit over the UTF-8 bytes (the published test vectors)", () => {
    // Source: IETF Internet-Draft draft-eastlake-fnv-21, "The FNV Non-Cryptographic Hash Algorithm" (7 January 2024),
    // its FNV-1a 32-bit test vectors over the octets of the ASCII strings (without a trailing NUL).
    expect(fnv1a32("")).toBe(0x811c9dc5);
    expect(fnv1a32("a")).toBe(0xe40c292c);
    expect(fnv1a32("foobar")).toBe(0xbf9cf968);
    // the same draft's vectors with a trailing NUL octet: the NUL is hashed as one byte, not two
    expect(fnv1a32("\0")).toBe(0x050c5d1f);
    expect(fnv1a32("a\0")).toBe(0x2b24d044);
    expect(fnv1a32("foobar\0")).toBe(0x0c1c9eb8);
  });

  it("hashes text beyond ASCII as its UTF-8 octets (RFC 3629), not as UTF-16 code units", () => {
    // "é" is U+00E9, two octets C3 A9 in UTF-8 (RFC 3629 section 3); "😀" is U+1F600, F0 9F 98 80 (one surrogate
    // pair in UTF-16). Spelled as single-octet characters the octets hash alike only if the input is UTF-8.
    expect(fnv1a32("é")).toBe(fnv1a32Latin1("\xc3\xa9"));
    expect(fnv1a32("😀")).toBe(fnv1a32Latin1("\xf0\x9f\x98\x80"));
  });

  it("keeps an order stored under the old key hash and uses FNV-1a for versioned keys", () => {
    // A stored seed without the version prefix keeps the order it always gave (the hash over UTF-16 code units,
    // low byte then high byte). This order was recorded from the first release's code for an md5-shaped seed.
    const six = Array.from({ length: 6 }, (_, i) => `entry-${i}`);
    expect(seededOrder(six, "5d41402abc4b2a76b9719d911017c592")).toEqual(["entry-2", "entry-5", "entry-3", "entry-0", "entry-1", "entry-4"]);
    expect(seededOrder(ids, "k")).toEqual(legacyOrder(ids, "k"));
    // a versioned seed keys each entry by FNV-1a over UTF-8, mixed by MurmurHash3's fmix32
    const v2 = `${ORDER_SEED_V2}k`;
    const byHand = ids
      .map((id) => ({ id, h: fmix32(fnv1a32(`${v2}:${id}`)) }))
      .sort((x, y) => x.h - y.h)
      .map((x) => x.id);
    expect(seededOrder(ids, v2)).toEqual(byHand);
    expect(byHand).not.toEqual(legacyOrder(ids, v2));
  });

  it("is a permutation of the ids, the same for the same seed every time", () => {
    const a = seededOrder(ids, "seed-one");
    expect([...a].sort()).toEqual([...ids].sort());
    expect(seededOrder(ids, "seed-one")).toEqual(a);
    expect(seededOrder([...ids].reverse(), "seed-one")).toEqual(a);
  });

  it("differs between seeds and is not simply the input order", () => {
    const a = seededOrder(ids, "seed-one");
    const b = seededOrder(ids, "seed-two");
    expect(a).not.toEqual(b);
    expect(a).not.toEqual(ids);
  });

  it("keeps the others' relative order when an entry joins or leaves", () => {
    const full = seededOrder(ids, "s");
    const without = seededOrder(ids.filter((id) => id !== "entry-5"), "s");
    expect(without).toEqual(full.filter((id) => id !== "entry-5"));
  });

  it("spreads positions roughly evenly over many seeds (no entry stuck first)", () => {
    const firsts = new Map<string, number>();
    for (let s = 0; s < 1200; s++) {
      const first = seededOrder(ids, `${ORDER_SEED_V2}${s}`)[0];
      firsts.set(first, (firsts.get(first) ?? 0) + 1);
    }
    // 1200 seeds over 12 ids: each comes first Binomial(1200, 1/12) times, mean 100, standard deviation 9.6; the
    // seeds are fixed, so this is deterministic, and 50 … 150 is more than five deviations either way. (FNV-1a
    // without the finalizer puts one of these ids first 283 times: its last octets are barely mixed.)
    expect(firsts.size).toBe(12);
    for (const n of firsts.values()) {
      expect(n).toBeGreaterThan(50);
      expect(n).toBeLessThan(150);
    }
  });

  it("uses the judge's own seed only in per-judge mode", () => {
    expect(orderSeedFor("shared", "C", "J")).toBe("C");
    expect(orderSeedFor("per-judge", "C", "J")).toBe("J");
  });
});

/** MurmurHash3's 32-bit finalizer, written out again here from its published description (shifts 16, 13, 16). */
function fmix32(h: number): number {
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/** FNV-1a over the low byte of each UTF-16 unit: for a string of characters U+0000–U+00FF, over exactly those octets. */
function fnv1a32Latin1(octets: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < octets.length; i++) {
    h ^= octets.charCodeAt(i) & 0xff;
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** The order the first release gave (each UTF-16 unit hashed as two octets); kept here to hold old stored keys to it. */
function legacyOrder(ids: string[], key: string): string[] {
  const hash = (text: string) => {
    const units: number[] = [];
    for (let i = 0; i < text.length; i++) units.push(text.charCodeAt(i) & 0xff, text.charCodeAt(i) >>> 8);
    return fnv1a32Latin1(String.fromCharCode(...units));
  };
  return ids
    .map((id) => ({ id, h: hash(`${key}:${id}`) }))
    .sort((x, y) => x.h - y.h || (x.id < y.id ? -1 : 1))
    .map((x) => x.id);
}
