import bcrypt from "bcryptjs";
import { z } from "zod";
import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { countSignUpAttempts, createUser, recordSignUpAttempt } from "@/db/queries/users";
import { json, readJson, route } from "@/lib/server/route";
import { signUpSchema } from "@/lib/shared/schemas/api";
import { clientIp } from "@/lib/server/auth";
import { AppError } from "@/lib/server/errors";
import { logger } from "@/lib/server/log";
import { requestEmailVerification } from "@/lib/server/mail/account-mail";
import { notifyExistingAccountSignUp } from "@/lib/server/mail/sign-up-mail";
import { assertSameOrigin } from "@/lib/server/security";

/** Unknown fields are refused, not ignored. */
const strictSignUp = z.strictObject(signUpSchema.shape);

/**
 * Sign-ups per address and per client address in a sliding window, counted in PostgreSQL so the
 * limits hold across app servers. Beyond the per-address limit nothing is done (and the answer is
 * the same 202); beyond the per-client limit the answer is 429 with Retry-After.
 */
export const SIGN_UP_LIMIT = { perEmail: 3, perIp: 10, windowMinutes: 15 } as const;

/** Every answer takes at least this long, so a new and an existing address cannot be told apart by timing. */
const MIN_RESPONSE_MS = 400;

/**
 * POST /api/v1/accounts — sign up (student or researcher). The answer is 202 `{ accepted: true }`
 * whether or not the address already has an account: a new address gets its account and the
 * verification e-mail; an existing one's owner gets a note instead, and nothing else changes. The
 * form then signs in through next-auth, which succeeds only for the new account's owner.
 */
export const POST = route(async (request) => {
  const started = Date.now();
  const body = await readJson(request, strictSignUp);
  // A browser form posts here without a session yet; refuse cross-site posts all the same.
  if (request.headers.has("origin") || request.headers.has("sec-fetch-site")) assertSameOrigin(request);
  const ip = clientIp(request.headers);
  const since = new Date(Date.now() - SIGN_UP_LIMIT.windowMinutes * 60_000);
  const counts = await countSignUpAttempts({ email: body.email, ip, since });
  if (ip && counts.byIp >= SIGN_UP_LIMIT.perIp) {
    throw new AppError(
      "rate_limited:sign-up",
      `Too many sign-ups from your address. Try again in ${SIGN_UP_LIMIT.windowMinutes} minutes.`,
      {
        details: { retryAfterS: SIGN_UP_LIMIT.windowMinutes * 60 },
      },
    );
  }
  await recordSignUpAttempt({ email: body.email, ip });
  if (counts.byEmail < SIGN_UP_LIMIT.perEmail) {
    // Hashed for both kinds of address, so the work (and the time) is the same.
    const passwordHash = await bcrypt.hash(body.password, 10);
    const user = await inTransaction(async () => {
      const created = await createUser({ email: body.email, name: body.name, siteRole: body.siteRole, passwordHash });
      if (created)
        await recordAudit({ actorId: created.id, action: "user.sign-up", targetType: "user", targetId: created.id });
      return created;
    });
    try {
      if (user) await requestEmailVerification({ email: user.email });
      else await notifyExistingAccountSignUp({ email: body.email });
    } catch (err) {
      // The account (if new) exists by now; a failed mail queue must not turn the answer into an error or a tell.
      logger.error({ err }, "sign-up e-mail could not be queued");
    }
  }
  const wait = MIN_RESPONSE_MS - (Date.now() - started);
  if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
  return json({ accepted: true, message: "Check your e-mail: a new account gets a link to confirm its address." }, 202);
});
