import { appendFileSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { followFrames, RawFrameFile } from "./frame-file.server";

const root = mkdtempSync(join(tmpdir(), "gc-follow-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const W = 4, H = 2, BYTES = W * H * 3;
const frameBytes = (n: number) => new Uint8Array(BYTES).fill(n + 1);

describe("following a frames file while it is written", () => {
  it("hands over each frame once complete, in order, and ignores a torn last frame", async () => {
    const path = join(root, "frames.rgb");
    let finish!: () => void;
    const writerDone = new Promise<void>((resolve) => { finish = resolve; });
    const seen: number[][] = [];
    let wantNext: (() => void) | null = null;
    const following = followFrames(path, W, H, writerDone, (img, i) => {
      seen.push([i, img.data[0], img.data[BYTES - 1], img.data.length]);
      wantNext?.();
    });
    const consumed = () => new Promise<void>((resolve) => { wantNext = resolve; });

    // the writer starts after the follower: the file does not exist yet
    for (let n = 0; n < 3; n++) {
      const data = frameBytes(n);
      const next = consumed();
      if (n === 0) writeFileSync(path, data.subarray(0, 5)); else appendFileSync(path, data.subarray(0, 5));
      appendFileSync(path, data.subarray(5)); // the frame is whole only now
      await next;
    }
    appendFileSync(path, frameBytes(3).subarray(0, 7)); // a run killed part-way through a frame
    finish();
    expect(await following).toBe(3);
    expect(seen).toEqual([[0, 1, 1, BYTES], [1, 2, 2, BYTES], [2, 3, 3, BYTES]]);
    // and the same file read afterwards agrees
    const file = new RawFrameFile(path, W, H);
    expect(file.count).toBe(3);
    expect(file.read(2).data).toEqual(frameBytes(2));
    file.close();
  });

  it("returns no frames when the writer ends without writing any", async () => {
    expect(await followFrames(join(root, "never.rgb"), W, H, Promise.resolve(), () => { throw new Error("no frame expected"); })).toBe(0);
    expect(await followFrames(join(root, "never.rgb"), W, H, Promise.reject(new Error("run failed")), () => undefined)).toBe(0);
  });
});
