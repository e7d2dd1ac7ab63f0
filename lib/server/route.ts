/**
 * Route-handler glue: the wrapper that turns every error into the one error shape, and the
 * readers that validate params, query strings and bodies with zod before anything else runs.
 * Handlers read in the fixed order: parse (400/413/415) → requireActor (401) → load (404) →
 * authorise (403) → act.
 */
import { NextResponse } from "next/server";
import { z } from "zod";
import { env } from "./env";
import { AppError, errorBody, formatPath, type Issue } from "./errors";

export type RouteContext = { params: Promise<unknown> };
type Handler = (request: Request, context: RouteContext) => Promise<Response>;

/** Wraps a handler: AppError → its status and shape; anything else → logged, a generic 500. */
export function route(handler: Handler): (request: Request, context: RouteContext) => Promise<Response> {
  return async (request, context) => {
    try {
      return await handler(request, context);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

export function errorResponse(err: unknown): Response {
  if (err instanceof AppError) {
    const headers: Record<string, string> = { "Cache-Control": "no-store" };
    if (err.status === 401) headers["WWW-Authenticate"] = 'Bearer realm="jointproof"'; // RFC 6750 §3
    return NextResponse.json(errorBody(err), { status: err.status, headers });
  }
  // Database and unexpected errors are logged with their detail and never shown.
  console.error("[api] unexpected error:", err);
  return NextResponse.json(errorBody(new AppError("internal")), { status: 500 });
}

export function json(data: unknown, status = 200, headers?: Record<string, string>): Response {
  return NextResponse.json(data, { status, headers: { "Cache-Control": "no-store", ...headers } });
}

/** zod issues as `{ path, message }`, the path prefixed (e.g. `query.rateHz`, `document.start`). */
export function toIssues(error: z.ZodError, prefix: PropertyKey[] = []): Issue[] {
  return error.issues.map((i) => ({ path: formatPath([...prefix, ...i.path]), message: i.message }));
}

function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown, prefix: PropertyKey[], what: string): z.infer<S> {
  const result = schema.safeParse(value);
  if (!result.success) {
    throw new AppError("bad_request:validation", `The ${what} is not valid.`, { issues: toIssues(result.error, prefix) });
  }
  return result.data;
}

/** Route params (`[projectId]` …), validated; a malformed id is a 404, since no such resource can exist. */
export async function readParams<S extends z.ZodType>(context: RouteContext, schema: S): Promise<z.infer<S>> {
  const result = schema.safeParse(await context.params);
  if (!result.success) throw new AppError("not_found", "Not found.", { issues: toIssues(result.error, ["params"]) });
  return result.data;
}

/** The query string as an object (repeated keys keep their last value), validated. */
export function readQuery<S extends z.ZodType>(request: Request, schema: S): z.infer<S> {
  const params = Object.fromEntries(new URL(request.url).searchParams.entries());
  return parseOrThrow(schema, params, ["query"], "query string");
}

/** Largest JSON body accepted, in bytes (API_BODY_LIMIT_BYTES, default 1 MiB). */
export function jsonBodyLimit(): number {
  return env().API_BODY_LIMIT_BYTES;
}

/**
 * Reads a request body up to `limitBytes`, refusing it (413) as soon as the declared length or
 * the bytes read so far pass the limit — the body is never held whole when too large.
 */
export async function readBodyLimited(request: Request, limitBytes: number): Promise<Uint8Array> {
  const declared = request.headers.get("content-length");
  if (declared !== null && Number(declared) > limitBytes) throw tooLarge(limitBytes);
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limitBytes) {
      await reader.cancel();
      throw tooLarge(limitBytes);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let offset = 0;
  for (const c of chunks) {
    out.set(c, offset);
    offset += c.byteLength;
  }
  return out;
}

function tooLarge(limitBytes: number): AppError {
  return new AppError("payload_too_large", `The request body is larger than ${limitBytes} bytes.`, { details: { limitBytes } });
}

/** A JSON body: content type, size limit, JSON syntax, then the schema; each failure a 4xx. */
export async function readJson<S extends z.ZodType>(request: Request, schema: S, limitBytes = jsonBodyLimit()): Promise<z.infer<S>> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^application\/([a-z0-9.+-]+\+)?json\s*(;|$)/i.test(type)) {
    throw new AppError("unsupported_media_type", "Send the body as JSON (Content-Type: application/json).");
  }
  const bytes = await readBodyLimited(request, limitBytes);
  let value: unknown;
  try {
    value = JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
  } catch {
    throw new AppError("bad_request:json", "The body is not valid JSON.", { issues: [{ path: "(body)", message: "must be valid JSON" }] });
  }
  return parseOrThrow(schema, value, [], "request body");
}

/** Common param schemas. */
export const uuidParam = z.string().uuid({ error: "must be an id" });
