import { data } from "react-router";
import { requireShowcase } from "~/showcase/page.server";
import { publicMediaFile } from "~/showcase/showcase.server";
import { headObject } from "~/storage/s3.server";
import { objectResponse } from "~/storage/ranged-response.server";
import { ifNoneMatchMatches, notModified, strongEtag } from "~/security/conditional";
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
  if (!f) throw data({ message: "No such file in the showcase." }, { status: 404 });
  const headers = new Headers({ "Content-Type": f.mediaType, "Cache-Control": "public, max-age=300", "X-Content-Type-Options": "nosniff" });
  // The upload receipt's SHA-256 names the file's bytes: a client holding them gets 304 without a trip to the store.
  const etag = f.sha256 && /^[0-9a-f]{64}$/.test(f.sha256) ? strongEtag(f.sha256) : null;
  if (etag) {
    headers.set("ETag", etag);
    if (ifNoneMatchMatches(request.headers.get("if-none-match"), etag)) return notModified(etag, headers);
  }
  const head = await headObject(f.s3Key);
  if (!head) throw data({ message: "No such file in the showcase." }, { status: 404 });
  return objectResponse(f.s3Key, head.size, request.headers.get("range"), headers);
}
