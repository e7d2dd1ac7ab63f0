import Link from "next/link";
import { EmptyState, Panel } from "@/components/ui/panel";
import { DateTime } from "@/components/ui/date-time";
import { Table, Td, Th } from "@/components/ui/table";
import { VerdictChip } from "@/components/ui/verdict-chip";
import type { QueueQuery } from "@/lib/shared/schemas/reviews";
import { MySubmissions, type MySubmissionRow } from "./my-submissions";
import { submissionStatusWords, type SubmissionStatus } from "./status-words";

type Verdict = "pass" | "caution" | "fault";
type Status = SubmissionStatus;

export interface QueueRow {
  id: string;
  studentName: string;
  studentEmail: string;
  assignmentTitle: string;
  courseTitle: string;
  submittedAt: string;
  dueAt: string;
  late: boolean;
  attempt: number;
  verdict: Verdict;
  status: Status;
}

const statusWords = submissionStatusWords;

/**
 * The queue's order when none is chosen: waiting submissions first, each group oldest first (the
 * longest wait on top); an id breaks ties so the order is stable.
 */
export function waitingFirst<T extends Pick<QueueRow, "id" | "status" | "submittedAt">>(rows: readonly T[]): T[] {
  const rank = (s: Status) => (s === "submitted" ? 0 : 1);
  return rows
    .slice()
    .sort(
      (a, b) =>
        rank(a.status) - rank(b.status) ||
        Date.parse(a.submittedAt) - Date.parse(b.submittedAt) ||
        a.id.localeCompare(b.id),
    );
}

/** A link to the same queue with some filter or sort changed (the URL is the queue's state, so it can be shared). */
function hrefWith(filter: QueueQuery, patch: Partial<QueueQuery>): string {
  const next = { ...filter, ...patch };
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(next)) if (v !== undefined && v !== "") params.set(k, String(v));
  return `/reviews?${params.toString()}`;
}

function SortHeader({
  filter,
  column,
  children,
  defaultOrder,
}: {
  filter: QueueQuery;
  column: QueueQuery["sort"];
  children: string;
  /** The queue is in its default order (waiting first, oldest first), not sorted by a column. */
  defaultOrder: boolean;
}) {
  const active = !defaultOrder && filter.sort === column;
  const order = active && filter.order === "asc" ? "desc" : "asc";
  return (
    <Th aria-sort={active ? (filter.order === "asc" ? "ascending" : "descending") : "none"}>
      <Link href={hrefWith(filter, { sort: column, order })} className="hover:text-ink">
        {children}
        {active ? (filter.order === "asc" ? " ▲" : " ▼") : ""}
      </Link>
    </Th>
  );
}

/** The review queue as a table with filters (a GET form) and sortable columns, plus the caller's own submissions. */
export function ReviewQueue({
  filter,
  teaches,
  courses,
  queue,
  mine,
  defaultOrder,
}: {
  filter: QueueQuery;
  /** No column was chosen: the rows come waiting first, oldest first ({@link waitingFirst}). */
  defaultOrder: boolean;
  teaches: boolean;
  courses: { id: string; title: string }[];
  queue: QueueRow[];
  mine: MySubmissionRow[];
}) {
  const select = "h-9 rounded-md border border-line bg-panel px-2 text-sm";
  return (
    <div className="mx-auto max-w-6xl px-6 py-8">
      <h1 className="text-2xl font-semibold tracking-tight">Reviews</h1>
      {teaches ? (
        <>
          <p className="text-sm text-ink-soft">
            Submitted plans in your courses. Open one to see it in the viewer, comment on a move and a moment, and
            approve or return it.
          </p>
          <form
            method="get"
            action="/reviews"
            className="mt-5 flex flex-wrap items-end gap-3"
            aria-label="Filter the queue"
          >
            <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
              Course
              <select name="courseId" defaultValue={filter.courseId ?? ""} className={select}>
                <option value="">All courses</option>
                {courses.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.title}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
              Status
              <select name="status" defaultValue={filter.status ?? ""} className={select}>
                <option value="">Any status</option>
                {(["submitted", "returned", "approved"] as const).map((status) => (
                  <option key={status} value={status}>
                    {statusWords[status]}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
              Verdict
              <select name="verdict" defaultValue={filter.verdict ?? ""} className={select}>
                <option value="">Any verdict</option>
                <option value="pass">Pass</option>
                <option value="caution">Caution</option>
                <option value="fault">Fault</option>
              </select>
            </label>
            {filter.assignmentId ? <input type="hidden" name="assignmentId" value={filter.assignmentId} /> : null}
            <input type="hidden" name="sort" value={filter.sort} />
            <input type="hidden" name="order" value={filter.order} />
            <button
              type="submit"
              className="h-9 rounded-md bg-brand-600 px-3.5 text-sm font-medium text-white hover:bg-brand-700"
            >
              Apply
            </button>
            <Link href="/reviews" className="h-9 px-2 text-sm leading-9 text-ink-soft hover:text-ink">
              Clear
            </Link>
          </form>
          {queue.length > 0 ? (
            <p className="mt-4 text-xs text-ink-soft" data-testid="queue-order">
              {defaultOrder
                ? "Waiting for review first, the longest wait on top; click a column to sort by it."
                : "Sorted by the column marked ▲ or ▼; Clear returns to waiting first, oldest first."}
            </p>
          ) : null}
          <Panel className="mt-2 overflow-x-auto">
            {queue.length === 0 ? (
              <div className="p-4">
                <EmptyState title="Nothing here">No submissions match these filters.</EmptyState>
              </div>
            ) : (
              <Table aria-label="Review queue" data-testid="review-queue">
                <thead>
                  <tr>
                    <SortHeader filter={filter} column="student" defaultOrder={defaultOrder}>
                      Student
                    </SortHeader>
                    <SortHeader filter={filter} column="assignment" defaultOrder={defaultOrder}>
                      Assignment
                    </SortHeader>
                    <SortHeader filter={filter} column="submittedAt" defaultOrder={defaultOrder}>
                      Submitted
                    </SortHeader>
                    <SortHeader filter={filter} column="verdict" defaultOrder={defaultOrder}>
                      Verdict
                    </SortHeader>
                    <SortHeader filter={filter} column="status" defaultOrder={defaultOrder}>
                      Status
                    </SortHeader>
                  </tr>
                </thead>
                <tbody>
                  {queue.map((q) => (
                    <tr key={q.id} data-testid="queue-row">
                      <Td>
                        <Link href={`/reviews/${q.id}`} className="font-medium text-brand-700 hover:underline">
                          {q.studentName}
                        </Link>
                        <p className="text-xs text-ink-faint">{q.studentEmail}</p>
                      </Td>
                      <Td>
                        {q.assignmentTitle}
                        <p className="text-xs text-ink-faint">
                          {q.courseTitle}
                          {q.attempt > 1 ? ` · attempt ${q.attempt}` : ""}
                        </p>
                      </Td>
                      <Td className="tabular text-xs whitespace-nowrap">
                        <DateTime value={q.submittedAt} />
                        {q.late ? <span className="ml-1 rounded bg-caution-tint px-1 text-caution">late</span> : null}
                      </Td>
                      <Td>
                        <VerdictChip size="sm" verdict={q.verdict} />
                      </Td>
                      <Td className="text-xs">{statusWords[q.status]}</Td>
                    </tr>
                  ))}
                </tbody>
              </Table>
            )}
          </Panel>
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
