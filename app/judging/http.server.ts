import { data } from "react-router";
import { apiError, type ApiErrorBody } from "~/api/json.server";
import { JudgingError } from "./errors";

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
