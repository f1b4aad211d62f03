import { copyFileSync, existsSync, mkdirSync, rmSync, statSync } from "node:fs";
import { join } from "node:path";
import type { Writable } from "node:stream";
import { runSandboxed, type SandboxResult } from "~/sandbox/sandbox.server";

/**
 * Preview videos with ffmpeg in the sandbox (EDA.md flags): WebM with VP9/Opus and MP4 with H.264/AAC
 * (+faststart, so playback starts before the whole file has arrived).
 *
 * The picture is encoded while the simulation runs: raw rgb24 frames go into ffmpeg's stdin as the harness draws
 * them (one ffmpeg, both codecs), so no frame is kept in memory or on disk and the encoder works on the second core.
 * The length is not known in advance (the demo ends where it loops). Once the run is over, the WAV is muxed in with
 * the picture copied, a fraction of a second's work.
 */
export class EncodeError extends Error {
  constructor(message: string, readonly log = "") {
    super(message);
    this.name = "EncodeError";
  }
}

export interface LiveEncodeRequest {
  /** a folder of the encoder's own; it becomes the sandbox's /build */
  dir: string;
  width: number;
  height: number;
  /** frame rate as a rational "num/den" or a number */
  frameRate: string;
  wallSeconds?: number;
}

export interface EncodedPreview {
  webm: string;
  mp4: string;
  ms: number;
}

export interface LiveEncoder {
  /** Queues one frame; the promise settles when ffmpeg can take more (backpressure). */
  write(frame: Uint8Array): Promise<void>;
  /** Ends the picture and waits for ffmpeg. */
  finish(): Promise<void>;
  /** Muxes the WAV in (the picture is copied) and cuts both to `durationSeconds`. */
  mux(wavPath: string, durationSeconds: number): Promise<EncodedPreview>;
  /** Stops ffmpeg without a result (the simulation failed). */
  abort(): Promise<void>;
  readonly frames: number;
}

// no look-ahead in either encoder: frames leave ffmpeg as they come (less memory: measured 65 MB instead of 95 MB for
// x264 and 100 MB instead of 130 MB for VP9 on 640×480, and a fifth less CPU for x264; npm run bench -- simulation)
/** Frames queued for ffmpeg before the caller is held back (4 × 921 600 bytes at 640×480). */
const ENCODE_BACKLOG = 4;
const VIDEO_WEBM = ["-c:v", "libvpx-vp9", "-b:v", "0", "-crf", "30", "-deadline", "realtime", "-cpu-used", "8", "-row-mt", "1", "-lag-in-frames", "0", "-pix_fmt", "yuv420p"];
const VIDEO_MP4 = ["-c:v", "libx264", "-preset", "veryfast", "-tune", "zerolatency", "-crf", "20", "-pix_fmt", "yuv420p"];

function failure(what: string, result: SandboxResult): EncodeError {
  return new EncodeError(`ffmpeg could not write ${what}${result.timedOut ? " in time" : ""}: ${result.stderr.trim().split("\n").slice(-3).join(" / ")}`, result.stderr);
}

export function startLiveEncode(req: LiveEncodeRequest): LiveEncoder {
  rmSync(req.dir, { recursive: true, force: true });
  mkdirSync(req.dir, { recursive: true });
  const wallSeconds = req.wallSeconds ?? 900;
  const started = Date.now();
  let stdin: Writable | null = null;
  let broken: Error | null = null;
  let frames = 0;
  const running = runSandboxed({
    command: "/usr/bin/ffmpeg",
    args: [
      "-hide_banner", "-loglevel", "error", "-y", "-threads", "2",
      "-f", "rawvideo", "-pix_fmt", "rgb24", "-s", `${req.width}x${req.height}`, "-r", req.frameRate, "-i", "pipe:0",
      "-map", "0:v", ...VIDEO_WEBM, "/build/picture.webm",
      "-map", "0:v", ...VIDEO_MP4, "/build/picture.mp4",
    ],
    buildDir: req.dir,
    limits: { wallSeconds, cpuSeconds: wallSeconds * 2 },
    maxOutputBytes: 64 * 1024,
    pipes: { stdin: true },
    onStreams: (io) => {
      stdin = io.stdin;
      // ffmpeg gone (an error, the limit): the frames that follow are dropped and finish() says why
      stdin?.on("error", (e) => { broken = e; });
    },
  });
  const input = (): Writable => {
    if (!stdin) throw new EncodeError("the sandbox gave ffmpeg no input pipe");
    return stdin;
  };
  const ended = running.then((r) => {
    broken ??= new Error("ffmpeg ended");
    return r;
  });

  return {
    get frames() {
      return frames;
    },
    async write(frame) {
      if (broken) return;
      frames++;
      const pipe = input();
      // up to ENCODE_BACKLOG frames may wait for ffmpeg, so the harness and the digest go on while it encodes;
      // beyond that the caller waits (and with it the harness): memory stays bounded
      if (pipe.write(frame) || pipe.writableLength < ENCODE_BACKLOG * frame.length) return;
      await new Promise<void>((resolve) => {
        const done = () => { pipe.off("drain", done); pipe.off("error", done); pipe.off("close", done); resolve(); };
        pipe.on("drain", done);
        pipe.on("error", done);
        pipe.on("close", done);
        void ended.then(done);
      });
    },
    async finish() {
      input().end();
      const result = await ended;
      if (result.exitCode !== 0 || result.timedOut) throw failure("the preview picture", result);
      if (frames === 0) throw new EncodeError("no frames to encode");
    },
    async abort() {
      stdin?.destroy();
      await ended;
    },
    async mux(wavPath, durationSeconds) {
      for (const name of ["picture.webm", "picture.mp4"]) {
        if (!existsSync(join(req.dir, name)) || statSync(join(req.dir, name)).size === 0) throw new EncodeError(`ffmpeg wrote no ${name}`);
      }
      copyFileSync(wavPath, join(req.dir, "audio.wav"));
      const jobs = [
        { from: "picture.webm", out: "preview.webm", audio: ["-c:a", "libopus", "-b:a", "96k"] },
        { from: "picture.mp4", out: "preview.mp4", audio: ["-c:a", "aac", "-b:a", "128k", "-movflags", "+faststart"] },
      ];
      for (const job of jobs) {
        const result = await runSandboxed({
          command: "/usr/bin/ffmpeg",
          args: [
            "-hide_banner", "-loglevel", "error", "-y", "-i", `/build/${job.from}`, "-i", "/build/audio.wav",
            "-map", "0:v", "-map", "1:a", "-c:v", "copy", ...job.audio, "-t", durationSeconds.toFixed(4), `/build/${job.out}`,
          ],
          buildDir: req.dir,
          limits: { wallSeconds: 300, cpuSeconds: 600 },
          maxOutputBytes: 64 * 1024,
        });
        if (result.exitCode !== 0 || result.timedOut) throw failure(job.out, result);
      }
      return { webm: join(req.dir, "preview.webm"), mp4: join(req.dir, "preview.mp4"), ms: Date.now() - started };
    },
  };
}
