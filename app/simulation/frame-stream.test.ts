import { describe, expect, it } from "vitest";
import { encodeRecord, FrameStreamError, readFrameStream, RECORD_FRAME, RECORD_LOOP, RECORD_TAIL, type FrameRecord } from "./frame-stream";

// The harness's frame stream (harness.ts record()) cut into arbitrary chunks, as a pipe delivers it.
async function* chunks(bytes: Uint8Array, size: number): AsyncIterable<Uint8Array> {
  for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
}

const FRAME = 12; // a tiny "frame" of 2×2 rgb24
const frame = (v: number) => new Uint8Array(FRAME).fill(v);
const stream = Buffer.concat([
  encodeRecord(RECORD_FRAME, 0, 0, 0, frame(1)),
  encodeRecord(RECORD_FRAME, 1, 0, 0, frame(2)),
  encodeRecord(RECORD_LOOP, 2, 0, 2),
  encodeRecord(RECORD_TAIL, 2, 0, 0, frame(1)),
]);

describe("the frame stream", () => {
  it("reads the same records whatever the chunk size, frames whole and in order", async () => {
    for (const size of [1, 5, 16, 17, 28, 1000]) {
      const seen: FrameRecord[] = [];
      expect(await readFrameStream(chunks(stream, size), FRAME, (r) => { seen.push(r); })).toBe(4);
      expect(seen.map((r) => [r.kind, r.index])).toEqual([["frame", 0], ["frame", 1], ["loop", 2], ["tail", 2]]);
      expect(seen[2]).toMatchObject({ firstLoopFrame: 0, periodFrames: 2 });
      expect(Array.from((seen[1] as { data: Uint8Array }).data)).toEqual(Array(FRAME).fill(2));
    }
  });
  it("waits for a slow consumer before reading on", async () => {
    const order: string[] = [];
    await readFrameStream(chunks(stream, 7), FRAME, async (r) => {
      order.push(`start ${r.kind}${r.index}`);
      await new Promise((resolve) => setImmediate(resolve));
      order.push(`end ${r.kind}${r.index}`);
    });
    expect(order.slice(0, 3)).toEqual(["start frame0", "end frame0", "start frame1"]);
  });
  it("refuses a stream cut inside a record, and an unknown record kind", async () => {
    await expect(readFrameStream(chunks(stream.subarray(0, 20), 8), FRAME, () => undefined)).rejects.toThrow(FrameStreamError);
    await expect(readFrameStream(chunks(encodeRecord(9, 0), 16), FRAME, () => undefined)).rejects.toThrow(/unknown record kind 9/);
  });
});
