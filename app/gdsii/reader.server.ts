import { open } from "node:fs/promises";
import { GdsiiError } from "./errors";
import { LayoutReader } from "./reader";
import { DEFAULT_READ_LIMITS, type LayoutSummary, type ReadOptions } from "./summary";

const CHUNK_BYTES = 4 * 1024 * 1024;

/** Streams a GDSII file from disk in chunks; files above `limits.maxBytes` are refused unread. */
export async function readLayoutFile(path: string, opts: ReadOptions = {}): Promise<LayoutSummary> {
  const maxBytes = opts.limits?.maxBytes ?? DEFAULT_READ_LIMITS.maxBytes;
  const file = await open(path, "r");
  try {
    const { size } = await file.stat();
    if (size > maxBytes) {
      throw new GdsiiError(`the layout file is ${size} bytes, more than the limit of ${maxBytes} bytes`);
    }
    const reader = new LayoutReader(opts);
    const chunk = new Uint8Array(Math.min(CHUNK_BYTES, Math.max(size, 1)));
    let total = 0;
    for (;;) {
      const { bytesRead } = await file.read(chunk, 0, chunk.length, null);
      if (bytesRead === 0) break;
      total += bytesRead;
      if (total > maxBytes) throw new GdsiiError(`the layout file grew past the limit of ${maxBytes} bytes while being read`);
      // The reader copies only the partial record it keeps, so the chunk buffer can be reused.
      reader.push(chunk.subarray(0, bytesRead));
    }
    return reader.finish();
  } finally {
    await file.close();
  }
}
