/**
 * Helpers for the security probes: plain HTTP against the real server (no handler calls), plus
 * the integration helpers that make real users and tokens in the same database the server uses.
 */
import "./_env";
import { count } from "drizzle-orm";
import type { PgTable } from "drizzle-orm/pg-core";
import { db } from "@/db";

export { makeUser, sessionCookieFor, tokenFor, demoArm, gentlePlan, type TestUser } from "../integration/api/_helpers";

export const BASE = process.env.APP_URL!;

export type Auth = { bearer: string } | { cookie: string } | null;
export type Answer = { status: number; text: string; body: unknown; headers: Headers; ms: number };

/** One request to the running server; a cookie session sends this site's Origin on writes, as a browser does. */
export async function http(
  path: string,
  options: {
    method?: string;
    auth?: Auth;
    json?: unknown;
    body?: BodyInit;
    headers?: Record<string, string>;
    duplex?: "half";
  } = {},
): Promise<Answer> {
  const method = options.method ?? (options.json !== undefined || options.body !== undefined ? "POST" : "GET");
  const headers = new Headers(options.headers);
  if (options.auth && "bearer" in options.auth) headers.set("authorization", `Bearer ${options.auth.bearer}`);
  if (options.auth && "cookie" in options.auth) {
    headers.set("cookie", options.auth.cookie);
    if (!headers.has("origin") && method !== "GET") headers.set("origin", BASE);
  }
  let body = options.body;
  if (options.json !== undefined) {
    body = JSON.stringify(options.json);
    if (!headers.has("content-type")) headers.set("content-type", "application/json");
  }
  const started = performance.now();
  const res = await fetch(`${BASE}${path}`, {
    method,
    headers,
    body,
    redirect: "manual",
    ...(options.duplex ? { duplex: options.duplex } : {}),
  } as RequestInit);
  const text = await res.text();
  const ms = performance.now() - started;
  let parsed: unknown = text;
  try {
    parsed = JSON.parse(text);
  } catch {
    // not JSON
  }
  return { status: res.status, text, body: parsed, headers: res.headers, ms };
}

/** Signs in through the real next-auth endpoints (CSRF cookie, credentials callback); the cookie header for the session, or null. */
export async function signInOverHttp(
  email: string,
  password: string,
  headers: Record<string, string> = {},
): Promise<{ cookie: string | null; location: string }> {
  const csrf = await fetch(`${BASE}/api/auth/csrf`, { headers });
  const csrfCookies = csrf.headers.getSetCookie().map((c) => c.split(";")[0]);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${BASE}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: {
      ...headers,
      "content-type": "application/x-www-form-urlencoded",
      cookie: csrfCookies.join("; "),
      origin: BASE,
    },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${BASE}/projects` }),
  });
  const session = res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .find((c) => /^(__Secure-)?jp\.session=./.test(c));
  return {
    cookie: session ? [...csrfCookies, session].join("; ") : null,
    location: decodeURIComponent(res.headers.get("location") ?? ""),
  };
}

/** Signs out through next-auth's own endpoint with the session's cookies. */
export async function signOutOverHttp(cookie: string): Promise<number> {
  const csrf = await fetch(`${BASE}/api/auth/csrf`, { headers: { cookie } });
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${BASE}/api/auth/signout`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie, origin: BASE },
    body: new URLSearchParams({ csrfToken, callbackUrl: BASE }),
  });
  return res.status;
}

/** Row count of a table, for "nothing was stored" checks. */
export async function rows(table: PgTable): Promise<number> {
  const [r] = await db.select({ n: count() }).from(table);
  return r.n;
}
