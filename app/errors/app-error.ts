/**
 * The one failure shape of Gatecrash's services. A service that refuses (a rule, a missing object, a stale
 * version) throws an AppError; routes translate it in one place (app/errors/http.server.ts): resource routes into
 * the API error body `{error: {status, code, message, fieldErrors?}}`, page actions into a form reply or a notice.
 * Anything that is not an AppError is a fault and propagates (the error page, a 500).
 */
export type FieldErrors = Record<string, string[]>;

export interface AppErrorExtra {
  /** Problems of single form fields, keyed as the form names them. */
  fieldErrors?: FieldErrors;
  /** Problems of the form as a whole, shown above it (the message is used when there are none). */
  formErrors?: string[];
  /** Extra members beside `error` in an API answer (a 409's current value, so the client can show it). */
  details?: Record<string, unknown>;
  /** Headers of the HTTP answer (a 429's Retry-After). */
  headers?: Record<string, string>;
}

export class AppError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fieldErrors?: FieldErrors;
  readonly formErrors?: string[];
  readonly details?: Record<string, unknown>;
  readonly headers?: Record<string, string>;

  constructor(status: number, code: string, message: string, extra: AppErrorExtra = {}) {
    super(message);
    this.name = "AppError";
    this.status = status;
    this.code = code;
    this.fieldErrors = extra.fieldErrors;
    this.formErrors = extra.formErrors;
    this.details = extra.details;
    this.headers = extra.headers;
  }
}

/** Shorthands for the refusals services use most. */
export const notFound = (message: string, extra?: AppErrorExtra) => new AppError(404, "not_found", message, extra);
export const conflict = (code: string, message: string, extra?: AppErrorExtra) => new AppError(409, code, message, extra);
export const forbidden = (code: string, message: string, extra?: AppErrorExtra) => new AppError(403, code, message, extra);
