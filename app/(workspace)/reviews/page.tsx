import type { Metadata } from "next";
import { listOwnSubmissions, listCoursesForUser } from "@/db/queries/courses";
import { listReviewQueuePage } from "@/db/queries/reviews";
import { ReviewQueue } from "@/components/review/review-queue";
import { PAGE_LIMIT_MAX } from "@/lib/server/paging";
import { reviewQueuePageQuery } from "@/lib/server/review-queue-paging";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Reviews" };
export const dynamic = "force-dynamic";

type Search = Record<string, string | string[] | undefined>;

/**
 * The review queue (submissions to the courses the caller teaches), filtered and first sorted as the
 * URL says, and the caller's own submissions. The first page of the queue comes with the page; the
 * browser loads the rest through the API, page after page, and says how many are shown until done.
 */
export default async function ReviewsPage({ searchParams }: { searchParams: Promise<Search> }) {
  const raw = await searchParams;
  const actor = await requirePageActor("/reviews");
  // a page always opens at the top of the queue: a pasted cursor or page size is not the page's to follow
  const flat = Object.fromEntries(
    Object.entries(raw).flatMap(([k, v]) =>
      typeof v === "string" && v !== "" && k !== "cursor" && k !== "limit" ? [[k, v]] : [],
    ),
  );
  const parsed = reviewQueuePageQuery.safeParse({ ...flat, limit: String(PAGE_LIMIT_MAX) });
  const query = parsed.success ? parsed.data : reviewQueuePageQuery.parse({ limit: String(PAGE_LIMIT_MAX) });
  const [queue, mine, courses] = await Promise.all([
    listReviewQueuePage({ userId: actor.userId, ...query }),
    listOwnSubmissions({ userId: actor.userId }),
    listCoursesForUser({ userId: actor.userId }),
  ]);
  // no column chosen in the URL: waiting first, oldest first (as the server ordered the rows)
  const initialSort = query.order ? { column: query.order.sort, order: query.order.order } : null;
  const rows = queue.items.map((q) => ({
    ...q,
    submittedAt: q.submittedAt.toISOString(),
    dueAt: q.dueAt.toISOString(),
  }));
  const taught = courses.filter((c) => capabilities(actor, { kind: "course", role: c.role }).canReview);
  return (
    <ReviewQueue
      filter={{
        ...query.filter,
        sort: query.order?.sort ?? "submittedAt",
        order: query.order?.order ?? "asc",
      }}
      teaches={taught.length > 0}
      courses={taught.map((c) => ({ id: c.id, title: c.title }))}
      queue={rows}
      nextCursor={queue.nextCursor}
      pageLimit={PAGE_LIMIT_MAX}
      initialSort={initialSort}
      mine={mine.map((m) => ({
        id: m.id,
        assignmentTitle: m.assignmentTitle,
        courseTitle: m.courseTitle,
        submittedAt: m.submittedAt.toISOString(),
        attempt: m.attempt,
        verdict: m.verdict,
        status: m.status,
        late: m.late,
      }))}
    />
  );
}
