import { Readable } from "node:stream";
import { data } from "react-router";
import { requireShowcase } from "~/showcase/page.server";
import { publicMediaFile } from "~/showcase/showcase.server";
import { getObjectStream, headObject } from "~/storage/s3.server";
import type { Route } from "./+types/showcase.media";

/**
 * An eligible entry's capture video or still, streamed from our own origin (the content security policy allows
 * media only from 'self'), with byte ranges for seeking. Nothing else of the upload is public.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const c = await requireShowcase(params);
  const kind = params.kind === "video" || params.kind === "still" ? params.kind : null;
  if (!kind) throw data({ message: "Unknown media." }, { status: 404 });
  const f = await publicMediaFile(c, params.entryId, kind);
  const head = f ? await headObject(f.s3Key) : null;
  if (!f || !head) throw data({ message: "No such file in the showcase." }, { status: 404 });
  const size = head.size;
  const headers = new Headers({ "Content-Type": f.mediaType, "Accept-Ranges": "bytes", "Cache-Control": "public, max-age=300", "X-Content-Type-Options": "nosniff" });
  const range = /^bytes=(\d*)-(\d*)$/.exec(request.headers.get("range") ?? "");
  if (range && (range[1] || range[2])) {
    const start = range[1] ? Number(range[1]) : Math.max(0, size - Number(range[2]));
    const end = range[1] && range[2] ? Math.min(Number(range[2]), size - 1) : size - 1;
    if (start >= size || start > end) return new Response(null, { status: 416, headers: { "Content-Range": `bytes */${size}` } });
    headers.set("Content-Range", `bytes ${start}-${end}/${size}`);
    headers.set("Content-Length", String(end - start + 1));
    return new Response(Readable.toWeb(await getObjectStream(f.s3Key, `bytes=${start}-${end}`)) as ReadableStream, { status: 206, headers });
  }
  headers.set("Content-Length", String(size));
  return new Response(Readable.toWeb(await getObjectStream(f.s3Key)) as ReadableStream, { status: 200, headers });
}
