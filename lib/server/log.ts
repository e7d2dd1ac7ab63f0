/**
 * Structured logs (pino, one JSON object per line on standard output; `npm start` and the test
 * server send that to `.data/server.log`). Each API request gets one line from lib/server/route.ts
 * with its request id, route, status, duration and actor id; the request context below carries
 * what a handler learns on the way (the actor, the engine's work counters). Never log secrets,
 * cookies, tokens or documents: only ids, counts and codes.
 */
import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import pino from "pino";

export const logger = pino({
  level: process.env.LOG_LEVEL ?? (process.env.NODE_ENV === "test" ? "warn" : "info"),
  base: { service: "jointproof" },
  // Belt and braces: the request line never carries these, and neither may anything else.
  redact: {
    paths: ["password", "token", "cookie", "authorization", "*.password", "*.token", "*.cookie", "*.authorization"],
    censor: "[redacted]",
  },
});

/** What one request has learnt so far; filled in by requireActor and the check routes. */
export type RequestContext = {
  requestId: string;
  actorId?: string;
  /** The engine's work counters for a check (samples, refinements …), when the route ran one. */
  work?: Record<string, number>;
};

const storage = new AsyncLocalStorage<RequestContext>();

/** Runs `fn` with `context` as the current request's context. */
export function withRequestContext<T>(context: RequestContext, fn: () => Promise<T>): Promise<T> {
  return storage.run(context, fn);
}

/** The current request's context, if any (undefined outside a route handler). */
export function requestContext(): RequestContext | undefined {
  return storage.getStore();
}

/** Adds the engine's work counters to the current request's log line. */
export function noteWork(counters: Record<string, number>): void {
  const ctx = storage.getStore();
  if (ctx) ctx.work = { ...ctx.work, ...counters };
}
