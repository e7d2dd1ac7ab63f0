import { json, readJson, route } from "@/lib/server/route";
import { passwordResetRequestSchema } from "@/lib/shared/schemas/api";
import { requestPasswordReset } from "@/lib/server/mail/account-mail";
import { assertSameOrigin } from "@/lib/server/security";

/**
 * Every answer takes at least this long, so that the extra work for a known address (a token row,
 * an outbox row, a queue job) does not tell an observer which addresses have accounts.
 */
const MIN_RESPONSE_MS = 300;

/**
 * POST /api/v1/accounts/password-reset — e-mails a one-time reset link when an active account has
 * this address. The answer is 202 either way (no account probing).
 */
export const POST = route(async (request) => {
  const started = Date.now();
  const body = await readJson(request, passwordResetRequestSchema);
  // Anonymous, like sign-up: refuse cross-site posts from a browser all the same.
  if (request.headers.has("origin") || request.headers.has("sec-fetch-site")) assertSameOrigin(request);
  await requestPasswordReset({ email: body.email });
  const wait = MIN_RESPONSE_MS - (Date.now() - started);
  if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
  return json({ accepted: true }, 202);
});
