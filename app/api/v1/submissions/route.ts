import { listOwnSubmissionsPage } from "@/db/queries/courses";
import { timePageQuery } from "@/lib/server/paging";
import { json, readQuery, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";

/** GET /api/v1/submissions — one page of the caller's own submissions across courses, newest first. */
export const GET = route(async (request) => {
  const query = readQuery(request, timePageQuery);
  const actor = await requireActor(request);
  const page = await listOwnSubmissionsPage({ userId: actor.userId, limit: query.limit, after: query.cursor });
  return json({ submissions: page.items, nextCursor: page.nextCursor });
});
