/**
 * E-mail address verification through the routes: signing up queues the verification e-mail;
 * the token in its link confirms the address once.
 */
import "../api/_env";
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import * as accountsRoute from "@/app/api/v1/accounts/route";
import * as verifyRoute from "@/app/api/v1/accounts/verify-email/route";
import { call, errorOf } from "../api/_helpers";
import { signIn, startAccountHarness, tokenFromLink, type AccountHarness } from "./_accounts";

let harness: AccountHarness;

beforeAll(async () => {
  harness = await startAccountHarness();
});

afterAll(async () => {
  await harness?.stop();
});

const verify = (body: unknown) =>
  call(verifyRoute.POST, { method: "POST", path: "/api/v1/accounts/verify-email", body });

async function verifiedAt(email: string): Promise<Date | null> {
  const [row] = await db.select({ at: users.emailVerifiedAt }).from(users).where(eq(users.email, email));
  return row.at;
}

describe("e-mail verification through the API", () => {
  it("sign-up sends the verification e-mail; its token confirms the address once", async () => {
    const email = `verify-${randomUUID().slice(0, 8)}@example.com`;
    const signUp = await call(accountsRoute.POST, {
      method: "POST",
      path: "/api/v1/accounts",
      body: { email, name: "Pella Ostrand", password: "a-long-password-9" },
    });
    expect(signUp.status, signUp.text).toBe(202);
    // Sign-in does not wait for the address to be confirmed.
    expect((await signIn(email, "a-long-password-9")).session).toBeDefined();
    expect(await verifiedAt(email)).toBeNull();

    const message = await harness.mail.waitFor((m) => m.to === email && m.kind === "email-verification");
    expect(message.html).toContain("/verify-email?token=");
    const token = tokenFromLink(message.text, "/verify-email");

    const res = await verify({ token });
    expect(res.status, res.text).toBe(200);
    expect(res.body).toEqual({ verified: true });
    expect(await verifiedAt(email)).toBeInstanceOf(Date);

    const again = await verify({ token });
    expect(again.status).toBe(400);
    expect(errorOf(again)).toMatchObject({
      code: "bad_request:token",
      message: "The link has expired or was already used.",
    });
  });

  it("refuses a reset token as a verification token (each token has one purpose)", async () => {
    const email = `verify-purpose-${randomUUID().slice(0, 8)}@example.com`;
    expect(
      (
        await call(accountsRoute.POST, {
          method: "POST",
          path: "/api/v1/accounts",
          body: { email, name: "Oren Vale", password: "a-long-password-9" },
        })
      ).status,
    ).toBe(202);
    const { POST: requestReset } = await import("@/app/api/v1/accounts/password-reset/route");
    expect(
      (await call(requestReset, { method: "POST", path: "/api/v1/accounts/password-reset", body: { email } })).status,
    ).toBe(202);
    const reset = await harness.mail.waitFor((m) => m.to === email && m.kind === "password-reset");
    const res = await verify({ token: tokenFromLink(reset.text, "/reset-password") });
    expect(res.status).toBe(400);
    expect(errorOf(res).code).toBe("bad_request:token");
    expect(await verifiedAt(email)).toBeNull();
  });

  it("names the token field when it is missing or malformed", async () => {
    for (const body of [{}, { token: "" }, { token: "has spaces in it" }, { token: 42 }]) {
      const res = await verify(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(errorOf(res).issues.map((i) => i.path)).toContain("token");
    }
  });
});
