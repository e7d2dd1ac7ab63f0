/**
 * Shared set-up for the account tests: the real SMTP fake and mail worker (tests/integration/courses/_mail.ts),
 * sign-in through next-auth's own request handler with our options, and reading the one-time
 * token out of the link an e-mail carries.
 */
import "../api/_env";
// next-auth's core handler is not in its package exports; import the installed file itself (the same code the route runs).
import { AuthHandler } from "../../../node_modules/next-auth/core/index.js";
import { authOptions, sessionCookieName } from "@/lib/server/auth";
import { BASE } from "../api/_helpers";
import { startMailWithWorker, type MailWithWorker } from "../courses/_mail";

process.env.NEXTAUTH_URL ??= BASE;

type Cookie = { name: string; value: string };

/** The real SMTP fake and pg-boss worker, as the course tests start them. */
export type AccountHarness = MailWithWorker;
export const startAccountHarness = startMailWithWorker;

/** Signs in through next-auth (CSRF token, credentials callback); the session cookie, or undefined when refused. */
export async function signIn(
  email: string,
  password: string,
): Promise<{ session: Cookie | undefined; redirect: string }> {
  const host = new URL(BASE).host;
  const csrf = await AuthHandler({
    req: { action: "csrf", method: "GET", origin: BASE, cookies: {}, headers: { host } },
    options: authOptions(),
  });
  const csrfToken = (csrf.body as { csrfToken: string }).csrfToken;
  const cookies = Object.fromEntries(((csrf.cookies ?? []) as Cookie[]).map((c) => [c.name, c.value]));
  const res = await AuthHandler({
    req: {
      action: "callback",
      providerId: "credentials",
      method: "POST",
      origin: BASE,
      cookies,
      // Its own documentation address (RFC 5737), apart from the sign-in tests' one, so the per-address limit is ours alone.
      headers: { host, "x-forwarded-for": "192.0.2.77" },
      body: { csrfToken, email, password, json: "true" },
    },
    options: authOptions(),
  });
  const session = ((res.cookies ?? []) as Cookie[]).find((c) => c.name === sessionCookieName());
  return { session, redirect: decodeURIComponent(res.redirect ?? "") };
}

/** Asks next-auth's session endpoint with a session cookie, as a browser tab does; the cookie it sends back. */
export async function refreshSession(session: Cookie): Promise<Cookie | undefined> {
  const host = new URL(BASE).host;
  const res = await AuthHandler({
    req: {
      action: "session",
      method: "GET",
      origin: BASE,
      cookies: { [session.name]: session.value },
      headers: { host },
    },
    options: authOptions(),
  });
  return ((res.cookies ?? []) as Cookie[]).find((c) => c.name === sessionCookieName() && c.value !== "");
}

/** The `token` query parameter of the first link to `path` in an e-mail's text part. */
export function tokenFromLink(text: string, path: string): string {
  for (const match of text.matchAll(/https?:\/\/\S+/g)) {
    const url = new URL(match[0]);
    if (url.pathname === path) {
      const token = url.searchParams.get("token");
      if (token) return token;
    }
  }
  throw new Error(`no ${path}?token=… link in: ${text}`);
}
