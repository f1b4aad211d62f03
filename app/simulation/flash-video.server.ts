import { FlashAnalyzer, videoSpan, type FlashReport, type FlashSpan, type FlashViewing } from "./flash";
import { streamVideoFrames } from "./video-decode.server";

/**
 * Flash analysis of an uploaded capture video over its whole length (up to maxSeconds), with the same analyser as
 * the reference capture, streamed from ffmpeg frame by frame.
 */
export const UPLOAD_GRID = { width: 160, height: 120 };
export const UPLOAD_FRAME_RATE = "60000/1001";
const UPLOAD_FPS = 60000 / 1001;
/** the longest a video is analysed: the ruleset's longest whole-demo capture */
export const UPLOAD_MAX_SECONDS = 600;

export interface VideoFlashOptions {
  workDir: string;
  maxSeconds?: number;
  viewing?: FlashViewing;
}

export async function analyzeVideoFile(path: string, options: VideoFlashOptions): Promise<{ report: FlashReport; span: FlashSpan }> {
  const maxSeconds = options.maxSeconds ?? UPLOAD_MAX_SECONDS;
  const analyzer = new FlashAnalyzer(UPLOAD_GRID.width, UPLOAD_GRID.height, UPLOAD_FPS, options.viewing ?? "desk");
  // ffmpeg averages into 160x120 in stored values; each pixel of that is then one analysis cell
  const grid = { width: UPLOAD_GRID.width, height: UPLOAD_GRID.height, linear: new Float32Array(UPLOAD_GRID.width * UPLOAD_GRID.height * 3) };
  const frames = await streamVideoFrames(
    { videoPath: path, workDir: options.workDir, width: UPLOAD_GRID.width, height: UPLOAD_GRID.height, pixelFormat: "rgb24", frameRate: UPLOAD_FRAME_RATE, maxSeconds },
    (frame) => {
      for (let i = 0; i < frame.length; i++) grid.linear[i] = LINEAR[frame[i]];
      analyzer.push(grid);
    },
  );
  const seconds = frames / UPLOAD_FPS;
  // a video that ended before the limit was seen whole
  return { report: analyzer.report(), span: videoSpan(seconds, seconds < maxSeconds - 1 / UPLOAD_FPS) };
}

const LINEAR = Float32Array.from({ length: 256 }, (_, v) => {
  const e = v / 255;
  return e <= 0.04045 ? e / 12.92 : ((e + 0.055) / 1.055) ** 2.4;
});
