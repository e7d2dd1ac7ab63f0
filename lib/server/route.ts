/**
 * Route-handler glue: the wrapper that turns every error into the one error shape, and the
 * readers that validate params, query strings and bodies with zod before anything else runs.
 * Handlers read in the fixed order: parse (400/413/415) → requireActor (401) → load (404) →
 * authorise (403) → act.
 */
import { randomUUID } from "node:crypto";
import { Readable } from "node:stream";
import { NextResponse } from "next/server";
import { z } from "zod";
import { env } from "./env";
import { AppError, errorBody } from "./errors";
import { assertCleanText, parseJsonBytes, parseOrThrow, toIssues } from "./json-body";

export { assertCleanText, MAX_JSON_DEPTH, parseJsonBytes, textProblem, toIssues } from "./json-body";
import { logger, requestContext, withRequestContext, type RequestContext } from "./log";

export type RouteContext = { params: Promise<unknown> };
type Handler = (request: Request, context: RouteContext) => Promise<Response>;

/** Seconds a client is told to wait (Retry-After, RFC 9110 §10.2.3) while the database is unreachable. */
export const DATABASE_RETRY_AFTER_S = 5;

/**
 * Wraps a handler: AppError → its status and shape; the database unreachable → 503 with
 * Retry-After; anything else → logged once with its cause, a generic 500. Every response carries
 * `X-Request-Id`, every error body the same id, and every request writes one log line.
 */
export function route(handler: Handler): (request: Request, context: RouteContext) => Promise<Response> {
  return async (request, context) => {
    const ctx: RequestContext = { requestId: randomUUID() };
    const startedAt = performance.now();
    const response = await withRequestContext(ctx, async () => {
      try {
        return await handler(request, context);
      } catch (err) {
        return errorResponse(err);
      }
    });
    response.headers.set("X-Request-Id", ctx.requestId);
    logger.info(
      {
        requestId: ctx.requestId,
        method: request.method,
        route: routeName(request.url),
        status: response.status,
        durationMs: Math.round((performance.now() - startedAt) * 10) / 10,
        actorId: ctx.actorId,
        work: ctx.work,
      },
      "request",
    );
    return response;
  };
}

/** The path with ids replaced by `:id`, so log lines group by route (and carry no query string). */
function routeName(url: string): string {
  try {
    return new URL(url).pathname.replace(/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi, ":id");
  } catch {
    return "(unknown)";
  }
}

/**
 * pg / Node error codes meaning "the database cannot be reached right now": refused or broken
 * connections, and the PostgreSQL SQLSTATE classes 08 (connection exception) and 57P (operator
 * intervention: shutdown, cannot connect now), and 53300 (too many connections).
 */
const UNAVAILABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "ENOTFOUND",
  "EAI_AGAIN",
  "EHOSTUNREACH",
  "57P01",
  "57P02",
  "57P03",
  "53300",
]);
const UNAVAILABLE_MESSAGES =
  /Connection terminated|connection timeout|timeout exceeded when trying to connect|Client has encountered a connection error|Connection refused/i;

/** Whether an error (or one of its causes, as Drizzle wraps pg's) says the database is unreachable. */
export function isDatabaseUnavailable(err: unknown): boolean {
  for (let e: unknown = err, depth = 0; e && depth < 8; depth++) {
    if (typeof e !== "object") return false;
    const code = (e as { code?: unknown }).code;
    if (typeof code === "string" && (UNAVAILABLE_CODES.has(code) || code.startsWith("08"))) return true;
    if (e instanceof AggregateError && e.errors.some((inner) => isDatabaseUnavailable(inner))) return true;
    const message = (e as { message?: unknown }).message;
    if (typeof message === "string" && UNAVAILABLE_MESSAGES.test(message)) return true;
    e = (e as { cause?: unknown }).cause;
  }
  return false;
}

