/**
 * Password reset and e-mail address verification: one-time tokens (random, stored as SHA-256
 * only, short-lived) sent by e-mail through the outbox. The sign-in routes call these (see
 * notes/for-lead-courses.md for the hooks); an unknown address is answered like a known one.
 */
import "server-only";
import { createHash, randomBytes } from "node:crypto";
import bcrypt from "bcryptjs";
import { consumeAccountToken, createAccountToken, markEmailVerified } from "@/db/queries/account-tokens";
import { queueMail } from "@/db/queries/mail";
import { recordAudit } from "@/db/queries/audit";
import { countPasswordResetsSince, setPasswordWithResetToken } from "@/db/queries/users";
import { enqueueMail } from "./queue";
import { emailVerification, passwordReset } from "./templates";

export const RESET_VALID_MINUTES = 30;
export const VERIFY_VALID_MINUTES = 24 * 60;
/**
 * Reset e-mails sent per address in a sliding window, so the form cannot be used to flood a
 * mailbox. Counted in PostgreSQL (the token rows), so the limit holds across app servers.
 */
export const RESET_REQUEST_LIMIT = { perEmail: 3, windowMinutes: 15 } as const;

function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, hash: hashAccountToken(token) };
}

export function hashAccountToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/**
 * Queues a reset e-mail when an active account has this address and it is under the request
 * limit; says nothing either way (no account probing, and no telling a limited address apart).
 * Two requests racing at the limit may both pass the count; the limit is against floods, not exact.
 */
export async function requestPasswordReset({ email }: { email: string }): Promise<void> {
  const since = new Date(Date.now() - RESET_REQUEST_LIMIT.windowMinutes * 60_000);
  if ((await countPasswordResetsSince({ email, since })) >= RESET_REQUEST_LIMIT.perEmail) return;
  const { token, hash } = newToken();
  const user = await createAccountToken({
    email,
    purpose: "password-reset",
    tokenHash: hash,
    expiresAt: new Date(Date.now() + RESET_VALID_MINUTES * 60_000),
  });
  if (!user) return;
  const ids = await queueMail([
    {
      kind: "password-reset",
      dedupeKey: `password-reset:${hash}`,
      toAddress: user.email,
      ...passwordReset({ name: user.name, token, validMinutes: RESET_VALID_MINUTES }),
    },
  ]);
  await enqueueMail(ids);
}

/**
 * Sets a new password with a reset token (once), which also ends the account's existing sessions
 * (`passwordChangedAt`), and writes the audit entry. The password must already satisfy
 * `passwordSchema`. False when the token is unknown, used or expired.
 */
export async function resetPassword({ token, password }: { token: string; password: string }): Promise<boolean> {
  const userId = await setPasswordWithResetToken({
    tokenHash: hashAccountToken(token),
    passwordHash: await bcrypt.hash(password, 10),
  });
  if (!userId) return false;
  // The account's owner is the actor: the one-time token proves they read the e-mail.
  await recordAudit({ actorId: userId, action: "account.password_reset", targetType: "user", targetId: userId });
  return true;
}

/** Queues the verification e-mail for an address (after sign-up, or on request). */
export async function requestEmailVerification({ email }: { email: string }): Promise<void> {
  const { token, hash } = newToken();
  const user = await createAccountToken({
    email,
    purpose: "email-verification",
    tokenHash: hash,
    expiresAt: new Date(Date.now() + VERIFY_VALID_MINUTES * 60_000),
  });
  if (!user) return;
  const ids = await queueMail([
    {
      kind: "email-verification",
      dedupeKey: `email-verification:${hash}`,
      toAddress: user.email,
      ...emailVerification({ name: user.name, token, validMinutes: VERIFY_VALID_MINUTES }),
    },
  ]);
  await enqueueMail(ids);
}

/** Confirms an address with its token (once). */
export async function verifyEmail({ token }: { token: string }): Promise<boolean> {
  const userId = await consumeAccountToken({ tokenHash: hashAccountToken(token), purpose: "email-verification" });
  if (!userId) return false;
  await markEmailVerified({ userId });
  return true;
}
