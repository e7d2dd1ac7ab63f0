import { getActiveUserById } from "@/db/queries/users";
import { json, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { AppError } from "@/lib/server/errors";

/** GET /api/v1/me — who the session or token belongs to. */
export const GET = route(async (request) => {
  const actor = await requireActor(request);
  const user = await getActiveUserById({ id: actor.userId });
  if (!user) throw new AppError("unauthorized");
  return json({ user, via: actor.via });
});
