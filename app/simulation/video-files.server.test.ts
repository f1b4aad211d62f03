import { execFileSync } from "node:child_process";
import { chmodSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { compareVideoFile } from "./compare-video.server";
import { analyzeVideoFile } from "./flash-video.server";
import { VideoDecodeError } from "./video-decode.server";

// Videos made here with ffmpeg from frames this test generates; read back through the sandboxed decoder.
const root = mkdtempSync(join(tmpdir(), "gc-video-"));
chmodSync(root, 0o755);
afterAll(() => rmSync(root, { recursive: true, force: true }));

const W = 320, H = 240, FPS = 60;

function makeVideo(name: string, frames: number, pixel: (frame: number, x: number, y: number) => number): string {
  const raw = Buffer.alloc(W * H * 3 * frames);
  for (let f = 0; f < frames; f++) for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) raw.fill(pixel(f, x, y), ((f * H + y) * W + x) * 3, ((f * H + y) * W + x) * 3 + 3);
  writeFileSync(join(root, `${name}.rgb`), raw);
  const out = join(root, `${name}.mp4`);
  execFileSync("ffmpeg", ["-v", "error", "-y", "-f", "rawvideo", "-pix_fmt", "rgb24", "-s", `${W}x${H}`, "-r", "60000/1001", "-i", join(root, `${name}.rgb`),
    "-c:v", "libx264", "-preset", "ultrafast", "-crf", "12", "-pix_fmt", "yuv420p", out]);
  return out;
}

describe("uploaded capture videos", () => {
  it("finds four full-screen flashes a second in an MP4 and three pass", async () => {
    const fast = makeVideo("fast", 2 * FPS, (f) => (Math.floor((f * 8) / FPS) % 2 ? 255 : 0));
    const slow = makeVideo("slow", 2 * FPS, (f) => (Math.floor((f * 6) / FPS) % 2 ? 255 : 0));
    const { report: a, span } = await analyzeVideoFile(fast, { workDir: join(root, "a") });
    expect(a.general.worstFlashes).toBe(4);
    expect(a.general.passes).toBe(false);
    // the whole two seconds were seen, and the span says so
    expect(span.wholeDemo).toBe(true);
    expect(span.analysedSeconds).toBeCloseTo(2, 1);
    expect(span.text).toBe("the whole 2.0 s video");
    const { report: b } = await analyzeVideoFile(slow, { workDir: join(root, "b") });
    expect(b.general.worstFlashes).toBe(3);
    expect(b.passes).toBe(true);
  }, 60_000);

  it("analyses past two minutes, and says when it stopped before the end", async () => {
    // 130 s: the analysis used to stop at 120 s. Flashing starts at 125 s (4 a second, over WCAG 2.3.1's three).
    const long = join(root, "long.mp4");
    execFileSync("ffmpeg", ["-v", "error", "-y", "-f", "lavfi", "-i", "color=c=black:s=160x120:r=60000/1001:d=130",
      "-vf", "drawbox=w=iw:h=ih:color=white:t=fill:enable='gte(t,125)*lt(mod(t,0.25),0.125)'", "-c:v", "libx264", "-preset", "ultrafast", "-pix_fmt", "yuv420p", long]);
    const whole = await analyzeVideoFile(long, { workDir: join(root, "e") });
    expect(whole.span.wholeDemo).toBe(true);
    expect(whole.span.analysedSeconds).toBeGreaterThan(129);
    expect(whole.report.general.passes).toBe(false);
    expect(whole.report.general.worstSecondStartS!).toBeGreaterThan(124.5);
    const capped = await analyzeVideoFile(long, { workDir: join(root, "f"), maxSeconds: 60 });
    expect(capped.span).toMatchObject({ wholeDemo: false, text: "the first 60 s of the video" });
    expect(capped.report.general.passes).toBe(true);
  }, 120_000);

  it("refuses a file that is not a video with a clear error", async () => {
    writeFileSync(join(root, "notes.mp4"), "these are not moving pictures");
    await expect(analyzeVideoFile(join(root, "notes.mp4"), { workDir: join(root, "c") })).rejects.toThrow(VideoDecodeError);
  });

  it("lines a capture up with its reference in time", async () => {
    // a bar sweeping across; the capture starts 20 frames into the reference
    const bar = (f: number, x: number) => (Math.abs(x - ((f * 7) % W)) < 24 ? 230 : 30);
    const capture = makeVideo("capture", 90, (f, x) => bar(f + 20, x));
    const refFrames = Array.from({ length: 120 }, (_, f) => {
      const grid = new Uint8Array(32 * 24);
      for (let gy = 0; gy < 24; gy++) for (let gx = 0; gx < 32; gx++) {
        let s = 0;
        for (let dx = 0; dx < 10; dx++) s += bar(f, gx * 10 + dx);
        grid[gy * 32 + gx] = Math.round(s / 10);
      }
      return grid;
    });
    const result = await compareVideoFile(capture, { width: 32, height: 24, fps: 60000 / 1001, frames: refFrames }, join(root, "d"));
    expect(result.offsetFrames).toBe(20);
    expect(result.similarity!).toBeGreaterThan(0.9);
    expect(result.statement).toMatch(/closely matches/);
  }, 60_000);
});
