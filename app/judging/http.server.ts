import { apiError, requireApiUser, requireMethod } from "~/api/json.server";
import type { RequestContext } from "~/auth/guards.server";
import { requireCompetitionRole } from "~/competitions/access.server";
import { competitionForJudge, judgingView } from "./access.server";

/**
 * The signed-in judge and one competition they judge, or the API's 401 / 405 (a method not in `methods`) / 404,
 * in that order: the first line of every judging JSON route.
 */
export async function requireApiJudge(request: Request, context: RequestContext, competitionId: string | undefined, methods?: string[]) {
  const user = await requireApiUser(context);
  if (methods) requireMethod(request, methods);
  const competition = await competitionForJudge(user.id, competitionId);
  if (!competition) throw apiError(404, "not_found", "That competition was not found among the ones you judge.");
  return { user, competition };
}

/** The signed-in organizer and one of their compos in the judging shape (the guard is requireCompetitionRole). */
export async function requireJuryOrganizer(request: Request, context: RequestContext, competitionId: string | undefined) {
  const { user, competition, event } = await requireCompetitionRole(request, context, competitionId, "organizer");
  return { user, c: judgingView(competition, event) };
}
