import { closeSync, existsSync, fstatSync, openSync, readSync } from "node:fs";
import { setTimeout as delay } from "node:timers/promises";
import type { RgbImage } from "./frames";

function readFrameAt(fd: number, index: number, frameBytes: number): Uint8Array {
  const data = new Uint8Array(frameBytes);
  let done = 0;
  while (done < frameBytes) {
    const n = readSync(fd, data, done, frameBytes - done, index * frameBytes + done);
    if (n === 0) break;
    done += n;
  }
  return data;
}

/** Reads frames of a raw rgb24 file one at a time, so a long run never sits in memory whole. */
export class RawFrameFile {
  readonly frameBytes: number;
  readonly count: number;
  private fd: number;

  constructor(path: string, readonly width: number, readonly height: number) {
    this.frameBytes = width * height * 3;
    this.fd = openSync(path, "r");
    this.count = Math.floor(fstatSync(this.fd).size / this.frameBytes);
  }

  read(index: number): RgbImage {
    if (!Number.isInteger(index) || index < 0 || index >= this.count) throw new RangeError(`frame ${index} is outside 0–${this.count - 1}`);
    return { width: this.width, height: this.height, data: readFrameAt(this.fd, index, this.frameBytes) };
  }

  close(): void {
    closeSync(this.fd);
  }
}

const POLL_MS = 5;

/**
 * Hands each complete frame of a raw rgb24 file to `onFrame`, in order, while another process is still
 * appending to it, so the frames are analysed on the second core during the simulation instead of after
 * it. Returns the number of frames handed over once `writerDone` has settled and the file is drained.
 */
export async function followFrames(
  path: string,
  width: number,
  height: number,
  writerDone: Promise<unknown>,
  onFrame: (img: RgbImage, index: number) => void,
): Promise<number> {
  const frameBytes = width * height * 3;
  let finished = false;
  const settled = writerDone.then(() => { finished = true; }, () => { finished = true; });
  let fd: number | null = null;
  let index = 0;
  try {
    for (;;) {
      // read after the writer has ended: then everything it wrote is in the file
      const last = finished;
      if (fd === null && existsSync(path)) fd = openSync(path, "r");
      if (fd !== null) {
        const size = fstatSync(fd).size;
        for (; (index + 1) * frameBytes <= size; index++) onFrame({ width, height, data: readFrameAt(fd, index, frameBytes) }, index);
      }
      if (last) return index;
      await Promise.race([settled, delay(POLL_MS)]);
    }
  } finally {
    if (fd !== null) closeSync(fd);
  }
}
