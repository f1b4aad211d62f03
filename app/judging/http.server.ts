import { data } from "react-router";
import { apiError, requireApiUser, requireMethod, type ApiErrorBody } from "~/api/json.server";
import { requireUser } from "~/auth/guards.server";
import { competitionForJudge, competitionForOrganizer } from "./access.server";
import { JudgingError } from "./errors";

/**
 * The signed-in judge and one competition they judge, or the API's 401 / 405 (a method not in `methods`) / 404,
 * in that order: the first line of every judging JSON route.
 */
export async function requireApiJudge(request: Request, competitionId: string | undefined, methods?: string[]) {
  const user = await requireApiUser(request);
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

/** The signed-in organizer and one of their compos, or the page's 404: the first line of every jury page. */
export async function requireJuryOrganizer(request: Request, competitionId: string | undefined) {
  const user = await requireUser(request);
  const c = await competitionForOrganizer(user, competitionId);
  if (!c) throw data({ message: "This compo is not among the ones you organize." }, { status: 404 });
  return { user, c };
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
