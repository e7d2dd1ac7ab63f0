import { listUsers } from "@/db/queries/users";
import { json, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeSite } from "@/lib/server/permissions";

/** GET /api/v1/users — every account (admins only). */
export const GET = route(async (request) => {
  const actor = await requireActor(request);
  authorizeSite(actor, "user:list");
  return json({ users: await listUsers() });
});
