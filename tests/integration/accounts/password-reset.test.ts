/**
 * Password reset through the routes, the real outbox, worker and SMTP fake: the link in the
 * e-mail carries a one-time token; confirming with it changes the password that next-auth's
 * sign-in accepts; the token works once; an unknown address is answered exactly like a known one.
 */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { accountTokens, auditLog } from "@/db/schema";
import * as resetRoute from "@/app/api/v1/accounts/password-reset/route";
import * as confirmRoute from "@/app/api/v1/accounts/password-reset/confirm/route";
import * as meRoute from "@/app/api/v1/me/route";
import { RESET_REQUEST_LIMIT } from "@/lib/server/mail/account-mail";
import { call, errorOf, makeUser, tokenFor } from "../api/_helpers";
import { refreshSession, signIn, startAccountHarness, tokenFromLink, type AccountHarness } from "./_accounts";

let harness: AccountHarness;

beforeAll(async () => {
  harness = await startAccountHarness();
});

afterAll(async () => {
  await harness?.stop();
});

const requestReset = (email: string, headers?: Record<string, string>) =>
  call(resetRoute.POST, { method: "POST", path: "/api/v1/accounts/password-reset", body: { email }, headers });
const me = (auth: { cookie: string } | { bearer: string }) => call(meRoute.GET, { path: "/api/v1/me", auth });
const cookieOf = (session: { name: string; value: string } | undefined) => {
  if (!session) throw new Error("sign-in gave no session cookie");
  return { cookie: `${session.name}=${session.value}` };
};
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const confirm = (body: unknown) =>
  call(confirmRoute.POST, { method: "POST", path: "/api/v1/accounts/password-reset/confirm", body });

/** The token of the reset e-mail number `nth` (0 = the first) sent to this address, waiting for it to arrive. */
async function resetEmailFor(email: string, nth = 0): Promise<string> {
  const isReset = (m: { to: string; kind: string | null }) => m.to === email && m.kind === "password-reset";
  for (const until = Date.now() + 25_000; ; await new Promise((r) => setTimeout(r, 200))) {
    const resets = (await harness.mail.messages())
      .filter(isReset)
      .sort((a, b) => a.receivedAt.localeCompare(b.receivedAt));
    const message = resets[nth];
    if (message) {
      expect(message.html).toContain("/reset-password?token=");
      return tokenFromLink(message.text, "/reset-password");
    }
    if (Date.now() > until) throw new Error(`reset e-mail ${nth + 1} to ${email} did not arrive`);
  }
}

