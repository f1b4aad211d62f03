import { data } from "react-router";
import { getSession } from "~/auth/guards.server";
import { viewableArtifact } from "~/conformance/access.server";
import { objectResponse } from "~/storage/ranged-response.server";
import type { Route } from "./+types/artifacts.$artifactId";

/** Streams a check-run artifact (frames, preview video, WAV, layout picture), with byte ranges for video seeking. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const session = await getSession(context);
  const artifact = await viewableArtifact(session?.user ?? null, params.artifactId);
  if (!artifact) throw data({ message: "No such file." }, { status: 404 });
  const headers = new Headers({
    "Content-Type": artifact.mediaType,
    "Cache-Control": "private, max-age=3600",
    ETag: `"${artifact.sha256}"`,
    "X-Content-Type-Options": "nosniff",
  });
  // SVG pictures are our own output, but keep them inert if opened directly.
  if (artifact.mediaType === "image/svg+xml") headers.set("Content-Security-Policy", "default-src 'none'; style-src 'unsafe-inline'");
  return objectResponse(artifact.s3Key, artifact.sizeBytes, request.headers.get("range"), headers);
}
