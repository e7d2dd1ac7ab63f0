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

/** What each kind of error means and what to do next, when the thrower gives no message of its own. */
const defaultMessage: Record<ErrorKind, string> = {
  bad_request: "The request is not valid; fix the problems listed in issues and send it again.",
  unauthorized:
    "Sign in, or send an API token (Authorization: Bearer …) made on the API tokens page (/settings/tokens).",
  forbidden: "You do not have access to this; ask the owner of the project or course to give it to you.",
  not_found:
    "Nothing is here: it may have been deleted, or you may not have access to it. Check the link, or ask its owner to share it.",
  conflict: "This changed since you loaded it; reload to see the latest version, then make your change again.",
  payload_too_large: "The request is too large for this server; send a smaller file or split it into parts.",
  unsupported_media_type:
    "The request body has the wrong content type; send the type the API documentation lists for this endpoint (usually application/json).",
  unprocessable:
    "The request is well-formed but cannot be carried out as sent; change what issues names and try again.",
  rate_limited: "Too many requests; wait a minute and try again.",
  internal:
    "Something went wrong on the server and it has been logged; try again, and if it keeps happening tell the site's administrator the request id (X-Request-Id).",
  unavailable: "The service is briefly unavailable; try again in a minute.",
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
