import { redirect } from "react-router";
import { notFound, requireCompetitionRole } from "~/competitions/access.server";
import { fileDownloadUrl } from "~/competitions/entries-admin.server";
import type { Route } from "./+types/organize.$competitionId.files.$fileId";
import { isId } from "~/security/ids";

/** Any uploaded file of an entry in this compo, for its organizers: a short-lived presigned GET. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  if (!isId(params.fileId)) notFound("No such file in this compo.");
  const url = await fileDownloadUrl(competition.id, params.fileId);
  if (!url) notFound("No such file in this compo.");
  return redirect(url, { headers: { "Cache-Control": "no-store" } });
}
