import { closeSync, fstatSync, openSync, readSync } from "node:fs";
import type { RgbImage } from "./frames";

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
    const data = new Uint8Array(this.frameBytes);
    let done = 0;
    while (done < this.frameBytes) {
      const n = readSync(this.fd, data, done, this.frameBytes - done, index * this.frameBytes + done);
      if (n === 0) break;
      done += n;
    }
    return { width: this.width, height: this.height, data };
  }

  close(): void {
    closeSync(this.fd);
  }
}
