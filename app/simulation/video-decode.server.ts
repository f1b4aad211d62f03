import { copyFileSync, existsSync, mkdirSync, rmSync } from "node:fs";
import { extname, join } from "node:path";
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
