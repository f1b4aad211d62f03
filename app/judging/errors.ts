/** A refusal from a judging service, with the HTTP status and code the JSON API and pages answer with. */
export class JudgingError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fieldErrors?: Record<string, string[]>;
  readonly details?: Record<string, unknown>;

  constructor(status: number, code: string, message: string, extra: { fieldErrors?: Record<string, string[]>; details?: Record<string, unknown> } = {}) {
    super(message);
    this.name = "JudgingError";
    this.status = status;
    this.code = code;
    this.fieldErrors = extra.fieldErrors;
    this.details = extra.details;
  }
}

/** The one id check (app/security/ids.ts), under the name the judging modules use. */
export { isId as isUuid } from "~/security/ids";
