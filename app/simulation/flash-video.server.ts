import { FlashAnalyzer, flashGrid, type FlashReport } from "./flash";
import { RawFrameFile } from "./frame-file.server";
import { decodeVideo } from "./video-decode.server";

/** Flash analysis of an uploaded capture video: the same analyser as the reference capture. */
export const UPLOAD_GRID = { width: 160, height: 120 };
export const UPLOAD_FRAME_RATE = "60000/1001";

export interface VideoFlashOptions {
  workDir: string;
  maxSeconds?: number;
}

export async function analyzeVideoFile(path: string, options: VideoFlashOptions): Promise<FlashReport> {
  // ffmpeg averages into 160x120 in stored values; each pixel of that is then one analysis cell
  const raw = await decodeVideo({
    videoPath: path, workDir: options.workDir, width: UPLOAD_GRID.width, height: UPLOAD_GRID.height,
    pixelFormat: "rgb24", frameRate: UPLOAD_FRAME_RATE, maxSeconds: options.maxSeconds ?? 120,
  });
  const file = new RawFrameFile(raw, UPLOAD_GRID.width, UPLOAD_GRID.height);
  try {
    const analyzer = new FlashAnalyzer(UPLOAD_GRID.width, UPLOAD_GRID.height, 60000 / 1001);
    for (let i = 0; i < file.count; i++) analyzer.push(flashGrid(file.read(i), 1));
    return analyzer.report();
  } finally {
    file.close();
  }
}
