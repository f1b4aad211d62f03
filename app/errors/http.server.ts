import { data } from "react-router";
import type { ApiErrorBody } from "~/api/json.server";
import { AppError } from "./app-error";

/**
 * Where an AppError becomes an answer, for every route: `apiCall` for resource routes (the API error body),
 * `attempt` + `formReply` for page actions that show the refusal on their form, `pageCall` for loaders and actions
 * whose refusal is the page (the error boundary with the status). Only AppError is translated; anything else
 * propagates as the fault it is.
 */

/** The one API error body for an AppError; `details` go beside `error` (a 409's current value). */
export function appErrorResponse(e: AppError): Response {
  const body: ApiErrorBody & Record<string, unknown> = {
    error: { status: e.status, code: e.code, message: e.message, ...(e.fieldErrors ? { fieldErrors: e.fieldErrors } : {}) },
    ...e.details,
  };
  return Response.json(body, { status: e.status, headers: { ...e.headers, "Cache-Control": "no-store" } });
}

/** Runs a service call for a JSON route: an AppError is thrown as its API answer. */
export async function apiCall<T>(fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof AppError) throw appErrorResponse(e);
    throw e;
  }
}

/** Runs a service call for a page whose refusal is the page itself: a thrown data() with the status and message. */
export async function pageCall<T>(fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (e) {
    if (e instanceof AppError) throw data({ message: e.message }, { status: e.status, headers: e.headers });
    throw e;
  }
}

export type Attempt<T> = { ok: true; value: T } | { ok: false; error: AppError };

/** Runs a service call for a page action that shows a refusal beside its form: the AppError comes back as a value. */
export async function attempt<T>(fn: () => Promise<T>): Promise<Attempt<T>> {
  try {
    return { ok: true, value: await fn() };
  } catch (e) {
    if (e instanceof AppError) return { ok: false, error: e };
    throw e;
  }
}

interface Replyable<R> {
  reply(options?: { fieldErrors?: Record<string, string[]>; formErrors?: string[] }): R;
}

/** A conform submission's reply for a refusal: its field errors on their fields, its form errors (or message) above. */
export function formReply<R>(submission: Replyable<R>, e: AppError): R {
  const formErrors = e.formErrors ?? (e.fieldErrors ? undefined : [e.message]);
  return submission.reply({ ...(e.fieldErrors ? { fieldErrors: e.fieldErrors } : {}), ...(formErrors ? { formErrors } : {}) });
}

/** A refusal for a page action without a conform form: the message, and the first field it names if any. */
export function actionError(e: AppError): { error: string; field?: string } {
  const field = e.fieldErrors ? Object.keys(e.fieldErrors)[0] : undefined;
  return field ? { error: e.fieldErrors?.[field]?.[0] ?? e.message, field } : { error: e.message };
}
