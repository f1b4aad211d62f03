import { createHash } from "node:crypto";
import { pipeline, Readable, Transform } from "node:stream";
import yazl from "yazl";
import { getObjectStream } from "~/storage/s3.server";

/**
 * A zip written while it is sent: stored objects are fetched from S3 one at a time (yazl asks for the next
 * stream only when the previous one is written), so memory stays flat whatever the archive's size. Every stored
 * object is hashed on the way through; one whose bytes differ from the SHA-256 recorded at upload aborts the
 * download instead of shipping a file the manifest would contradict. Entries are stored, not deflated (media is
 * compressed already), which also lets the total size be known up front.
 */
export type ZipItem = { path: string; mtime: Date } & ({ bytes: Buffer } | { s3Key: string; sizeBytes: number; sha256: string });

export class ArchiveIntegrityError extends Error {
  constructor(path: string, expected: string, actual: string) {
    super(`${path}: stored bytes hash to ${actual}, the upload recorded ${expected}`);
    this.name = "ArchiveIntegrityError";
  }
}

function verifying(path: string, expected: string): Transform {
  const hash = createHash("sha256");
  return new Transform({
    transform(chunk: Buffer, _enc, done) {
      hash.update(chunk);
      done(null, chunk);
    },
    flush(done) {
      const actual = hash.digest("hex");
      done(actual === expected ? null : new ArchiveIntegrityError(path, expected, actual));
    },
  });
}

export function sha256Hex(b: Buffer | string): string {
  return createHash("sha256").update(b).digest("hex");
}

export function streamZip(items: ZipItem[]): { stream: Readable; totalBytes: number | null } {
  const zip = new yazl.ZipFile();
  const fail = (err: Error) => zip.outputStream.destroy(err);
  zip.on("error", fail);
  for (const it of items) {
    const options = { mtime: it.mtime, compress: false };
    if ("bytes" in it) {
      zip.addBuffer(it.bytes, it.path, options);
      continue;
    }
    zip.addReadStreamLazy(it.path, { ...options, size: it.sizeBytes }, (cb) => {
      getObjectStream(it.s3Key).then(
        (source) => {
          const check = verifying(it.path, it.sha256);
          pipeline(source, check, (err) => err && fail(err));
          cb(null, check);
        },
        (err: Error) => cb(err, undefined as never),
      );
    });
  }
  let totalBytes: number | null = null;
  zip.end({}, (size: number) => {
    totalBytes = size >= 0 ? size : null;
  });
  return { stream: zip.outputStream as Readable, totalBytes };
}

export function zipResponse(zip: { stream: Readable; totalBytes: number | null }, filename: string): Response {
  const headers: Record<string, string> = { "Content-Type": "application/zip", "Content-Disposition": `attachment; filename="${filename}"`, "Cache-Control": "no-store" };
  if (zip.totalBytes !== null) headers["Content-Length"] = String(zip.totalBytes);
  return new Response(Readable.toWeb(zip.stream) as ReadableStream, { headers });
}
