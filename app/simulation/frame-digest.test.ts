import { describe, expect, it } from "vitest";
import { FrameDigest } from "./frame-digest";

describe("frame digest", () => {
  const frame = (v: number) => ({ width: 640, height: 480, data: new Uint8Array(640 * 480 * 3).fill(v) });
  it("keeps thumbnails spread over a run whose length it is not told, and the luma of every frame", () => {
    const digest = new FrameDigest(640, 480, null);
    for (let i = 0; i < 100; i++) digest.push(frame(i), i);
    expect(() => digest.push(frame(0), 107)).toThrow(RangeError);
    expect(digest.count).toBe(100);
    expect(digest.luma).toHaveLength(100);
    expect(digest.luma[30][0]).toBe(30);
    const thumbs = digest.thumbnails();
    expect(thumbs).toHaveLength(12);
    const firsts = thumbs.map((t) => t.data[0]);
    // first and near the last frame, in order, every one a different frame
    expect(firsts[0]).toBe(0);
    expect(firsts.at(-1)).toBeGreaterThanOrEqual(90);
    expect([...firsts].sort((a, b) => a - b)).toEqual(firsts);
    expect(new Set(firsts).size).toBe(12);
    expect(digest.flashReport(60)).toBeNull();
  });
  it("takes every frame of a short run", () => {
    const digest = new FrameDigest(640, 480, null);
    for (let i = 0; i < 5; i++) digest.push(frame(i * 10), i);
    expect(digest.thumbnails().map((t) => [t.width, t.height, t.data[0]])).toEqual([0, 1, 2, 3, 4].map((i) => [160, 120, i * 10]));
  });
  it("reports flashes at the frame rate measured after the run, tail frames included", () => {
    const digest = new FrameDigest(640, 480, 60);
    for (let i = 0; i < 6; i++) digest.push(frame(i % 2 ? 255 : 0), i);
    digest.pushTail(frame(0));
    digest.pushTail(frame(255));
    expect(digest.count).toBe(6);
    expect(digest.tailCount).toBe(2);
    expect(() => digest.push(frame(0), 6)).toThrow(RangeError);
    const at60 = digest.flashReport(60)!, at30 = digest.flashReport(30)!;
    expect(at60.fps).toBe(60);
    expect(at30.fps).toBe(30);
    expect(at60.general.worstFlashes).toBe(3.5); // seven transitions in 8 frames
    expect(at60.general.passes).toBe(false);
  });
});
