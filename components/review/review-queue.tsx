import { Panel } from "@/components/ui/panel";
import type { QueueQuery } from "@/lib/shared/schemas/reviews";
import { MySubmissions, type MySubmissionRow } from "./my-submissions";
import { ReviewQueueTable, type QueueRow, type QueueSort } from "./review-queue-table";

export { waitingFirst } from "./queue-order";
export type { QueueRow, QueueSort } from "./review-queue-table";

/** The reviews page: the queue of the courses the caller teaches (filters, sortable table), then the caller's own submissions. */
export function ReviewQueue({
  filter,
  initialSort,
  teaches,
  courses,
  queue,
  nextCursor,
  pageLimit,
  mine,
}: {
  filter: QueueQuery;
  /** The column the URL chose, or null: the rows come waiting first, oldest first. */
  initialSort: QueueSort | null;
  teaches: boolean;
  courses: { id: string; title: string }[];
  /** The first page of the queue, and the cursor of the next (null: that is all of it). */
  queue: QueueRow[];
  nextCursor: string | null;
  /** Rows per page when the browser loads the rest. */
  pageLimit: number;
  mine: MySubmissionRow[];
}) {
  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <h1 className="text-2xl font-semibold tracking-tight">Reviews</h1>
      {teaches ? (
        <>
          <p className="text-sm text-ink-soft">
            Submitted plans in your courses. Open one to see it in the viewer, comment on a move and a moment, and
            approve or return it.
          </p>
          <ReviewQueueTable
            // new filters or a new first sort start a new walk through the pages (this is a server component: no client helpers here)
            key={JSON.stringify([filter, initialSort])}
            filter={filter}
            initialSort={initialSort}
            courses={courses}
            rows={queue}
            nextCursor={nextCursor}
            pageLimit={pageLimit}
          />
        </>
      ) : null}
      {teaches && mine.length === 0 ? null : (
        <>
          <h2 className="mt-8 text-lg font-semibold">Your submissions</h2>
          <Panel className="mt-2 overflow-x-auto">
            <MySubmissions rows={mine} />
          </Panel>
        </>
      )}
    </div>
  );
}
