import type { Metadata } from "next";
import { listOwnSubmissions, listCoursesForUser } from "@/db/queries/courses";
import { listReviewQueue } from "@/db/queries/reviews";
import { ReviewQueue } from "@/components/review/review-queue";
import { queueQuerySchema } from "@/lib/shared/schemas/reviews";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Reviews" };
export const dynamic = "force-dynamic";

type Search = Record<string, string | string[] | undefined>;

/** The review queue (submissions to the courses the caller teaches), filtered by the URL and first sorted as it says; and the caller's own submissions. */
export default async function ReviewsPage({ searchParams }: { searchParams: Promise<Search> }) {
  const raw = await searchParams;
  const actor = await requirePageActor("/reviews");
  const flat = Object.fromEntries(
    Object.entries(raw).flatMap(([k, v]) => (typeof v === "string" && v !== "" ? [[k, v]] : [])),
  );
  const parsed = queueQuerySchema.safeParse(flat);
  const filter = parsed.success ? parsed.data : queueQuerySchema.parse({});
  const [queue, mine, courses] = await Promise.all([
    listReviewQueue({ userId: actor.userId, filter }),
    listOwnSubmissions({ userId: actor.userId }),
    listCoursesForUser({ userId: actor.userId }),
  ]);
  // no column chosen in the URL: waiting first, oldest first (the table orders the rows so)
  const initialSort = parsed.success && flat.sort !== undefined ? { column: filter.sort, order: filter.order } : null;
  const rows = queue.map((q) => ({ ...q, submittedAt: q.submittedAt.toISOString(), dueAt: q.dueAt.toISOString() }));
  const taught = courses.filter((c) => capabilities(actor, { kind: "course", role: c.role }).canReview);
  return (
    <ReviewQueue
      filter={filter}
      teaches={taught.length > 0}
      courses={taught.map((c) => ({ id: c.id, title: c.title }))}
      queue={rows}
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
