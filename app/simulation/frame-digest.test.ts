import { describe, expect, it } from "vitest";
import { FrameDigest } from "./frame-digest";

describe("frame digest", () => {
  const frame = (v: number) => ({ width: 640, height: 480, data: new Uint8Array(640 * 480 * 3).fill(v) });
  it("keeps the contact-sheet picks as they arrive, and reads back any a short run needs", () => {
    const digest = new FrameDigest(640, 480, 24, null);
    for (let i = 0; i < 5; i++) digest.push(frame(i * 10), i);
    expect(() => digest.push(frame(0), 7)).toThrow(RangeError);
    expect(digest.count).toBe(5);
    expect(digest.luma).toHaveLength(5);
    expect(digest.luma[3][0]).toBe(30);
    const asked: number[] = [];
    // 24 expected frames keep picks 0, 2, 4, …; five arrived, so picks are 0..4 and 1 and 3 are read back
    const thumbs = digest.thumbnails((i) => { asked.push(i); return frame(i * 10); });
    expect(asked).toEqual([1, 3]);
    expect(thumbs.map((t) => [t.width, t.height, t.data[0]])).toEqual([0, 1, 2, 3, 4].map((i) => [160, 120, i * 10]));
    expect(digest.flashReport(60)).toBeNull();
  });
  it("reports flashes at the frame rate measured after the run", () => {
    const digest = new FrameDigest(640, 480, 8, 60);
    for (let i = 0; i < 8; i++) digest.push(frame(i % 2 ? 255 : 0), i);
    const at60 = digest.flashReport(60)!, at30 = digest.flashReport(30)!;
    expect(at60.fps).toBe(60);
    expect(at30.fps).toBe(30);
    expect(at60.general.worstFlashes).toBe(3.5); // seven transitions in 8 frames
    expect(at60.general.passes).toBe(false);
  });
});
