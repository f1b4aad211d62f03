import { Readable } from "node:stream";
import { getObjectStream } from "./s3.server";

/**
 * A stored object as an HTTP response, honouring a single `Range: bytes=a-b` request (video seeking needs it):
 * 206 with Content-Range, 416 for a range outside the object, else 200 with the whole object.
 */
export async function objectResponse(key: string, size: number, rangeHeader: string | null, headers: Headers): Promise<Response> {
  headers.set("Accept-Ranges", "bytes");
  const range = /^bytes=(\d*)-(\d*)$/.exec(rangeHeader ?? "");
  if (range && (range[1] || range[2])) {
    const start = range[1] ? Number(range[1]) : Math.max(0, size - Number(range[2]));
    const end = range[1] && range[2] ? Math.min(Number(range[2]), size - 1) : size - 1;
    if (start >= size || start > end) return new Response(null, { status: 416, headers: { "Content-Range": `bytes */${size}` } });
    headers.set("Content-Range", `bytes ${start}-${end}/${size}`);
    headers.set("Content-Length", String(end - start + 1));
    return new Response(Readable.toWeb(await getObjectStream(key, `bytes=${start}-${end}`)) as ReadableStream, { status: 206, headers });
  }
  headers.set("Content-Length", String(size));
  return new Response(Readable.toWeb(await getObjectStream(key)) as ReadableStream, { status: 200, headers });
}
