import { listReviewQueuePage } from "@/db/queries/reviews";
import { json, readQuery, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { reviewQueuePageQuery } from "@/lib/server/review-queue-paging";

/**
 * GET /api/v1/reviews — one page of the review queue: submissions to the courses the caller teaches
 * (filters: courseId, assignmentId, status, verdict), waiting for review first and the longest wait
 * on top unless `sort` (and `order`) choose a column; `?limit=&cursor=` pages, `nextCursor` null on
 * the last page. Scoped by the query itself, so a caller who teaches nothing gets an empty list.
 */
export const GET = route(async (request) => {
  const query = readQuery(request, reviewQueuePageQuery);
  const actor = await requireActor(request);
  const page = await listReviewQueuePage({ userId: actor.userId, ...query });
  return json({ queue: page.items, nextCursor: page.nextCursor });
});
