import { copyFileSync, existsSync, mkdirSync, rmSync } from "node:fs";
import { extname, join } from "node:path";
import type { Readable } from "node:stream";
import { runSandboxed } from "~/sandbox/sandbox.server";

/**
 * Decodes an uploaded video into small raw frames with ffmpeg inside the sandbox (an upload is untrusted).
 * The file is copied into a private folder; ffmpeg scales with area averaging and resamples to a fixed
 * frame rate, so analysis code sees a known geometry and timing.
 */
export class VideoDecodeError extends Error {
  constructor(message: string, readonly log = "") {
    super(message);
    this.name = "VideoDecodeError";
  }
}

export interface DecodeRequest {
  videoPath: string;
  workDir: string;
  width: number;
  height: number;
  pixelFormat: "rgb24" | "gray";
  /** output frame rate, e.g. "60000/1001" */
  frameRate: string;
  maxSeconds: number;
  wallSeconds?: number;
}

/** Path of the raw output file; frames follow each other with no header. */
export async function decodeVideo(req: DecodeRequest): Promise<string> {
  if (!existsSync(req.videoPath)) throw new VideoDecodeError(`video file ${req.videoPath} does not exist`);
  if (!(req.maxSeconds > 0)) throw new VideoDecodeError("maxSeconds must be positive");
  const dir = join(req.workDir, "decode");
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const input = `input${extname(req.videoPath).replace(/[^.A-Za-z0-9]/g, "").slice(0, 8)}`;
  copyFileSync(req.videoPath, join(dir, input));
  const result = await runSandboxed({
    command: "/usr/bin/ffmpeg",
    args: [
      "-hide_banner", "-loglevel", "error", "-y", "-threads", "2", "-i", `/build/${input}`, "-t", String(req.maxSeconds), "-an",
      "-vf", `fps=${req.frameRate},scale=${req.width}:${req.height}:flags=area,format=${req.pixelFormat}`,
      "-f", "rawvideo", "-pix_fmt", req.pixelFormat, "/build/frames.raw",
    ],
    buildDir: dir,
    limits: { wallSeconds: req.wallSeconds ?? 300, cpuSeconds: (req.wallSeconds ?? 300) * 2 },
    maxOutputBytes: 64 * 1024,
  });
  if (result.timedOut) throw new VideoDecodeError("decoding the video took too long");
  if (result.exitCode !== 0 || !existsSync(join(dir, "frames.raw"))) {
    throw new VideoDecodeError("the video could not be decoded; is it a video file ffmpeg can read?", result.stderr.slice(-2000));
  }
  return join(dir, "frames.raw");
}

/**
 * Decodes an uploaded video like decodeVideo, but hands the raw frames over as ffmpeg makes them (its output goes to
 * a pipe on file descriptor 3), so a long video is never held in memory or written out. `onFrame` may return a
 * promise; ffmpeg waits while it is pending. Returns the number of frames handed over.
 */
export async function streamVideoFrames(req: DecodeRequest, onFrame: (frame: Uint8Array, index: number) => void | Promise<void>): Promise<number> {
  if (!existsSync(req.videoPath)) throw new VideoDecodeError(`video file ${req.videoPath} does not exist`);
  if (!(req.maxSeconds > 0)) throw new VideoDecodeError("maxSeconds must be positive");
  const dir = join(req.workDir, "decode");
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const input = `input${extname(req.videoPath).replace(/[^.A-Za-z0-9]/g, "").slice(0, 8)}`;
  copyFileSync(req.videoPath, join(dir, input));
  const frameBytes = req.width * req.height * (req.pixelFormat === "rgb24" ? 3 : 1);
  let out: Readable | null = null;
  const running = runSandboxed({
    command: "/usr/bin/ffmpeg",
    args: [
      "-hide_banner", "-loglevel", "error", "-y", "-threads", "2", "-i", `/build/${input}`, "-t", String(req.maxSeconds), "-an",
      "-vf", `fps=${req.frameRate},scale=${req.width}:${req.height}:flags=area,format=${req.pixelFormat}`,
      "-f", "rawvideo", "-pix_fmt", req.pixelFormat, "pipe:3",
    ],
    buildDir: dir,
    limits: { wallSeconds: req.wallSeconds ?? 600, cpuSeconds: (req.wallSeconds ?? 600) * 2 },
    maxOutputBytes: 64 * 1024,
    pipes: { fd3: true },
    onStreams: (io) => { out = io.fd3; },
  });
  const stream = out as Readable | null;
  if (!stream) throw new VideoDecodeError("the sandbox gave ffmpeg no output pipe");
  const reading = (async () => {
    let pending: Buffer = Buffer.alloc(0);
    let index = 0;
    for await (const chunk of stream) {
      pending = pending.length ? Buffer.concat([pending, chunk as Buffer]) : (chunk as Buffer);
      let at = 0;
      for (; at + frameBytes <= pending.length; at += frameBytes) await onFrame(new Uint8Array(pending.subarray(at, at + frameBytes)), index++);
      pending = pending.subarray(at);
    }
    return index;
  })();
  const [ran, read] = await Promise.allSettled([running, reading.finally(() => stream.destroy())]);
  if (ran.status === "rejected") throw ran.reason;
  if (read.status === "rejected") throw read.reason;
  const result = ran.value;
  if (result.timedOut) throw new VideoDecodeError("decoding the video took too long");
  if (result.exitCode !== 0) throw new VideoDecodeError("the video could not be decoded; is it a video file ffmpeg can read?", result.stderr.slice(-2000));
  return read.value;
}
