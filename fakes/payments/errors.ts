// Errors in the wire shape the stripe SDK understands: {error: {type, code?, message, param?}}.

export type ApiErrorType =
  | "api_error"
  | "authentication_error"
  | "idempotency_error"
  | "invalid_request_error";

export interface ApiErrorDetails {
  code?: string;
  param?: string;
}

export class ApiError extends Error {
  readonly status: number;
  readonly type: ApiErrorType;
  readonly code?: string;
  readonly param?: string;

  constructor(status: number, type: ApiErrorType, message: string, details: ApiErrorDetails = {}) {
    super(message);
    this.status = status;
    this.type = type;
    this.code = details.code;
    this.param = details.param;
  }

  toBody(): { error: { type: ApiErrorType; message: string; code?: string; param?: string } } {
    return {
      error: {
        type: this.type,
        message: this.message,
        ...(this.code === undefined ? {} : { code: this.code }),
        ...(this.param === undefined ? {} : { param: this.param }),
      },
    };
  }
}

export function invalidRequest(message: string, details: ApiErrorDetails = {}): ApiError {
  return new ApiError(400, "invalid_request_error", message, details);
}

export function missingParam(param: string): ApiError {
  return invalidRequest(`Missing required param: ${param}.`, { code: "parameter_missing", param });
}

export function invalidParam(param: string, message: string, code = "parameter_invalid"): ApiError {
  return invalidRequest(message, { code, param });
}

export function resourceMissing(objectName: string, id: string, param = "id"): ApiError {
  return new ApiError(404, "invalid_request_error", `No such ${objectName}: '${id}'`, {
    code: "resource_missing",
    param,
  });
}
