import { listArmsForUser } from "@/db/queries/arms";
import { json, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeSite } from "@/lib/server/permissions";

/** GET /api/v1/arms — the built-in arms and the custom arms of the caller's projects. */
export const GET = route(async (request) => {
  const actor = await requireActor(request);
  authorizeSite(actor, "arm:read-builtin");
  return json({ arms: await listArmsForUser({ userId: actor.userId }) });
});
