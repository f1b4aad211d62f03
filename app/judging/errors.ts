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

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export function isUuid(s: string | undefined): s is string {
  return typeof s === "string" && UUID.test(s);
}
