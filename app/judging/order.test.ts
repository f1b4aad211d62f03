import { describe, expect, it } from "vitest";
import { fnv1a32, orderSeedFor, seededOrder } from "./order";

const ids = Array.from({ length: 12 }, (_, i) => `entry-${i}`);

describe("seeded presentation order", () => {
  it("hashes with FNV-1a 32-bit", () => {
    // FNV-1a of the empty string is the offset basis 0x811c9dc5 (published FNV parameters).
    expect(fnv1a32("")).toBe(0x811c9dc5);
    expect(fnv1a32("a")).not.toBe(fnv1a32("b"));
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
      const first = seededOrder(ids, `seed-${s}`)[0];
      firsts.set(first, (firsts.get(first) ?? 0) + 1);
    }
    // 1200 seeds over 12 ids: about 100 each; every id comes first sometimes, none dominates.
    expect(firsts.size).toBe(12);
    for (const n of firsts.values()) expect(n).toBeLessThan(200);
  });

  it("uses the judge's own seed only in per-judge mode", () => {
    expect(orderSeedFor("shared", "C", "J")).toBe("C");
    expect(orderSeedFor("per-judge", "C", "J")).toBe("J");
  });
});
