/**
 * Password reset and e-mail address verification: one-time tokens (random, stored as SHA-256
 * only, short-lived) sent by e-mail through the outbox. The sign-in routes call these (see
 * notes/for-lead-courses.md for the hooks); an unknown address is answered like a known one.
 */
import "server-only";
import { createHash, randomBytes } from "node:crypto";
import bcrypt from "bcryptjs";
import { consumeAccountToken, createAccountToken, markEmailVerified, queueMail, resetPasswordWithToken } from "@/db/queries/mail";
import { enqueueMail } from "./queue";
import { emailVerification, passwordReset } from "./templates";

export const RESET_VALID_MINUTES = 30;
export const VERIFY_VALID_MINUTES = 24 * 60;

function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, hash: hashAccountToken(token) };
}

export function hashAccountToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** Queues a reset e-mail when an active account has this address; says nothing either way (no account probing). */
export async function requestPasswordReset({ email }: { email: string }): Promise<void> {
  const { token, hash } = newToken();
  const user = await createAccountToken({ email, purpose: "password-reset", tokenHash: hash, expiresAt: new Date(Date.now() + RESET_VALID_MINUTES * 60_000) });
  if (!user) return;
  const ids = await queueMail([{ kind: "password-reset", dedupeKey: `password-reset:${hash}`, toAddress: user.email, ...passwordReset({ name: user.name, token, validMinutes: RESET_VALID_MINUTES }) }]);
  await enqueueMail(ids);
}

/** Sets a new password with a reset token (once). The password must already satisfy `passwordSchema`. */
export async function resetPassword({ token, password }: { token: string; password: string }): Promise<boolean> {
  const userId = await resetPasswordWithToken({ tokenHash: hashAccountToken(token), passwordHash: await bcrypt.hash(password, 10) });
  return userId !== undefined;
}

/** Queues the verification e-mail for an address (after sign-up, or on request). */
export async function requestEmailVerification({ email }: { email: string }): Promise<void> {
  const { token, hash } = newToken();
  const user = await createAccountToken({ email, purpose: "email-verification", tokenHash: hash, expiresAt: new Date(Date.now() + VERIFY_VALID_MINUTES * 60_000) });
  if (!user) return;
  const ids = await queueMail([{ kind: "email-verification", dedupeKey: `email-verification:${hash}`, toAddress: user.email, ...emailVerification({ name: user.name, token, validMinutes: VERIFY_VALID_MINUTES }) }]);
  await enqueueMail(ids);
}

/** Confirms an address with its token (once). */
export async function verifyEmail({ token }: { token: string }): Promise<boolean> {
  const userId = await consumeAccountToken({ tokenHash: hashAccountToken(token), purpose: "email-verification" });
  if (!userId) return false;
  await markEmailVerified({ userId });
  return true;
}
