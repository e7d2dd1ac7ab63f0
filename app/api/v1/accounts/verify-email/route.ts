import { json, readJson, route } from "@/lib/server/route";
import { verifyEmailSchema } from "@/lib/shared/schemas/api";
import { EXPIRED_LINK_MESSAGE } from "@/lib/shared/schemas/auth";
import { AppError } from "@/lib/server/errors";
import { verifyEmail } from "@/lib/server/mail/account-mail";
import { assertSameOrigin } from "@/lib/server/security";

/** POST /api/v1/accounts/verify-email — confirms an e-mail address with the token from the verification e-mail (once). */
export const POST = route(async (request) => {
  const body = await readJson(request, verifyEmailSchema);
  if (request.headers.has("origin") || request.headers.has("sec-fetch-site")) assertSameOrigin(request);
  const ok = await verifyEmail({ token: body.token });
  if (!ok)
    throw new AppError("bad_request:token", EXPIRED_LINK_MESSAGE, {
      issues: [{ path: "token", message: "has expired or was already used" }],
    });
  return json({ verified: true });
});
