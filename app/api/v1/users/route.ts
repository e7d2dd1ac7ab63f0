import { listUsers } from "@/db/queries/users";
import { json, route } from "@/lib/api";
import { requireActor } from "@/lib/auth-request";
import { authorizeSite } from "@/lib/permissions";

/** GET /api/v1/users — every account (admins only). */
export const GET = route(async (request) => {
  const actor = await requireActor(request);
  authorizeSite(actor, "user:list");
  return json({ users: await listUsers() });
});
