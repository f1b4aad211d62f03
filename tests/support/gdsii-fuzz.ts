import { GdsiiError } from "~/gdsii/errors";
import { readLayout } from "~/gdsii/reader";

export interface FuzzOutcome {
  summaries: number;
  gdsiiErrors: number;
  /** Cases that threw something other than a GdsiiError: each is a bug. */
  otherErrors: { caseIndex: number; error: string }[];
}

/** Seeded random mutations of a valid stream (flipped bytes, cut files, spliced records), each read once. */
export function mutateAndRead(base: Uint8Array, opts: { cases: number; seed: number }): FuzzOutcome {
  let state = opts.seed >>> 0;
  const random = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const pick = (n: number) => Math.floor(random() * n);
  const out: FuzzOutcome = { summaries: 0, gdsiiErrors: 0, otherErrors: [] };
  for (let c = 0; c < opts.cases; c++) {
    let bytes = base.slice();
    const kind = pick(4);
    if (kind === 0) {
      for (let k = 1 + pick(8); k > 0; k--) bytes[pick(bytes.length)] = pick(256);
    } else if (kind === 1) {
      bytes = bytes.subarray(0, pick(bytes.length));
    } else if (kind === 2) {
      const from = pick(bytes.length);
      const len = pick(64);
      const at = pick(bytes.length);
      const merged = new Uint8Array(bytes.length + len);
      merged.set(bytes.subarray(0, at), 0);
      merged.set(base.subarray(from, from + len), at);
      merged.set(bytes.subarray(at), at + Math.min(len, base.length - from));
      bytes = merged.subarray(0, bytes.length + Math.min(len, base.length - from));
    } else {
      // Hit record headers on purpose: lengths and types are where parsers break.
      for (let k = 1 + pick(4); k > 0; k--) {
        const at = pick(bytes.length >> 2) << 2;
        bytes[at + pick(4)] = [0, 1, 0xff, 0x7f, 0x10, 0x0b][pick(6)];
      }
    }
    try {
      readLayout(bytes, { collectPlacements: 100 });
      out.summaries++;
    } catch (e) {
      if (e instanceof GdsiiError) out.gdsiiErrors++;
      else out.otherErrors.push({ caseIndex: c, error: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
    }
  }
  return out;
}
