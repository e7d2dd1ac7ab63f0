/**
 * Web security glue: the same-origin check for state-changing requests made with a session
 * cookie (the security headers are in security-headers.ts). The Origin header is defined in RFC 6454 §7;
 * Sec-Fetch-Site in the W3C Fetch Metadata Request Headers specification.
 */
import { env } from "./env";
import { AppError } from "./errors";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Origins allowed to change data with a session cookie: exactly the configured APP_URL origin and
 * the documented extras in ALLOWED_ORIGINS. Never the request's own Host: `localhost` is not
 * `127.0.0.1`, and a Host header is whatever the client sends.
 */
export function allowedOrigins(): Set<string> {
  const e = env();
  return new Set([new URL(e.APP_URL).origin, ...e.ALLOWED_ORIGINS]);
}

/** Throws `forbidden:origin` for a cross-site state-changing request. */
export function assertSameOrigin(request: Request): void {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return;
  const origin = request.headers.get("origin");
  if (origin !== null) {
    if (allowedOrigins().has(origin)) return;
    throw new AppError("forbidden:origin", "Cross-site requests cannot change data with a session cookie.");
  }
  // No Origin header: accept only when the browser says the request is from this site.
  const site = request.headers.get("sec-fetch-site");
  if (site === "same-origin" || site === "none") return;
  throw new AppError("forbidden:origin", "State-changing requests with a session cookie must come from this site.");
}
