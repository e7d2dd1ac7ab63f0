import { listOwnSubmissions } from "@/db/queries/courses";
import { json, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";

/** GET /api/v1/submissions — the caller's own submissions across courses, newest first (scoped by the query). */
export const GET = route(async (request) => {
  const actor = await requireActor(request);
  return json({ submissions: await listOwnSubmissions({ userId: actor.userId }) });
});
