/**
 * The sign-in flow through next-auth's own request handler (its core, which the App Router route
 * wraps) with our options: CSRF token, credentials callback, the session cookie it sets, and that
 * our request authentication accepts that cookie.
 */
import "./_env";
import { describe, expect, it } from "vitest";
// next-auth's core handler is not in its package exports; import the installed file itself (the same code the route runs).
import { AuthHandler } from "../../../node_modules/next-auth/core/index.js";
import * as me from "@/app/api/v1/me/route";
import { authOptions, sessionCookieName, SIGN_IN_BACKOFF } from "@/lib/server/auth";
import { BASE, call, makeUser } from "./_helpers";

type Cookie = { name: string; value: string; options: { httpOnly?: boolean; sameSite?: string; secure?: boolean } };

process.env.NEXTAUTH_URL ??= BASE;

async function signIn(email: string, password: string) {
  const csrf = await AuthHandler({
    req: { action: "csrf", method: "GET", origin: BASE, cookies: {}, headers: { host: new URL(BASE).host } },
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
      headers: { host: new URL(BASE).host, "x-forwarded-for": "192.0.2.10" },
      body: { csrfToken, email, password, json: "true" },
    },
    options: authOptions(),
  });
  const session = ((res.cookies ?? []) as Cookie[]).find((c) => c.name === sessionCookieName());
  return { res, session };
}

describe("sign-in through next-auth", () => {
  it("sets an http-only, same-site=lax session cookie that the API accepts", async () => {
    const u = await makeUser("student");
    const { session } = await signIn(u.email, u.password);
    expect(session).toBeDefined();
    expect(session!.options).toMatchObject({ httpOnly: true, sameSite: "lax" });
    // Loopback http in tests: not `secure`, and no __Secure- prefix (which would need https).
    expect(session!.options.secure).toBe(false);
    const who = await call(me.GET, { path: "/api/v1/me", auth: { cookie: `${session!.name}=${session!.value}` } });
    expect(who.body).toMatchObject({ user: { id: u.id }, via: "session" });
  });

  it("sets no session for a wrong password and passes our message back in the redirect", async () => {
    const u = await makeUser("student");
    const { res, session } = await signIn(u.email, "not-the-password");
    expect(session).toBeUndefined();
    expect(decodeURIComponent(res.redirect ?? "")).toContain("E-mail or password is wrong.");
  });

  it("tells a backed-off user how many seconds to wait, even with the right password", async () => {
    const u = await makeUser("student");
    for (let i = 0; i < SIGN_IN_BACKOFF.freePerEmail + 1; i++) await signIn(u.email, `wrong-${i}`);
    const { res, session } = await signIn(u.email, u.password);
    expect(session).toBeUndefined();
    expect(decodeURIComponent(res.redirect ?? "").replace(/\+/g, " ")).toMatch(/Try again in [12] seconds?\./);
  });
});
