import { readFileSync } from "node:fs";
import { CompareError, compareCaptures, type CaptureComparison, type LumaSequence } from "./compare";
import { decodeVideo } from "./video-decode.server";

/** Compares an uploaded capture video with a reference luma sequence (see reference luma in capture.server). */
export async function compareVideoFile(path: string, reference: LumaSequence, workDir: string): Promise<CaptureComparison> {
  const raw = await decodeVideo({
    videoPath: path, workDir, width: reference.width, height: reference.height, pixelFormat: "gray",
    frameRate: `${reference.fps}`, maxSeconds: reference.frames.length / reference.fps + 10,
  });
  const bytes = readFileSync(raw);
  const cells = reference.width * reference.height;
  const count = Math.floor(bytes.length / cells);
  if (count === 0) throw new CompareError("the capture video has no frames");
  const frames = Array.from({ length: count }, (_, i) => new Uint8Array(bytes.subarray(i * cells, (i + 1) * cells)));
  return compareCaptures(reference, { width: reference.width, height: reference.height, fps: reference.fps, frames });
}
