import { data } from "react-router";
import { getSession } from "~/auth/guards.server";
import { viewableArtifact } from "~/conformance/access.server";
import { objectResponse } from "~/storage/ranged-response.server";
import { ifNoneMatchMatches, notModified, strongEtag } from "~/security/conditional";
import type { Route } from "./+types/artifacts.$artifactId";

/** Streams a check-run artifact (frames, preview video, WAV, layout picture), with byte ranges for video seeking. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const session = await getSession(context);
  const artifact = await viewableArtifact(session?.user ?? null, params.artifactId);
  if (!artifact) throw data({ message: "No such file." }, { status: 404 });
  const etag = strongEtag(artifact.sha256);
  const headers = new Headers({
    "Content-Type": artifact.mediaType,
    "Cache-Control": "private, max-age=3600",
    ETag: etag,
    "X-Content-Type-Options": "nosniff",
  });
  // An artifact never changes once stored: a viewer who holds it gets 304, after the same access check.
  if (ifNoneMatchMatches(request.headers.get("if-none-match"), etag)) return notModified(etag, headers);
  // SVG pictures are our own output, but keep them inert if opened directly.
  if (artifact.mediaType === "image/svg+xml") headers.set("Content-Security-Policy", "default-src 'none'; style-src 'unsafe-inline'");
  return objectResponse(artifact.s3Key, artifact.sizeBytes, request.headers.get("range"), headers);
}
