/**
 * Helpers for the API integration tests: real users, tokens and sessions in the real test
 * database, and calls to the exported route-handler functions with a real Request.
 */
import "./_env";
import { randomUUID } from "node:crypto";
import bcrypt from "bcryptjs";
import { encode } from "next-auth/jwt";
import { createApiToken } from "@/db/queries/tokens";
import { createUser } from "@/db/queries/users";
import type { SiteRole } from "@/db/schema";
import { sessionCookieName } from "@/lib/server/auth";
import { env } from "@/lib/server/env";
import { generateToken } from "@/lib/server/tokens";
import { demoArms } from "@/db/demo";

export const BASE = env().APP_URL.replace(/\/$/, "");

export type TestUser = { id: string; email: string; password: string; siteRole: SiteRole };

/** A fresh user with a unique e-mail (cheap bcrypt cost: these are test accounts). */
export async function makeUser(siteRole: SiteRole, label: string = siteRole): Promise<TestUser> {
  const email = `${label}-${randomUUID().slice(0, 8)}@example.com`;
  const password = "test-password-123";
  const user = await createUser({
    email,
    name: `Test ${label}`,
    siteRole,
    passwordHash: await bcrypt.hash(password, 4),
  });
  if (!user) throw new Error("test user not created");
  return { id: user.id, email, password, siteRole };
}

export async function tokenFor(userId: string): Promise<string> {
  const { token, hash, prefix } = generateToken();
  await createApiToken({ userId, name: "test token", tokenHash: hash, prefix, expiresAt: null });
  return token;
}

/** A next-auth session cookie for the user, made the way next-auth makes it. */
export async function sessionCookieFor(userId: string): Promise<string> {
  // `sid` names the session, as lib/server/auth.ts sets it at sign-in; a cookie without one is refused.
  const jwt = await encode({ token: { sub: userId, sid: randomUUID() }, secret: env().NEXTAUTH_SECRET! });
  return `${sessionCookieName()}=${jwt}`;
}

export type Auth = { bearer: string } | { cookie: string } | null;

type Handler = (request: Request, context: { params: Promise<unknown> }) => Promise<Response>;

export type CallOptions = {
  method?: string;
  path: string;
  params?: Record<string, string>;
  auth?: Auth;
  body?: unknown;
  rawBody?: string | Uint8Array;
  headers?: Record<string, string>;
};

export type CallResult = { status: number; body: unknown; text: string; headers: Headers };

/** Calls a route handler as Next would: a Request with the URL, headers and body, and the params promise. */
export async function call(handler: Handler, options: CallOptions): Promise<CallResult> {
  const method = options.method ?? "GET";
  const headers = new Headers(options.headers);
  if (options.auth && "bearer" in options.auth) headers.set("authorization", `Bearer ${options.auth.bearer}`);
  if (options.auth && "cookie" in options.auth) {
    headers.set("cookie", options.auth.cookie);
    if (!headers.has("origin") && method !== "GET") headers.set("origin", BASE);
  }
  let body: BodyInit | undefined;
  if (options.rawBody !== undefined) body = options.rawBody as BodyInit;
  else if (options.body !== undefined) {
    body = JSON.stringify(options.body);
    if (!headers.has("content-type")) headers.set("content-type", "application/json");
  }
  const request = new Request(`${BASE}${options.path}`, { method, headers, body });
  const response = await handler(request, { params: Promise.resolve(options.params ?? {}) });
  const text = await response.text();
  let parsed: unknown = text;
  try {
    parsed = JSON.parse(text);
  } catch {
    // not JSON (a CSV export)
  }
  return { status: response.status, body: parsed, text, headers: response.headers };
}

/** The built-in light demo arm's id and its `arm` object (revision 1 as seeded). */
export const demoArm = demoArms[0];

/** A passing plan document for the light demo arm: a gentle 2-second pose change. */
export function gentlePlan(): Record<string, unknown> {
  const n = demoArm.description.joints.length;
  return {
    format: "jointproof.plan",
    version: 1,
    arm: demoArm.description,
    start: new Array(n).fill(0),
    moves: [{ goal: [0.3, -0.2, 0.4, 0.1, 0, 0.2, 0.01], duration: 2, shape: "quintic" }],
  };
}

/** An instant move across a large angle: a jump fault. */
export function jumpPlan(): Record<string, unknown> {
  const plan = gentlePlan();
  plan.moves = [{ goal: [1.2, 0, 0, 0, 0, 0, 0], duration: 0 }];
  return plan;
}

export type ErrorShape = { error: { code: string; message: string; issues: { path: string; message: string }[] } };
export function errorOf(result: CallResult): ErrorShape["error"] {
  return (result.body as ErrorShape).error;
}