export function errorResponse(err: unknown): Response {
  const requestId = requestContext()?.requestId;
  const withId = (e: AppError) => {
    const body = errorBody(e);
    if (requestId) body.error.requestId = requestId;
    return body;
  };
  if (err instanceof AppError) {
    const headers: Record<string, string> = { "Cache-Control": "no-store" };
    if (err.status === 401) headers["WWW-Authenticate"] = 'Bearer realm="jointproof"'; // RFC 6750 §3
    const retryAfterS = err.details?.retryAfterS;
    if (typeof retryAfterS === "number" && (err.status === 429 || err.status === 503))
      headers["Retry-After"] = String(Math.max(1, Math.ceil(retryAfterS)));
    return NextResponse.json(withId(err), { status: err.status, headers });
  }
  if (isDatabaseUnavailable(err)) {
    logger.warn(
      { requestId, err: { message: err instanceof Error ? err.message : String(err) } },
      "database unreachable",
    );
    const unavailable = new AppError(
      "unavailable:database",
      `The database cannot be reached right now, so this request may not have been completed. Try again in ${DATABASE_RETRY_AFTER_S} seconds; if you were saving, reload first to see whether the save arrived.`,
      {
        details: { retryAfterS: DATABASE_RETRY_AFTER_S },
      },
    );
    return NextResponse.json(withId(unavailable), {
      status: 503,
      headers: { "Cache-Control": "no-store", "Retry-After": String(DATABASE_RETRY_AFTER_S) },
    });
  }
  // Database and unexpected errors are logged once with their cause and never shown.
  logger.error({ requestId, err }, "unexpected error");
  return NextResponse.json(withId(new AppError("internal")), { status: 500, headers: { "Cache-Control": "no-store" } });
}

export function json(data: unknown, status = 200, headers?: Record<string, string>): Response {
  return NextResponse.json(data, { status, headers: { "Cache-Control": "no-store", ...headers } });
}

/** Route params (`[projectId]` …), validated; a malformed id is a 404, since no such resource can exist. */
export async function readParams<S extends z.ZodType>(context: RouteContext, schema: S): Promise<z.infer<S>> {
  const result = schema.safeParse(await context.params);
  if (!result.success) throw new AppError("not_found", undefined, { issues: toIssues(result.error, ["params"]) });
  return result.data;
}

/** The query string as an object (repeated keys keep their last value), validated. */
export function readQuery<S extends z.ZodType>(request: Request, schema: S): z.infer<S> {
  const params = Object.fromEntries(new URL(request.url).searchParams.entries());
  assertCleanText(params, ["query"]);
  return parseOrThrow(schema, params, ["query"], "query string");
}

/** Largest JSON body accepted, in bytes (API_BODY_LIMIT_BYTES, default 1 MiB). */
export function jsonBodyLimit(): number {
  return env().API_BODY_LIMIT_BYTES;
}

/**
 * Refuses (413) a body whose declared length (Content-Length) passes `limitBytes`, before any of it
 * is read. Call it in the parse step, before authentication, so a too-large upload is never read.
 */
export function assertDeclaredLength(request: Request, limitBytes: number): void {
  const declared = request.headers.get("content-length");
  if (declared !== null && Number(declared) > limitBytes) throw tooLarge(limitBytes);
}

/**
 * Reads a request body up to `limitBytes`, refusing it (413) as soon as the declared length or
 * the bytes read so far pass the limit — the body is never held whole when too large. A body
 * shorter than its declared length (cut on the way) is refused too: nothing downstream may see
 * part of a file as if it were all of it.
 */
