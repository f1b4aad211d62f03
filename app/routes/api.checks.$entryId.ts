import { apiError, apiJson } from "~/api/json.server";
import { getSession } from "~/auth/guards.server";
import { entryViewer } from "~/conformance/access.server";
import { latestCheckFor } from "~/conformance/report.server";
import type { Route } from "./+types/api.checks.$entryId";

/** The entry's latest check run, polled by the entry page while a run is queued or running. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const session = await getSession(context);
  const viewer = await entryViewer(session?.user ?? null, params.entryId);
  if (viewer !== "insider") throw apiError(session ? 404 : 401, session ? "not_found" : "unauthenticated", session ? "No such entry." : "Sign in first.");
  return apiJson({ check: await latestCheckFor(params.entryId) });
}
