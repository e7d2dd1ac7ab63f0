/**
 * Password reset and e-mail verification through the real outbox, worker and SMTP fake: the link
 * in the e-mail carries a one-time token that works once, and sign-in then takes the new password.
 */
import "../api/_env";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import { verifyCredentials } from "@/lib/server/auth";
import { startMailWithWorker, type MailHarness, type MailWithWorker } from "./_mail";
import { makeUser } from "../api/_helpers";

let mail: MailHarness;
let harness: MailWithWorker;

beforeAll(async () => {
  harness = await startMailWithWorker();
  mail = harness.mail;
});

afterAll(async () => {
  await harness?.stop();
});

function tokenFrom(text: string, path: string): string {
  const url = /https?:\/\/\S+/.exec(text.slice(text.indexOf(path) - 40))?.[0] ?? "";
  const token = new URL(url).searchParams.get("token");
  if (!token) throw new Error(`no token link in: ${text}`);
  return token;
}

describe("account e-mails", () => {
  it("resets a password once with the token from the e-mail", async () => {
    const user = await makeUser("student", "reset");
    const { requestPasswordReset, resetPassword } = await import("@/lib/server/mail/account-mail");
    await requestPasswordReset({ email: user.email });
    const message = await mail.waitFor((m) => m.to === user.email && m.kind === "password-reset");
    expect(message.html).toContain("/reset-password?token=");
    const token = tokenFrom(message.text, "/reset-password");

    expect(await resetPassword({ token, password: "a-new-password-42" })).toBe(true);
    expect(await resetPassword({ token, password: "another-password-43" })).toBe(false);
    await expect(verifyCredentials({ email: user.email, password: "a-new-password-42" }, null)).resolves.toMatchObject({
      id: user.id,
    });
    await expect(verifyCredentials({ email: user.email, password: user.password }, null)).rejects.toThrow();
  });

  it("sends nothing for an unknown address", async () => {
    const { requestPasswordReset } = await import("@/lib/server/mail/account-mail");
    const before = (await mail.messages()).length;
    await requestPasswordReset({ email: "nobody-here@example.com" });
    await new Promise((r) => setTimeout(r, 1_500));
    expect((await mail.messages()).length).toBe(before);
  });

  it("verifies an address with the token from the e-mail", async () => {
    const user = await makeUser("student", "verify");
    const { requestEmailVerification, verifyEmail } = await import("@/lib/server/mail/account-mail");
    await requestEmailVerification({ email: user.email });
    const message = await mail.waitFor((m) => m.to === user.email && m.kind === "email-verification");
    const token = tokenFrom(message.text, "/verify-email");
    expect(await verifyEmail({ token })).toBe(true);
    expect(await verifyEmail({ token })).toBe(false);
    const [row] = await db.select({ verifiedAt: users.emailVerifiedAt }).from(users).where(eq(users.id, user.id));
    expect(row.verifiedAt).toBeInstanceOf(Date);
  });
});
