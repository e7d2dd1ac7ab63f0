import { inTransaction } from "@/lib/server/transaction";
import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { getUserById, updateUserByAdmin } from "@/db/queries/users";
import { json, readJson, readParams, route, uuidParam } from "@/lib/server/route";
import { adminUpdateUserSchema } from "@/lib/shared/schemas/api";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";
import { authorizeSite } from "@/lib/server/permissions";

const params = z.object({ userId: uuidParam });

/** PATCH /api/v1/users/:userId — an admin changes a user's site role or disables the account. */
export const PATCH = route(async (request, context) => {
  const { userId } = await readParams(context, params);
  const body = await readJson(request, adminUpdateUserSchema);
  const actor = await requireActor(request);
  // Admin-only routes authorise before loading, so non-admins cannot probe which ids exist.
  authorizeSite(actor, "user:manage");
  if (!(await getUserById({ id: userId }))) throw new AppError("not_found:user", "No such user.");
  if (userId === actor.userId && (body.disabled === true || (body.siteRole && body.siteRole !== "admin"))) {
    throw new AppError("unprocessable:self", "Admins cannot disable or demote themselves; ask another admin.");
  }
  const user = await inTransaction(async () => {
    const user = await updateUserByAdmin({ id: userId, siteRole: body.siteRole, disabled: body.disabled });
    await recordAudit({
      actorId: actor.userId,
      action: "user.update",
      targetType: "user",
      targetId: userId,
      detail: body,
    });
    return user;
  });
  return json({ user });
});
