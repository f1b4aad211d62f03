import { Readable } from "node:stream";
import { data } from "react-router";
import { getSession } from "~/auth/guards.server";
import { viewableArtifact } from "~/conformance/access.server";
import { getObjectStream } from "~/storage/s3.server";
import type { Route } from "./+types/artifacts.$artifactId";

/** Streams a check-run artifact (frames, preview video, WAV, layout picture), with byte ranges for video seeking. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const session = await getSession(request);
  const artifact = await viewableArtifact(session?.user ?? null, params.artifactId);
  if (!artifact) throw data({ message: "No such file." }, { status: 404 });
  const size = artifact.sizeBytes;
  const range = /^bytes=(\d*)-(\d*)$/.exec(request.headers.get("range") ?? "");
  const headers = new Headers({
    "Content-Type": artifact.mediaType,
    "Accept-Ranges": "bytes",
    "Cache-Control": "private, max-age=3600",
    ETag: `"${artifact.sha256}"`,
    "X-Content-Type-Options": "nosniff",
  });
  // SVG pictures are our own output, but keep them inert if opened directly.
  if (artifact.mediaType === "image/svg+xml") headers.set("Content-Security-Policy", "default-src 'none'; style-src 'unsafe-inline'");
  if (range && (range[1] || range[2])) {
    const start = range[1] ? Number(range[1]) : Math.max(0, size - Number(range[2]));
    const end = range[1] && range[2] ? Math.min(Number(range[2]), size - 1) : size - 1;
    if (start >= size || start > end) return new Response(null, { status: 416, headers: { "Content-Range": `bytes */${size}` } });
    headers.set("Content-Range", `bytes ${start}-${end}/${size}`);
    headers.set("Content-Length", String(end - start + 1));
    const body = await getObjectStream(artifact.s3Key, `bytes=${start}-${end}`);
    return new Response(Readable.toWeb(body) as ReadableStream, { status: 206, headers });
  }
  headers.set("Content-Length", String(size));
  return new Response(Readable.toWeb(await getObjectStream(artifact.s3Key)) as ReadableStream, { status: 200, headers });
}
