import { json, readJson, route } from "@/lib/server/route";
import { passwordResetConfirmSchema } from "@/lib/shared/schemas/api";
import { EXPIRED_LINK_MESSAGE } from "@/lib/shared/schemas/auth";
import { AppError } from "@/lib/server/errors";
import { resetPassword } from "@/lib/server/mail/account-mail";
import { assertSameOrigin } from "@/lib/server/security";

/**
 * POST /api/v1/accounts/password-reset/confirm — sets a new password with the token from the
 * reset e-mail. The token works once; using it voids the account's other reset links and ends the
 * account's existing sessions (lib/server/auth-request.ts). Resets are not yet written to the audit log (which is kept per project).
 */
export const POST = route(async (request) => {
  const body = await readJson(request, passwordResetConfirmSchema);
  if (request.headers.has("origin") || request.headers.has("sec-fetch-site")) assertSameOrigin(request);
  const ok = await resetPassword({ token: body.token, password: body.password });
  if (!ok)
    throw new AppError("bad_request:token", EXPIRED_LINK_MESSAGE, {
      issues: [{ path: "token", message: "has expired or was already used" }],
    });
  return json({ reset: true });
});
