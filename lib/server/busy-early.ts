/**
 * Load shedding before the framework: while every checker is busy and its queue is full, a POST to
 * the check API is answered 503 "busy" by the HTTP server itself, which costs the request thread a
 * tenth of what the framework's routing costs. The route answers exactly so in that state too, before
 * it authenticates or reads the body (app/api/v1/check/route.ts), so the answer is the same either
 * way: same status, body, Retry-After and security headers, a request id and one log line. A flood
 * of checks then leaves the request thread free for health and every other route.
 *
 * Called by instrumentation.ts for every request the process serves.
 */
import { randomUUID } from "node:crypto";
import type { IncomingMessage, ServerResponse } from "node:http";
import { checkersBusyError, checkersFull } from "./check-capacity";
import { errorBody } from "./errors";
import { logger } from "./log";
import { securityHeaders } from "./security-headers";

/** The routes whose handler answers "busy" before anything else when the checkers are full. */
const SHED_PATHS = new Set(["/api/v1/check"]);

/** Answers the request 503 "busy" and returns true when it is a check that would get that answer. */
export function answerBusyEarly(req: IncomingMessage, res: ServerResponse): boolean {
  if (req.method !== "POST" || !checkersFull()) return false;
  const url = req.url ?? "";
  const query = url.indexOf("?");
  if (!SHED_PATHS.has(query < 0 ? url : url.slice(0, query))) return false;
  const startedAt = performance.now();
  const requestId = randomUUID();
  const err = checkersBusyError();
  const body = errorBody(err);
  body.error.requestId = requestId;
  const text = JSON.stringify(body);
  res.writeHead(err.status, {
    ...securityHeaders(process.env.NODE_ENV === "development"),
    "Content-Type": "application/json",
    "Content-Length": Buffer.byteLength(text),
    "Cache-Control": "no-store",
    "Retry-After": String(err.details?.retryAfterS),
    "X-Request-Id": requestId,
  });
  // the body is never read: Node discards it once the answer is sent, and the connection stays open
  res.end(text);
  logger.info(
    {
      requestId,
      method: req.method,
      route: SHED_PATHS.has(url) ? url : url.slice(0, query),
      status: err.status,
      durationMs: Math.round((performance.now() - startedAt) * 10) / 10,
      early: true,
    },
    "request",
  );
  return true;
}
