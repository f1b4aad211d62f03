import { createHash } from "node:crypto";
import { pipeline, Readable, Transform } from "node:stream";
import yazl from "yazl";
import { getObjectStream, headObject } from "~/storage/s3.server";

/**
 * A zip written while it is sent: stored objects are fetched from S3 one at a time (yazl asks for the next
 * stream only when the previous one is written), so memory stays flat whatever the archive's size. Every stored
 * object is hashed on the way through; one whose bytes differ from the SHA-256 recorded at upload aborts the
 * download instead of shipping a file the manifest would contradict. Entries are stored, not deflated (media is
 * compressed already), which also lets the total size be known up front.
 */
export type ZipItem = { path: string; mtime: Date } & ({ bytes: Buffer } | { s3Key: string; sizeBytes: number; sha256: string });

export class ArchiveIntegrityError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ArchiveIntegrityError";
  }
}

/**
 * Before a byte is sent: every stored object is there with its recorded size (HEAD requests, a few at a time).
 * Missing or resized objects are named in one clear error instead of a download that breaks halfway.
 */
export async function assertStored(items: ZipItem[]): Promise<void> {
  const stored = items.filter((i): i is Extract<ZipItem, { s3Key: string }> => "s3Key" in i);
  const problems: string[] = [];
  for (let i = 0; i < stored.length; i += 8) {
    const heads = await Promise.all(stored.slice(i, i + 8).map((it) => headObject(it.s3Key)));
    heads.forEach((h, j) => {
      const it = stored[i + j];
      if (!h) problems.push(`${it.path} is missing from storage`);
      else if (h.size !== it.sizeBytes) problems.push(`${it.path} is ${h.size} bytes in storage, ${it.sizeBytes} at upload`);
    });
  }
  if (problems.length) throw new ArchiveIntegrityError(`${problems.length} stored file${problems.length === 1 ? "" : "s"} cannot go into the zip: ${problems.slice(0, 5).join("; ")}${problems.length > 5 ? " …" : ""}.`);
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
      done(actual === expected ? null : new ArchiveIntegrityError(`${path}: stored bytes hash to ${actual}, the upload recorded ${expected}`));
    },
  });
}

export function sha256Hex(b: Buffer | string): string {
  return createHash("sha256").update(b).digest("hex");
}

/**
 * The zip as a web stream, made at once so that an error (a hash mismatch, storage going away) always has a reader
 * to go to: the download breaks off, the process stays up.
 */
export function streamZip(items: ZipItem[]): { body: ReadableStream<Uint8Array>; totalBytes: number | null } {
  const zip = new yazl.ZipFile();
  const body = Readable.toWeb(zip.outputStream) as ReadableStream<Uint8Array>;
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
  return { body, totalBytes };
}

export function zipResponse(zip: { body: ReadableStream<Uint8Array>; totalBytes: number | null }, filename: string): Response {
  const headers: Record<string, string> = { "Content-Type": "application/zip", "Content-Disposition": `attachment; filename="${filename}"`, "Cache-Control": "no-store" };
  if (zip.totalBytes !== null) headers["Content-Length"] = String(zip.totalBytes);
  return new Response(zip.body, { headers });
}
