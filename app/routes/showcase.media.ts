import { data, redirect } from "react-router";
import { requireShowcase } from "~/showcase/page.server";
import { publicMediaFile } from "~/showcase/showcase.server";
import { presignGet } from "~/storage/s3.server";
import type { Route } from "./+types/showcase.media";

/** An eligible entry's capture video or still, by a short-lived storage link; nothing else of the upload is public. */
export async function loader({ params }: Route.LoaderArgs) {
  const c = await requireShowcase(params);
  const kind = params.kind === "video" || params.kind === "still" ? params.kind : null;
  if (!kind) throw data({ message: "Unknown media." }, { status: 404 });
  const f = await publicMediaFile(c, params.entryId, kind);
  if (!f) throw data({ message: "No such file in the showcase." }, { status: 404 });
  throw redirect(await presignGet(f.s3Key, undefined, 600), { headers: { "Cache-Control": "private, max-age=300" } });
}
