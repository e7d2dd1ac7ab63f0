import bcrypt from "bcryptjs";
import { recordAudit } from "@/db/queries/audit";
import { createUser } from "@/db/queries/users";
import { json, readJson, route } from "@/lib/api";
import { signUpSchema } from "@/lib/api-schemas";
import { AppError } from "@/lib/errors";
import { assertSameOrigin } from "@/lib/security";

/** POST /api/v1/accounts — sign up (student or researcher). The form then signs in through next-auth. */
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
  return json({ user }, 201);
});
