/**
 * Presentation order: a deterministic seeded shuffle of entry ids.
 *
 * Each entry gets a sort key = a 32-bit hash of `seed + ":" + entryId`, and entries are sorted by that key (ties,
 * which are astronomically rare, by id). Because each key depends only on the seed and the entry's own id, the
 * order never changes under a judge: reloading gives the same order, and an entry that joins or leaves the grid
 * does not reorder the others. Pure: runs the same on the server and in a test.
 *
 * Seeds are versioned. A seed starting with `v2:` (every seed the database makes since migration 0008) keys each
 * entry by FNV-1a over the UTF-8 octets, followed by MurmurHash3's 32-bit finalizer: FNV-1a alone barely mixes
 * its last octets, so ids that differ only at the end (entry-1, entry-2 …) would come first unevenly often over many
 * seeds. A seed without a prefix was stored before that and keeps the hash it was first shown with (each UTF-16
 * unit as two octets, `legacyUnitHash`), so an order a jury has already seen stays.
 */
export const ORDER_SEED_V2 = "v2:";

const FNV32_OFFSET_BASIS = 0x811c9dc5; // 2166136261
const FNV32_PRIME = 0x01000193; // 16777619

/** FNV-1a, 32 bits, over the UTF-8 encoding of `text` (draft-eastlake-fnv-21, section 2). */
export function fnv1a32(text: string): number {
  let h = FNV32_OFFSET_BASIS;
  for (const octet of new TextEncoder().encode(text)) {
    h ^= octet;
    h = Math.imul(h, FNV32_PRIME) >>> 0;
  }
  return h >>> 0;
}

/**
 * MurmurHash3's fmix32 (Austin Appleby's public-domain MurmurHash3, its 32-bit finalization mix): xor-shifts by 16,
 * 13 and 16 around multiplications by 0x85ebca6b and 0xc2b2ae35, so every input bit reaches every output bit.
 */
function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** The sort key of a v2 seed. */
function orderKeyV2(text: string): number {
  return fmix32(fnv1a32(text));
}

/** The first release's key hash: FNV-1a steps over each UTF-16 unit as low byte, then high byte. Old seeds only. */
function legacyUnitHash(text: string): number {
  let h = FNV32_OFFSET_BASIS;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    h ^= c & 0xff;
    h = Math.imul(h, FNV32_PRIME) >>> 0;
    h ^= c >>> 8;
    h = Math.imul(h, FNV32_PRIME) >>> 0;
  }
  return h >>> 0;
}

export function seededOrder<T extends string>(ids: readonly T[], seed: string): T[] {
  const hash = seed.startsWith(ORDER_SEED_V2) ? orderKeyV2 : legacyUnitHash;
  const keyed = ids.map((id) => ({ id, key: hash(`${seed}:${id}`) }));
  keyed.sort((a, b) => a.key - b.key || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return keyed.map((k) => k.id);
}

/** The seed a judge's grid uses: the competition's for a shared order, the judge's own assignment seed otherwise. */
export function orderSeedFor(mode: string, competitionSeed: string, assignmentSeed: string): string {
  return mode === "per-judge" ? assignmentSeed : competitionSeed;
}
