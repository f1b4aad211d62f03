import { data } from "react-router";
import { apiError, requireApiUser, requireMethod, type ApiErrorBody } from "~/api/json.server";
import type { RequestContext } from "~/auth/guards.server";
import { requireCompetitionRole } from "~/competitions/access.server";
import { competitionForJudge, judgingView } from "./access.server";
import { JudgingError } from "./errors";

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

/**
 * Turns a JudgingError into the one API error shape. A 409 also carries the current value beside `error`
 * (`{error, current}`), so the grid can show the judge what the other tab saved.
 */
export function judgingApiError(e: JudgingError): Response {
  if (e.details) {
    const body: ApiErrorBody & Record<string, unknown> = { error: { status: e.status, code: e.code, message: e.message }, ...e.details };
    return Response.json(body, { status: e.status, headers: { "Cache-Control": "no-store" } });
  }
  return apiError(e.status, e.code, e.message, e.fieldErrors);
}

/** The signed-in organizer and one of their compos in the judging shape (the guard is requireCompetitionRole). */
export async function requireJuryOrganizer(request: Request, context: RequestContext, competitionId: string | undefined) {
  const { user, competition, event } = await requireCompetitionRole(request, context, competitionId, "organizer");
  return { user, c: judgingView(competition, event) };
}

/** Runs a judging service call for a JSON route; only JudgingError is translated, anything else propagates. */
export async function apiCall<T>(fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof JudgingError) throw judgingApiError(e);
    throw e;
  }
}

/** The same for pages: a JudgingError becomes a thrown data() response with its status and message. */
export async function pageCall<T>(fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof JudgingError) throw data({ message: e.message }, { status: e.status });
    throw e;
  }
}