describe("password reset through the API", () => {
  it("e-mails a link whose token sets a new password once: sign-in takes the new one and refuses the old", async () => {
    const user = await makeUser("student", "reset-flow");
    // Addresses are matched as the sign-in form sends them: trimmed and lower-cased.
    const requested = await requestReset(`  ${user.email.toUpperCase()} `);
    expect(requested.status).toBe(202);
    const token = await resetEmailFor(user.email);

    const tooShort = await confirm({ token, password: "short" });
    expect(tooShort.status).toBe(400);
    expect(errorOf(tooShort).issues.map((i) => i.path)).toContain("password");

    const done = await confirm({ token, password: "a-brand-new-password-7" });
    expect(done.status, done.text).toBe(200);

    expect((await signIn(user.email, "a-brand-new-password-7")).session).toBeDefined();
    const old = await signIn(user.email, user.password);
    expect(old.session).toBeUndefined();
    expect(old.redirect).toContain("E-mail or password is wrong.");

    const again = await confirm({ token, password: "yet-another-password-8" });
    expect(again.status).toBe(400);
    expect(errorOf(again)).toMatchObject({
      code: "bad_request:token",
      message: "The link has expired or was already used.",
    });
    expect((await signIn(user.email, "yet-another-password-8")).session).toBeUndefined();
  });

  it("answers an unknown address exactly like a known one, and sends nothing", async () => {
    const known = await makeUser("student", "reset-known");
    const before = (await harness.mail.messages()).length;
    const forUnknown = await requestReset("nobody-at-all@example.com");
    const forKnown = await requestReset(known.email);
    expect({ status: forUnknown.status, body: forUnknown.body }).toEqual({
      status: forKnown.status,
      body: forKnown.body,
    });
    expect(forUnknown.status).toBe(202);
    await resetEmailFor(known.email);
    await new Promise((r) => setTimeout(r, 1_500));
    const after = await harness.mail.messages();
    expect(after.length).toBe(before + 1);
    expect(after.some((m) => m.to === "nobody-at-all@example.com")).toBe(false);
  });

  it("voids the other reset links of the account once one is used", async () => {
    const user = await makeUser("researcher", "reset-two");
    expect((await requestReset(user.email)).status).toBe(202);
    const first = await resetEmailFor(user.email);
    expect((await requestReset(user.email)).status).toBe(202);
    const second = await resetEmailFor(user.email, 1);
    expect(second).not.toBe(first);
    expect((await confirm({ token: second, password: "second-link-password-1" })).status).toBe(200);
    const stale = await confirm({ token: first, password: "first-link-password-2" });
    expect(stale.status).toBe(400);
    expect(errorOf(stale).code).toBe("bad_request:token");
    expect((await signIn(user.email, "second-link-password-1")).session).toBeDefined();
  });

  it("refuses an expired link with the same message and leaves the password as it was", async () => {
    const user = await makeUser("student", "reset-expired");
    expect((await requestReset(user.email)).status).toBe(202);
    const token = await resetEmailFor(user.email);
    await db
      .update(accountTokens)
      .set({ expiresAt: new Date(Date.now() - 60_000) })
      .where(eq(accountTokens.userId, user.id));
    const res = await confirm({ token, password: "too-late-password-3" });
    expect(res.status).toBe(400);
    expect(errorOf(res).message).toBe("The link has expired or was already used.");
    expect((await signIn(user.email, user.password)).session).toBeDefined();
  });

  it("names the field for a missing or malformed token and a bad address", async () => {
    const cases: { body: unknown; path: string }[] = [
      { body: { password: "long-enough-pass-1" }, path: "token" },
      { body: { token: "not a token!", password: "long-enough-pass-1" }, path: "token" },
      { body: { token: "x".repeat(201), password: "long-enough-pass-1" }, path: "token" },
      { body: { token: "abc", password: "long-enough-pass-1", extra: 1 }, path: "extra" },
    ];
    for (const c of cases) {
      const res = await confirm(c.body);
      expect(res.status, JSON.stringify(c.body)).toBe(400);
      expect(errorOf(res).issues.map((i) => i.path)).toContain(c.path);
    }
    const unknownToken = await confirm({ token: "A".repeat(43), password: "long-enough-pass-1" });
    expect(unknownToken.status).toBe(400);
    expect(errorOf(unknownToken).code).toBe("bad_request:token");
    const badEmail = await requestReset("not-an-address");
    expect(badEmail.status).toBe(400);
    expect(errorOf(badEmail).issues.map((i) => i.path)).toContain("email");
  });

  it("refuses a reset request posted from another site", async () => {
    const res = await requestReset("someone@example.com", { origin: "https://elsewhere.example.com" });
    expect(res.status).toBe(403);
    expect(errorOf(res).code).toBe("forbidden:origin");
  });
});

