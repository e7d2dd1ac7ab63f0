/**
 * Typed application errors and the one error shape every API response uses:
 * `{ "error": { "code", "message", "issues": [{ "path", "message" }] } }`.
 * Handlers throw `AppError`; lib/server/route.ts turns it (and anything else) into a response.
 */

/** One problem with an input, named by its field path (`document.arm.joints[1].maxVelocity`). */
export type Issue = { path: string; message: string };

/** Error codes: a kind, optionally `kind:subject` (e.g. `forbidden:plan`, `not_found:project`). */
export type ErrorKind =
  | "bad_request"
  | "unauthorized"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "payload_too_large"
  | "unsupported_media_type"
  | "unprocessable"
  | "rate_limited"
  | "internal"
  | "unavailable";
export type ErrorCode = ErrorKind | `${ErrorKind}:${string}`;

const statusByKind: Record<ErrorKind, number> = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  unprocessable: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
};

const defaultMessage: Record<ErrorKind, string> = {
  bad_request: "The request is not valid.",
  unauthorized: "Sign in or send an API token (Authorization: Bearer …).",
  forbidden: "Your role does not allow this.",
  not_found: "Not found.",
  conflict: "The resource changed since you loaded it.",
  payload_too_large: "The request body is too large.",
  unsupported_media_type: "The request body has the wrong content type.",
  unprocessable: "The request is well-formed but cannot be processed.",
  rate_limited: "Too many requests; wait and try again.",
  internal: "Something went wrong on the server; it has been logged.",
  unavailable: "The service is briefly unavailable; try again shortly.",
};

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly issues: Issue[];
  readonly details: Record<string, unknown> | undefined;

  constructor(code: ErrorCode, message?: string, options?: { issues?: Issue[]; details?: Record<string, unknown> }) {
    super(message ?? defaultMessage[kindOf(code)]);
    this.name = "AppError";
    this.code = code;
    this.issues = options?.issues ?? [];
    this.details = options?.details;
  }

  get status(): number {
    return statusByKind[kindOf(this.code)];
  }
}

export function kindOf(code: ErrorCode): ErrorKind {
  return code.split(":", 1)[0] as ErrorKind;
}

/** The JSON body of an error response. */
export type ErrorBody = {
  error: { code: string; message: string; issues: Issue[] } & Record<string, unknown>;
};

export function errorBody(err: AppError): ErrorBody {
  return { error: { code: err.code, message: err.message, issues: err.issues, ...(err.details ?? {}) } };
}
