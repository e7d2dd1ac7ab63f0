/** Sessions end on sign-out, tokens cannot manage tokens, sign-up does not reveal accounts (issue items 7 and 8). */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
// next-auth's core handler is not in its package exports; import the installed file itself (the same code the route runs).
import { AuthHandler } from "../../../node_modules/next-auth/core/index.js";
import { db } from "@/db";
import { mailOutbox, users } from "@/db/schema";
import * as accounts from "@/app/api/v1/accounts/route";
import * as me from "@/app/api/v1/me/route";
import * as tokens from "@/app/api/v1/tokens/route";
import * as token from "@/app/api/v1/tokens/[tokenId]/route";
import { authOptions } from "@/lib/server/auth";
import { BASE, call, errorOf, makeUser, sessionCookieFor, tokenFor } from "../api/_helpers";
import { signIn, startAccountHarness, type AccountHarness } from "../accounts/_accounts";

let harness: AccountHarness;
beforeAll(async () => {
  harness = await startAccountHarness();
});
afterAll(async () => {
  await harness?.stop();
});

type Cookie = { name: string; value: string };

async function signOut(session: Cookie): Promise<void> {
  const host = new URL(BASE).host;
  const csrf = await AuthHandler({
    req: { action: "csrf", method: "GET", origin: BASE, cookies: {}, headers: { host } },
    options: authOptions(),
  });
  const csrfToken = (csrf.body as { csrfToken: string }).csrfToken;
  const cookies = Object.fromEntries(((csrf.cookies ?? []) as Cookie[]).map((c) => [c.name, c.value]));
  await AuthHandler({
    req: {
      action: "signout",
      method: "POST",
      origin: BASE,
      cookies: { ...cookies, [session.name]: session.value },
      headers: { host },
      body: { csrfToken },
    },
    options: authOptions(),
  });
}

describe("sign-out", () => {
  it("ends the session on the server: a copied cookie is refused afterwards, another browser's session is not", async () => {
    const u = await makeUser("student");
    const a = await signIn(u.email, u.password);
    const b = await signIn(u.email, u.password);
    expect(a.session && b.session).toBeTruthy();
    const cookieA = `${a.session!.name}=${a.session!.value}`;
    const cookieB = `${b.session!.name}=${b.session!.value}`;
    expect((await call(me.GET, { path: "/api/v1/me", auth: { cookie: cookieA } })).status).toBe(200);
    await signOut(a.session!);
    expect((await call(me.GET, { path: "/api/v1/me", auth: { cookie: cookieA } })).status).toBe(401);
    expect((await call(me.GET, { path: "/api/v1/me", auth: { cookie: cookieB } })).status).toBe(200);
  });
});

describe("API tokens cannot manage tokens", () => {
  it("refuses creating, listing and revoking tokens with a token (403), and the parent token survives", async () => {
    const u = await makeUser("researcher");
    const parent = await tokenFor(u.id);
    const created = await call(tokens.POST, {
      method: "POST",
      path: "/api/v1/tokens",
      auth: { bearer: parent },
      body: { name: "child" },
    });
    expect(created.status).toBe(403);
    expect(errorOf(created).code).toBe("forbidden:token");
    expect((await call(tokens.GET, { path: "/api/v1/tokens", auth: { bearer: parent } })).status).toBe(403);
    const list = await call(tokens.GET, { path: "/api/v1/tokens", auth: { cookie: await sessionCookieFor(u.id) } });
    const rows = (list.body as { tokens: { id: string; name: string }[] }).tokens;
    expect(rows.map((r) => r.name)).toEqual(["test token"]);
    const revoke = await call(token.DELETE, {
      method: "DELETE",
      path: `/api/v1/tokens/${rows[0].id}`,
      params: { tokenId: rows[0].id },
      auth: { bearer: parent },
    });
    expect(revoke.status).toBe(403);
    expect((await call(me.GET, { path: "/api/v1/me", auth: { bearer: parent } })).status).toBe(200);
  });
});

describe("sign-up", () => {
  const signUp = (body: unknown, headers?: Record<string, string>) =>
    call(accounts.POST, { method: "POST", path: "/api/v1/accounts", body, headers });

  it("answers an existing address exactly as a new one (202, same body) and e-mails the existing owner instead", async () => {
    const existing = await makeUser("student");
    const fresh = `fresh-${Date.now()}@example.com`;
    const a = await signUp({ email: existing.email, name: "Someone Else", password: "another-long-password" });
    const b = await signUp({ email: fresh, name: "New Person", password: "another-long-password" });
    expect(a.status).toBe(202);
    expect(b.status).toBe(202);
    expect(a.body).toEqual(b.body);
    // The existing account is untouched; the new one exists.
    const [owner] = await db.select().from(users).where(eq(users.email, existing.email));
    expect(owner.name).toBe("Test student");
    expect((await db.select().from(users).where(eq(users.email, fresh))).length).toBe(1);
    const note = await harness.mail.waitFor((m) => m.to === existing.email && m.kind === "sign-up-existing");
    expect(note.text).toContain("already has one");
    expect((await db.select().from(mailOutbox).where(eq(mailOutbox.toAddress, existing.email))).length).toBe(1);
  });

  it("refuses unknown fields (400 naming the field)", async () => {
    const res = await signUp({
      email: `x-${Date.now()}@example.com`,
      name: "X",
      password: "long-enough-pass",
      isAdmin: true,
    });
    expect(res.status).toBe(400);
    expect(errorOf(res).issues.map((i) => i.path)).toContain("isAdmin");
  });

  it("refuses a 10,000-deep nested body with 400 before parsing it", async () => {
    const deep = "[".repeat(10_000) + "]".repeat(10_000);
    const res = await call(accounts.POST, {
      method: "POST",
      path: "/api/v1/accounts",
      rawBody: `{"email":"d@example.com","name":"D","password":"long-enough-pass","x":${deep}}`,
      headers: { "content-type": "application/json" },
    });
    expect(res.status).toBe(400);
    expect(errorOf(res).message).toContain("nested more than");
  });

  it("creates at most 3 accounts' worth of work per address in 15 minutes (the same 202 after that)", async () => {
    const email = `limit-${Date.now()}@example.com`;
    for (let i = 0; i < 5; i++)
      expect((await signUp({ email, name: "Limit", password: "long-enough-pass" })).status).toBe(202);
    const [user] = await db.select().from(users).where(eq(users.email, email));
    expect(user).toBeDefined();
    // one verification e-mail for the new account, one note for the 2nd and 3rd attempts (deduplicated per window), none beyond
    const sent = await db.select().from(mailOutbox).where(eq(mailOutbox.toAddress, email));
    expect(sent.map((m) => m.kind).sort()).toEqual(["email-verification", "sign-up-existing"]);
  });

  it("limits sign-ups per client address: the 11th in 15 minutes is a 429 with Retry-After", async () => {
    const peer = { "x-jp-peer-address": `198.51.100.${1 + Math.floor(Math.random() * 254)}` };
    for (let i = 0; i < 10; i++)
      expect(
        (await signUp({ email: `peer-${i}-${Date.now()}@example.com`, name: "P", password: "long-enough-pass" }, peer))
          .status,
      ).toBe(202);
    const res = await signUp(
      { email: `peer-last-${Date.now()}@example.com`, name: "P", password: "long-enough-pass" },
      peer,
    );
    expect(res.status).toBe(429);
    expect(Number(res.headers.get("retry-after"))).toBeGreaterThan(0);
  });
});
