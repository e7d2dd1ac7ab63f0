import { json, readJson, route } from "@/lib/api";
import { verifyEmailSchema } from "@/lib/api-schemas";
import { EXPIRED_LINK_MESSAGE } from "@/lib/auth-schemas";
import { AppError } from "@/lib/errors";
import { verifyEmail } from "@/lib/mail/account-mail";
import { assertSameOrigin } from "@/lib/security";

/** POST /api/v1/accounts/verify-email — confirms an e-mail address with the token from the verification e-mail (once). */
export const POST = route(async (request) => {
  const body = await readJson(request, verifyEmailSchema);
  if (request.headers.has("origin") || request.headers.has("sec-fetch-site")) assertSameOrigin(request);
  const ok = await verifyEmail({ token: body.token });
  if (!ok) throw new AppError("bad_request:token", EXPIRED_LINK_MESSAGE, { issues: [{ path: "token", message: "has expired or was already used" }] });
  return json({ verified: true });
});
