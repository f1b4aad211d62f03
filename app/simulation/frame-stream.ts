/**
 * The harness's frame stream (harness.ts): records of a 16-byte header — four little-endian uint32: kind, frame
 * index, a, b — followed, for frame records, by one rgb24 frame of the active area. Kinds:
 * - 1 frame: a frame of the demo (index counts from 0, the first frame after reset);
 * - 2 loop: the state at the start of frame `index` repeats the start of frame `a`; the period is `b` frames;
 * - 3 tail: a frame after the loop point (the loop's first frames again), sent so that flash windows wrapping
 *   around the loop point are seen; it is not part of the demo's capture.
 * Read as it arrives, one frame at a time: the whole demo never sits in memory or on disk.
 */
export const FRAME_RECORD_BYTES = 16;
export const RECORD_FRAME = 1;
export const RECORD_LOOP = 2;
export const RECORD_TAIL = 3;

export type FrameRecord =
  | { kind: "frame" | "tail"; index: number; data: Uint8Array }
  | { kind: "loop"; index: number; firstLoopFrame: number; periodFrames: number };

export class FrameStreamError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "FrameStreamError";
  }
}

/**
 * Hands each record of `source` to `onRecord` in order; a promise it returns is awaited before more is read, so a
 * slow consumer (the encoder) holds the harness back instead of piling frames up. Returns the records read.
 */
export async function readFrameStream(
  source: AsyncIterable<Uint8Array>,
  frameBytes: number,
  onRecord: (r: FrameRecord) => void | Promise<void>,
): Promise<number> {
  const head = new Uint8Array(FRAME_RECORD_BYTES);
  const headView = new DataView(head.buffer);
  let headFill = 0;
  let body: Uint8Array | null = null;
  let bodyFill = 0;
  let kind = 0, index = 0;
  let records = 0;
  for await (const chunk of source) {
    let at = 0;
    while (at < chunk.length) {
      if (body === null) {
        const n = Math.min(FRAME_RECORD_BYTES - headFill, chunk.length - at);
        head.set(chunk.subarray(at, at + n), headFill);
        headFill += n;
        at += n;
        if (headFill < FRAME_RECORD_BYTES) break;
        headFill = 0;
        kind = headView.getUint32(0, true);
        index = headView.getUint32(4, true);
        if (kind === RECORD_LOOP) {
          records++;
          await onRecord({ kind: "loop", index, firstLoopFrame: headView.getUint32(8, true), periodFrames: headView.getUint32(12, true) });
          continue;
        }
        if (kind !== RECORD_FRAME && kind !== RECORD_TAIL) throw new FrameStreamError(`unknown record kind ${kind} in the frame stream`);
        body = new Uint8Array(frameBytes);
        bodyFill = 0;
      }
      const n = Math.min(frameBytes - bodyFill, chunk.length - at);
      body.set(chunk.subarray(at, at + n), bodyFill);
      bodyFill += n;
      at += n;
      if (bodyFill === frameBytes) {
        const data = body;
        body = null;
        records++;
        await onRecord({ kind: kind === RECORD_FRAME ? "frame" : "tail", index, data });
      }
    }
  }
  if (body !== null || headFill !== 0) throw new FrameStreamError("the frame stream ended inside a record");
  return records;
}

/** One record as the harness writes it (for tests and tools). */
export function encodeRecord(kind: number, index: number, a = 0, b = 0, data?: Uint8Array): Uint8Array {
  const out = new Uint8Array(FRAME_RECORD_BYTES + (data?.length ?? 0));
  const v = new DataView(out.buffer);
  v.setUint32(0, kind, true);
  v.setUint32(4, index, true);
  v.setUint32(8, a, true);
  v.setUint32(12, b, true);
  if (data) out.set(data, FRAME_RECORD_BYTES);
  return out;
}
