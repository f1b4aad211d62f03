import { existsSync, statSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { runSandboxed } from "~/sandbox/sandbox.server";

/**
 * Preview videos from raw frames and the WAV, with ffmpeg in the sandbox (EDA.md flags): WebM with
 * VP9/Opus and MP4 with H.264/AAC (+faststart, so playback starts before the whole file has arrived).
 * Both inputs must sit in the same folder, which becomes the sandbox's /build.
 */
export class EncodeError extends Error {
  constructor(message: string, readonly log = "") {
    super(message);
    this.name = "EncodeError";
  }
}

export interface EncodeRequest {
  framesPath: string;
  wavPath: string;
  width: number;
  height: number;
  /** frame rate as a rational "num/den" or a number */
  frameRate: string;
  frames: number;
  /** seconds of video: passed as -t so the audio never lengthens it */
  durationSeconds: number;
  wallSeconds?: number;
}

export interface EncodedPreview {
  webm: string;
  mp4: string;
  ms: number;
}

function common(req: EncodeRequest): string[] {
  return [
    "-hide_banner", "-loglevel", "error", "-y", "-threads", "2",
    "-f", "rawvideo", "-pix_fmt", "rgb24", "-s", `${req.width}x${req.height}`, "-r", req.frameRate,
    "-i", `/build/${basename(req.framesPath)}`, "-i", `/build/${basename(req.wavPath)}`,
    "-t", req.durationSeconds.toFixed(4), "-frames:v", String(req.frames),
  ];
}

export async function encodePreview(req: EncodeRequest): Promise<EncodedPreview> {
  const dir = dirname(req.framesPath);
  if (dirname(req.wavPath) !== dir) throw new EncodeError("frames and audio must be in the same folder");
  if (!existsSync(req.framesPath) || statSync(req.framesPath).size < req.width * req.height * 3 * req.frames) {
    throw new EncodeError(`the frames file holds fewer than ${req.frames} frames`);
  }
  const started = Date.now();
  const jobs = [
    { out: "preview.webm", args: ["-c:v", "libvpx-vp9", "-b:v", "0", "-crf", "30", "-deadline", "realtime", "-cpu-used", "8", "-row-mt", "1", "-pix_fmt", "yuv420p", "-c:a", "libopus", "-b:a", "96k"] },
    { out: "preview.mp4", args: ["-c:v", "libx264", "-preset", "veryfast", "-crf", "20", "-pix_fmt", "yuv420p", "-c:a", "aac", "-b:a", "128k", "-movflags", "+faststart"] },
  ];
  for (const job of jobs) {
    const result = await runSandboxed({
      command: "/usr/bin/ffmpeg",
      args: [...common(req), ...job.args, `/build/${job.out}`],
      buildDir: dir,
      limits: { wallSeconds: req.wallSeconds ?? 300, cpuSeconds: (req.wallSeconds ?? 300) * 2 },
      maxOutputBytes: 64 * 1024,
    });
    if (result.exitCode !== 0 || result.timedOut) {
      throw new EncodeError(`ffmpeg could not write ${job.out}${result.timedOut ? " in time" : ""}: ${result.stderr.trim().split("\n").slice(-3).join(" / ")}`, result.stderr);
    }
  }
  return { webm: join(dir, "preview.webm"), mp4: join(dir, "preview.mp4"), ms: Date.now() - started };
}
