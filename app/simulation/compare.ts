/**
 * Compares an uploaded capture with the reference capture: both reduced to small luma grids per frame,
 * the upload slid in time against the reference, and the best Pearson correlation over all overlapping
 * cells of all overlapping frames taken as the similarity.
 */
export interface LumaSequence {
  width: number;
  height: number;
  fps: number;
  frames: Uint8Array[];
}

export interface CaptureComparison {
  /** upload frame i lines up with reference frame i + offsetFrames */
  offsetFrames: number;
  offsetSeconds: number;
  overlapFrames: number;
  /** Pearson correlation, -1..1; null when either side does not vary at all */
  similarity: number | null;
  statement: string;
}

export class CompareError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CompareError";
  }
}

export const COMPARE_LIMITS =
  "It looks at brightness on a coarse grid only: it cannot see colour, fine detail or sound, and a camera " +
  "recording of a screen, cropping, letterboxing or a different frame rate lower it without the design being different.";

function correlation(ref: LumaSequence, up: LumaSequence, offset: number, minOverlap: number): { r: number | null; overlap: number } {
  const from = Math.max(0, -offset);
  const to = Math.min(up.frames.length, ref.frames.length - offset);
  const overlap = to - from;
  if (overlap < minOverlap) return { r: null, overlap };
  let n = 0, sx = 0, sy = 0, sxx = 0, syy = 0, sxy = 0;
  for (let i = from; i < to; i++) {
    const a = ref.frames[i + offset], b = up.frames[i];
    for (let k = 0; k < a.length; k++) {
      const x = a[k], y = b[k];
      sx += x; sy += y; sxx += x * x; syy += y * y; sxy += x * y;
    }
    n += a.length;
  }
  const vx = sxx - (sx * sx) / n, vy = syy - (sy * sy) / n;
  if (vx <= 1e-9 || vy <= 1e-9) return { r: null, overlap };
  return { r: (sxy - (sx * sy) / n) / Math.sqrt(vx * vy), overlap };
}

function describe(similarity: number | null, offsetSeconds: number): string {
  if (similarity === null) return `The pictures do not change in brightness, so they cannot be compared. ${COMPARE_LIMITS}`;
  const pct = Math.round(similarity * 100);
  const verdict = similarity >= 0.9 ? "closely matches" : similarity >= 0.6 ? "resembles, with clear differences," : "does not resemble";
  const shift = Math.abs(offsetSeconds) < 0.01 ? "with no time shift" : `when shifted by ${offsetSeconds.toFixed(2)} s`;
  return `The capture ${verdict} the reference ${shift} (brightness correlation ${pct} %; 100 % = same pattern of light and dark, 0 % = unrelated). ${COMPARE_LIMITS}`;
}

export function compareCaptures(reference: LumaSequence, upload: LumaSequence, maxOffsetSeconds = 5): CaptureComparison {
  if (reference.width !== upload.width || reference.height !== upload.height) {
    throw new CompareError(`grids differ: reference ${reference.width}×${reference.height}, capture ${upload.width}×${upload.height}`);
  }
  if (Math.abs(reference.fps - upload.fps) > 0.01 * reference.fps) throw new CompareError(`frame rates differ: ${reference.fps} and ${upload.fps}; resample the capture first`);
  if (reference.frames.length === 0 || upload.frames.length === 0) throw new CompareError("both sequences need at least one frame");
  const cells = reference.width * reference.height;
  if ([...reference.frames, ...upload.frames].some((f) => f.length !== cells)) throw new CompareError(`every frame must hold ${cells} cells`);
  const maxOffset = Math.round(maxOffsetSeconds * reference.fps);
  const minOverlap = Math.max(1, Math.floor(Math.min(reference.frames.length, upload.frames.length) / 2));
  let best = { offset: 0, r: null as number | null, overlap: 0 };
  for (let offset = -maxOffset; offset <= maxOffset; offset++) {
    const { r, overlap } = correlation(reference, upload, offset, minOverlap);
    if (r !== null && (best.r === null || r > best.r)) best = { offset, r, overlap };
  }
  const offsetSeconds = best.offset / reference.fps;
  return { offsetFrames: best.offset, offsetSeconds, overlapFrames: best.overlap, similarity: best.r, statement: describe(best.r, offsetSeconds) };
}
