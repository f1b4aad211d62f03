/**
 * Presentation order: a deterministic seeded shuffle of entry ids.
 *
 * Each entry gets a sort key = a 32-bit hash of `seed + ":" + entryId`, and entries are sorted by that key (ties,
 * which are astronomically rare, by id). Because each key depends only on the seed and the entry's own id, the
 * order never changes under a judge: reloading gives the same order, and an entry that joins or leaves the grid
 * does not reorder the others. Pure: runs the same on the server and in a test.
 *
 * Seeds are versioned. A seed starting with `v2:` (every seed the database makes since migration 0008) is hashed
 * with FNV-1a over the UTF-8 octets. A seed without a prefix was stored before that and keeps the hash it was
 * first shown with (each UTF-16 unit as two octets, `legacyUnitHash`), so an order a jury has already seen stays.
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
  const hash = seed.startsWith(ORDER_SEED_V2) ? fnv1a32 : legacyUnitHash;
  const keyed = ids.map((id) => ({ id, key: hash(`${seed}:${id}`) }));
  keyed.sort((a, b) => a.key - b.key || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return keyed.map((k) => k.id);
}

/** The seed a judge's grid uses: the competition's for a shared order, the judge's own assignment seed otherwise. */
export function orderSeedFor(mode: string, competitionSeed: string, assignmentSeed: string): string {
  return mode === "per-judge" ? assignmentSeed : competitionSeed;
}