describe("password reset hardening", () => {
  it("ends sessions signed in before the reset (401) while a sign-in after it works, and leaves API tokens alone", async () => {
    const user = await makeUser("student", "reset-sessions");
    const before = cookieOf((await signIn(user.email, user.password)).session);
    const bearer = { bearer: await tokenFor(user.id) };
    expect((await me(before)).status).toBe(200);
    // `iat` has whole seconds: let the old session's second pass, so it is strictly before the change.
    await sleep(1_100);

    expect((await requestReset(user.email)).status).toBe(202);
    const token = await resetEmailFor(user.email);
    expect((await confirm({ token, password: "sessions-end-password-9" })).status).toBe(200);

    const stale = await me(before);
    expect(stale.status).toBe(401);
    expect(errorOf(stale).code).toBe("unauthorized");
    // Signed in within the same second as the reset, most likely: must still count as after it.
    const after = cookieOf((await signIn(user.email, "sessions-end-password-9")).session);
    const fresh = await me(after);
    expect(fresh.status).toBe(200);
    expect((fresh.body as { user: { id: string } }).user.id).toBe(user.id);
    expect((await me(bearer)).status).toBe(200);
  });

  it("does not let a session from before the reset back in through next-auth's session refresh", async () => {
    const user = await makeUser("student", "reset-refresh");
    const signedIn = (await signIn(user.email, user.password)).session;
    if (!signedIn) throw new Error("sign-in gave no session cookie");
    // A refresh before the reset works and keeps the session usable (the refresh path itself is sound).
    const refreshedEarly = await refreshSession(signedIn);
    expect(refreshedEarly).toBeDefined();
    expect((await me(cookieOf(refreshedEarly))).status).toBe(200);
    await sleep(1_100);

    expect((await requestReset(user.email)).status).toBe(202);
    const token = await resetEmailFor(user.email);
    expect((await confirm({ token, password: "refresh-ends-password-12" })).status).toBe(200);

    // next-auth re-issues the old cookie with a fresh `iat`; the sign-in time inside it is still old.
    const reissued = await refreshSession(signedIn);
    expect(reissued).toBeDefined();
    expect((await me(cookieOf(reissued))).status).toBe(401);
    expect((await me(cookieOf(signedIn))).status).toBe(401);
  });

  it("writes one audit entry for a completed reset, and none for a refused token", async () => {
    const user = await makeUser("student", "reset-audit");
    expect((await requestReset(user.email)).status).toBe(202);
    const token = await resetEmailFor(user.email);
    const entries = () =>
      db
        .select({ actorId: auditLog.actorId, targetType: auditLog.targetType })
        .from(auditLog)
        .where(and(eq(auditLog.action, "account.password_reset"), eq(auditLog.targetId, user.id)));
    expect(await entries()).toEqual([]);
    expect((await confirm({ token, password: "audited-password-10" })).status).toBe(200);
    expect((await confirm({ token, password: "audited-password-11" })).status).toBe(400);
    expect(await entries()).toEqual([{ actorId: user.id, targetType: "user" }]);
  });

  it(`sends at most ${RESET_REQUEST_LIMIT.perEmail} reset e-mails per address in the window, answering 202 with the same body all the same`, async () => {
    const user = await makeUser("student", "reset-limit");
    const answers = [];
    for (let i = 0; i <= RESET_REQUEST_LIMIT.perEmail; i++) answers.push(await requestReset(user.email));
    for (const a of answers)
      expect({ status: a.status, body: a.body }).toEqual({ status: 202, body: { accepted: true } });
    await resetEmailFor(user.email, RESET_REQUEST_LIMIT.perEmail - 1);
    await sleep(1_500);
    const sent = async () =>
      (await harness.mail.messages()).filter((m) => m.to === user.email && m.kind === "password-reset").length;
    expect(await sent()).toBe(RESET_REQUEST_LIMIT.perEmail);

    // The window slides: once the earlier requests are older than it, the address may ask again.
    const old = new Date(Date.now() - (RESET_REQUEST_LIMIT.windowMinutes + 1) * 60_000);
    await db.update(accountTokens).set({ createdAt: old }).where(eq(accountTokens.userId, user.id));
    expect((await requestReset(user.email)).status).toBe(202);
    await resetEmailFor(user.email, RESET_REQUEST_LIMIT.perEmail);
    expect(await sent()).toBe(RESET_REQUEST_LIMIT.perEmail + 1);
  });
});
