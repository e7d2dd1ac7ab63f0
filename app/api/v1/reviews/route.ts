import { listReviewQueue } from "@/db/queries/reviews";
import { json, readQuery, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { queueQuerySchema } from "@/lib/shared/schemas/reviews";

/**
 * GET /api/v1/reviews — the review queue: submissions to the courses the caller teaches
 * (filters: courseId, assignmentId, status, verdict; sort, order). Scoped by the query itself,
 * so a caller who teaches nothing gets an empty list.
 */
export const GET = route(async (request) => {
  const filter = readQuery(request, queueQuerySchema);
  const actor = await requireActor(request);
  return json({ queue: await listReviewQueue({ userId: actor.userId, filter }) });
});
