import { data } from "react-router";
import { requireShowcase } from "~/showcase/page.server";
import { publicMediaFile } from "~/showcase/showcase.server";
import { headObject } from "~/storage/s3.server";
import { objectResponse } from "~/storage/ranged-response.server";
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
  const headers = new Headers({ "Content-Type": f.mediaType, "Cache-Control": "public, max-age=300", "X-Content-Type-Options": "nosniff" });
  return objectResponse(f.s3Key, head.size, request.headers.get("range"), headers);
}