export async function readBodyLimited(request: Request, limitBytes: number): Promise<Uint8Array> {
  assertDeclaredLength(request, limitBytes);
  const header = request.headers.get("content-length");
  const declared = header === null ? null : Number(header);
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  // With a declared length the bytes go straight into one buffer of that size, so the body is
  // held once (no chunk list plus a copy); without one (chunked) the buffer grows by doubling.
  let out = new Uint8Array(
    declared !== null && Number.isSafeInteger(declared) ? declared : Math.min(limitBytes, 64 * 1024),
  );
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    if (total + value.byteLength > limitBytes) {
      await reader.cancel();
      throw tooLarge(limitBytes);
    }
    if (declared !== null && total + value.byteLength > declared) {
      await reader.cancel();
      throw badLength(total + value.byteLength, declared);
    }
    if (total + value.byteLength > out.byteLength) {
      const grown = new Uint8Array(Math.min(limitBytes, Math.max(out.byteLength * 2, total + value.byteLength)));
      grown.set(out.subarray(0, total));
      out = grown;
    }
    out.set(value, total);
    total += value.byteLength;
  }
  if (declared !== null && declared !== total) throw badLength(total, declared);
  return total === out.byteLength ? out : out.subarray(0, total);
}

/**
 * A request body as a stream of its bytes, for uploads that must never be held whole: each chunk
 * goes to `onChunk` (to hash or scan it) as it passes on, and the stream fails with the errors of
 * {@link readBodyLimited} — 413 as soon as the bytes counted pass `limitBytes`, 400 as soon as
 * they pass the declared length or when they end short of it — cancelling the rest of the body.
 * A declared length over the limit throws at once, before anything is read.
 */
export function readBodyStream(request: Request, limitBytes: number, onChunk: (chunk: Uint8Array) => void): Readable {
  assertDeclaredLength(request, limitBytes);
  const header = request.headers.get("content-length");
  const declared = header === null ? null : Number(header);
  const body = request.body;
  async function* counted(): AsyncGenerator<Uint8Array> {
    if (!body) return;
    const reader = body.getReader();
    let total = 0;
    let finished = false;
    try {
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        total += value.byteLength;
        if (total > limitBytes) throw tooLarge(limitBytes);
        if (declared !== null && total > declared) throw badLength(total, declared);
        onChunk(value);
        yield value;
      }
      finished = true;
    } finally {
      // failed, or the reader of the stream stopped early: the rest of the body is not wanted
      if (!finished) await reader.cancel().catch(() => undefined);
    }
    if (declared !== null && total !== declared) throw badLength(total, declared);
  }
  return Readable.from(counted(), { objectMode: false });
}

function badLength(received: number, declared: number): AppError {
  return new AppError(
    "bad_request:incomplete_body",
    `The body had ${received} bytes where Content-Length declared ${declared}; nothing was stored.`,
    {
      issues: [{ path: "(body)", message: "does not match its Content-Length" }],
    },
  );
}

function tooLarge(limitBytes: number): AppError {
  return new AppError("payload_too_large", `The request body is larger than ${limitBytes} bytes.`, {
    details: { limitBytes },
  });
}

/** A JSON body: content type, size limit, JSON syntax, then the schema; each failure a 4xx. */
export async function readJson<S extends z.ZodType>(
  request: Request,
  schema: S,
  limitBytes = jsonBodyLimit(),
): Promise<z.infer<S>> {
  return parseJsonBytes(await readJsonBytes(request, limitBytes), schema);
}

/**
 * The bytes of a JSON body, after its content type and size checks, for a route that parses them
 * elsewhere (the check pool parses plan documents off the request thread; lib/server/check-document.ts).
 */
export async function readJsonBytes(request: Request, limitBytes = jsonBodyLimit()): Promise<Uint8Array> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^application\/([a-z0-9.+-]+\+)?json\s*(;|$)/i.test(type)) {
    throw new AppError("unsupported_media_type", "Send the body as JSON (Content-Type: application/json).");
  }
  return readBodyLimited(request, limitBytes);
}

/** Common param schemas. */
export const uuidParam = z.string().uuid({ error: "must be an id" });
/** A version number in a path or query: plain decimal digits only (`0x1`, `1e0`, ` 1` are refused). */
export const versionParam = z
  .string()
  .regex(/^[1-9][0-9]{0,6}$/, { error: "must be a version number (1, 2, …)" })
  .transform(Number)
  .pipe(z.number().int().positive().max(1_000_000));
