import bcrypt from "bcryptjs";
import { recordAudit } from "@/db/queries/audit";
import { createUser } from "@/db/queries/users";
import { json, readJson, route } from "@/lib/server/route";
import { signUpSchema } from "@/lib/shared/schemas/api";
import { AppError } from "@/lib/server/errors";
import { requestEmailVerification } from "@/lib/server/mail/account-mail";
import { assertSameOrigin } from "@/lib/server/security";

/**
 * POST /api/v1/accounts — sign up (student or researcher). The form then signs in through next-auth.
 * The address-verification e-mail is queued in the outbox; sign-in does not wait for it.
 */
export const POST = route(async (request) => {
  const body = await readJson(request, signUpSchema);
  // A browser form posts here without a session yet; refuse cross-site posts all the same.
  if (request.headers.has("origin") || request.headers.has("sec-fetch-site")) assertSameOrigin(request);
  const user = await createUser({
    email: body.email,
    name: body.name,
    siteRole: body.siteRole,
    passwordHash: await bcrypt.hash(body.password, 10),
  });
  if (!user) throw new AppError("conflict:email", "An account with this e-mail already exists; sign in instead.");
  await recordAudit({ actorId: user.id, action: "user.sign-up", targetType: "user", targetId: user.id });
  try {
    await requestEmailVerification({ email: user.email });
  } catch (err) {
    // The account exists by now; a failed mail queue must not turn the sign-up into an error.
    console.error("[accounts] could not queue the verification e-mail:", err instanceof Error ? err.message : err);
  }
  return json({ user }, 201);
});
