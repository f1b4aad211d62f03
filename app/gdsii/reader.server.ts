import { createReadStream } from "node:fs";
import { open } from "node:fs/promises";
import { createGunzip } from "node:zlib";
import { GdsiiError } from "./errors";
import { LayoutReader } from "./reader";
import { MAX_RECORD_BYTES } from "./records";
import { DEFAULT_READ_LIMITS, type LayoutSummary, type ReadOptions } from "./summary";

const CHUNK_BYTES = 4 * 1024 * 1024;
/** gzip member header ID1 ID2 (RFC 1952, section 2.3.1). */
const GZIP_MAGIC = [0x1f, 0x8b];

/**
 * Streams a GDSII file from disk in chunks; files above `limits.maxBytes` are refused unread. A gzip-compressed
 * layout (.gds.gz) is inflated on the fly and held to the same limit on its inflated size, so a small file that
 * inflates to gigabytes (a gzip bomb) is stopped at the limit, never held in memory.
 */
export async function readLayoutFile(path: string, opts: ReadOptions = {}): Promise<LayoutSummary> {
  const maxBytes = opts.limits?.maxBytes ?? DEFAULT_READ_LIMITS.maxBytes;
  if (await isGzip(path)) return readGzipLayout(path, maxBytes, opts);
  const file = await open(path, "r");
  try {
    const { size } = await file.stat();
    if (size > maxBytes) {
      throw new GdsiiError(`the layout file is ${size} bytes, more than the limit of ${maxBytes} bytes`);
    }
    const reader = new LayoutReader(opts);
    // One buffer for the whole file: each read lands after the partial record the last scan left, which is
    // first moved to the front (a record is at most 64 KiB), so no chunk is ever copied whole.
    const buf = new Uint8Array(Math.min(CHUNK_BYTES, Math.max(size, 1)) + MAX_RECORD_BYTES + 4);
    const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
    let kept = 0;
    let total = 0;
    for (;;) {
      const { bytesRead } = await file.read(buf, kept, buf.length - kept, null);
      if (bytesRead === 0) break;
      total += bytesRead;
      if (total > maxBytes) throw new GdsiiError(`the layout file grew past the limit of ${maxBytes} bytes while being read`);
      const length = kept + bytesRead;
      const used = reader.scanOwned(buf, view, length);
      kept = length - used;
      buf.copyWithin(0, used, length);
    }
    return reader.finish();
  } finally {
    await file.close();
  }
}

async function isGzip(path: string): Promise<boolean> {
  const file = await open(path, "r");
  try {
    const head = new Uint8Array(2);
    const { bytesRead } = await file.read(head, 0, 2, 0);
    return bytesRead === 2 && head[0] === GZIP_MAGIC[0] && head[1] === GZIP_MAGIC[1];
  } finally {
    await file.close();
  }
}

async function readGzipLayout(path: string, maxBytes: number, opts: ReadOptions): Promise<LayoutSummary> {
  const reader = new LayoutReader(opts);
  // The stream is destroyed at the limit; chunkSize bounds how far past it one inflate step can go.
  const gunzip = createGunzip({ chunkSize: 64 * 1024 });
  const source = createReadStream(path);
  source.pipe(gunzip);
  let inflated = 0;
  try {
    for await (const chunk of gunzip as AsyncIterable<Buffer>) {
      inflated += chunk.length;
      if (inflated > maxBytes) {
        throw new GdsiiError(
          `the compressed layout inflates to more than ${maxBytes} bytes, the limit for a layout (a .gds.gz is held to the same limit as a plain .gds); it was refused`,
        );
      }
      reader.push(chunk);
    }
  } catch (e) {
    if (e instanceof GdsiiError) throw e;
    const code = (e as NodeJS.ErrnoException).code ?? "";
    if (code.startsWith("Z_") || code === "ERR_STREAM_PREMATURE_CLOSE") {
      throw new GdsiiError(`the layout looks gzip-compressed but does not inflate: ${(e as Error).message}`);
    }
    throw e;
  } finally {
    source.destroy();
    gunzip.destroy();
  }
  return reader.finish();
}
