/**
 * Presentation order: a deterministic seeded shuffle of entry ids.
 *
 * Each entry gets a sort key = FNV-1a (32-bit) hash of `seed + ":" + entryId`, and entries are sorted by that
 * key (ties, which are astronomically rare, by id). Because each key depends only on the seed and the entry's own
 * id, the order never changes under a judge: reloading gives the same order, and an entry that joins or leaves
 * the grid does not reorder the others. Pure: runs the same on the server and in a test.
 */
export function fnv1a32(text: string): number {
  // FNV-1a: offset basis 2166136261, prime 16777619 (the published FNV parameters for 32 bits).
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    h ^= c & 0xff;
    h = Math.imul(h, 0x01000193) >>> 0;
    h ^= c >>> 8;
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

export function seededOrder<T extends string>(ids: readonly T[], seed: string): T[] {
  const keyed = ids.map((id) => ({ id, key: fnv1a32(`${seed}:${id}`) }));
  keyed.sort((a, b) => a.key - b.key || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return keyed.map((k) => k.id);
}

export type OrderMode = "shared" | "per-judge";

/** The seed a judge's grid uses: the competition's for a shared order, the judge's own assignment seed otherwise. */
export function orderSeedFor(mode: string, competitionSeed: string, assignmentSeed: string): string {
  return mode === "per-judge" ? assignmentSeed : competitionSeed;
}
