"use client";
/**
 * The review queue's filters and table in the browser. The course, status and verdict filters are a
 * GET form (the server filters; the URL can be shared); sorting and the search text are the one
 * DataTable's, and the chosen column is written back into the URL so a shared link opens sorted the
 * same way. With no column chosen the rows come waiting first, oldest first.
 *
 * A long queue comes a page at a time: the server renders the first page, and the table loads the
 * following ones through the API (`?cursor=`) one after another until the last, so sorting and the
 * search cover the whole queue once it is in. Until then, or when a page fails, a line above the
 * table says how many submissions are shown and that more exist.
 */
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import type { SortingState } from "@tanstack/react-table";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { TextField } from "@/components/ui/field";
import { request } from "@/lib/client/api-client";
import { EmptyState, Panel } from "@/components/ui/panel";
import { VerdictChip } from "@/components/ui/verdict-chip";
import type { QueueQuery } from "@/lib/shared/schemas/reviews";
import { statusRank, verdictRank, waitingFirst } from "./queue-order";
import { submissionStatusWords, type SubmissionStatus } from "./status-words";

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
  verdict: "pass" | "caution" | "fault";
  status: SubmissionStatus;
}

/** A column the queue can be sorted by, as the URL (`?sort=`) and the table name it. */
export type QueueSortColumn = QueueQuery["sort"];
export type QueueSort = { column: QueueSortColumn; order: "asc" | "desc" };

const headers: Record<QueueSortColumn, string> = {
  student: "Student",
  assignment: "Assignment",
  submittedAt: "Submitted",
  verdict: "Verdict",
  status: "Status",
};

const col = columnsFor<QueueRow>();

// Module-level columns: their cell functions keep one identity, so a refresh of the rows never remounts a cell.
const columns = col.columns([
  col.accessor("studentName", {
    id: "student",
    header: headers.student,
    sortFn: "text",
    cell: (c) => (
      <>
        <Link href={`/reviews/${c.row.original.id}`} className="font-medium text-brand-700 hover:underline">
          {c.getValue()}
        </Link>
        <p className="text-xs text-ink-faint">{c.row.original.studentEmail}</p>
      </>
    ),
  }),
  col.accessor("assignmentTitle", {
    id: "assignment",
    header: headers.assignment,
    sortFn: "text",
    cell: (c) => (
      <>
        {c.getValue()}
        <p className="text-xs text-ink-faint">
          {c.row.original.courseTitle}
          {c.row.original.attempt > 1 ? ` · attempt ${c.row.original.attempt}` : ""}
        </p>
      </>
    ),
  }),
  col.accessor("submittedAt", {
    header: headers.submittedAt,
    sortFn: "basic",
    enableGlobalFilter: false,
    meta: { cellClassName: "tabular text-xs whitespace-nowrap" },
    cell: (c) => (
      <>
        <DateTime value={c.getValue()} />
        {c.row.original.late ? <span className="ml-1 rounded bg-caution-tint px-1 text-caution">late</span> : null}
      </>
    ),
  }),
  col.accessor("verdict", {
    header: headers.verdict,
    // as the server sorts it (the enum's order), not alphabetically
    sortFn: (a, b) => verdictRank[a.original.verdict] - verdictRank[b.original.verdict],
    cell: (c) => <VerdictChip size="sm" verdict={c.getValue()} />,
  }),
  col.accessor((r) => submissionStatusWords[r.status], {
    id: "status",
    header: headers.status,
    sortFn: (a, b) => statusRank[a.original.status] - statusRank[b.original.status],
    meta: { cellClassName: "text-xs" },
  }),
]);

/** The API's query string for the queue in `sort`'s order (none: waiting first), keeping every filter. */
export function queueApiQuery(filter: QueueQuery, sort: QueueSort | null, limit: number, cursor: string): string {
  const params = new URLSearchParams(queueHref(filter, sort).split("?")[1] ?? "");
  params.set("limit", String(limit));
  params.set("cursor", cursor);
  return `/api/v1/reviews?${params.toString()}`;
}

/** Rows of a later page added to those shown; a row seen twice (its state changed between pages) is kept once, as last seen. */
export function appendPage(shown: readonly QueueRow[], page: readonly QueueRow[]): QueueRow[] {
  const byId = new Map(shown.map((r) => [r.id, r]));
  for (const r of page) byId.set(r.id, r);
  return [...byId.values()];
}

type Loaded = { rows: QueueRow[]; nextCursor: string | null; failure: string | null };

/**
 * The queue's rows: the first page as given, then every later page through the API, one request at
 * a time, until `nextCursor` is null or a request fails (then `retry` carries on from there).
 */
function useWholeQueue(first: QueueRow[], nextCursor: string | null, url: (cursor: string) => string) {
  const [source, setSource] = useState(first);
  const [loaded, setLoaded] = useState<Loaded>({ rows: first, nextCursor, failure: null });
  // a new first page from the server (a refresh) starts over
  if (source !== first) {
    setSource(first);
    setLoaded({ rows: first, nextCursor, failure: null });
  }
  const cursor = loaded.failure ? null : loaded.nextCursor;
  useEffect(() => {
    if (!cursor) return;
    let cancelled = false;
    request<{ queue: QueueRow[]; nextCursor: string | null }>(url(cursor)).then(
      (page) => {
        if (!cancelled)
          setLoaded((l) => ({ rows: appendPage(l.rows, page.queue), nextCursor: page.nextCursor, failure: null }));
      },
      (e: unknown) => {
        if (!cancelled)
          setLoaded((l) => ({
            ...l,
            failure: e instanceof Error && e.message ? e.message : "The rest of the queue could not be loaded.",
          }));
      },
    );
    return () => {
      cancelled = true;
    };
    // `url` is rebuilt each render from values fixed for this table's life (it is keyed by them)
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [cursor]);
  return {
    rows: loaded.rows,
    loading: cursor !== null,
    failure: loaded.failure,
    retry: () => setLoaded((l) => ({ ...l, failure: null })),
  };
}

const isSortColumn = (id: string): id is QueueSortColumn => id in headers;

/** The queue's URL with the given sort (none: waiting first), keeping every filter. */
export function queueHref(filter: QueueQuery, sort: QueueSort | null): string {
  const params = new URLSearchParams();
  for (const key of ["courseId", "assignmentId", "status", "verdict"] as const) {
    const value = filter[key];
    if (value) params.set(key, value);
  }
  if (sort) {
    params.set("sort", sort.column);
    params.set("order", sort.order);
  }
  const query = params.toString();
  return query ? `/reviews?${query}` : "/reviews";
}

export function ReviewQueueTable({
  filter,
  initialSort,
  courses,
  rows: firstPage,
  nextCursor = null,
  pageLimit = 200,
}: {
  filter: QueueQuery;
  /** The column the URL chose, or null for the default order: waiting first, oldest first. */
  initialSort: QueueSort | null;
  courses: { id: string; title: string }[];
  /** The first page of the queue, in the order `initialSort` names. */
  rows: QueueRow[];
  /** The next page's cursor (null: the first page is the whole queue). */
  nextCursor?: string | null;
  /** Rows per page for the pages loaded in the browser. */
  pageLimit?: number;
}) {
  const [sort, setSort] = useState<QueueSort | null>(initialSort);
  // later pages continue the server's order of the first, whatever column is clicked meanwhile
  const [pagedSort] = useState(initialSort);
  const whole = useWholeQueue(firstPage, nextCursor, (cursor) => queueApiQuery(filter, pagedSort, pageLimit, cursor));
  const rows = whole.rows;
  // Remounting the table is how "back to waiting first" clears its sorting.
  const [generation, setGeneration] = useState(0);
  const [search, setSearch] = useState("");
  const ordered = useMemo(() => waitingFirst(rows), [rows]);
  const chooseSort = (next: QueueSort | null) => {
    setSort(next);
    window.history.replaceState(window.history.state, "", queueHref(filter, next));
  };
  const onSortingChange = (sorting: SortingState) => {
    const first = sorting[0];
    chooseSort(first && isSortColumn(first.id) ? { column: first.id, order: first.desc ? "desc" : "asc" } : null);
  };
  const select = "h-9 rounded-md border border-line bg-panel px-2 text-sm";
  return (
    <>
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
                {submissionStatusWords[status]}
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
        {/* only a chosen column travels with the filters: without one the queue stays waiting first */}
        {sort ? (
          <>
            <input type="hidden" name="sort" value={sort.column} />
            <input type="hidden" name="order" value={sort.order} />
          </>
        ) : null}
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
      {rows.length > 0 ? (
        <div className="mt-4 flex flex-wrap items-end justify-between gap-3">
          <p className="flex flex-wrap items-center gap-2 text-xs text-ink-soft" data-testid="queue-order">
            {sort ? (
              <>
                <span>
                  Sorted by {headers[sort.column].toLowerCase()}, {sort.order === "asc" ? "ascending" : "descending"}.
                </span>
                <Button
                  size="sm"
                  variant="ghost"
                  onClick={() => {
                    chooseSort(null);
                    setGeneration((g) => g + 1);
                  }}
                >
                  Back to waiting first, oldest first
                </Button>
              </>
            ) : (
              "Waiting for review first, the longest wait on top; click a column to sort by it."
            )}
          </p>
          <TextField
            label="Search the queue"
            type="search"
            placeholder="Student, assignment, verdict or status"
            fieldClassName="w-72"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
          />
        </div>
      ) : null}
      {whole.loading || whole.failure ? (
        <p
          className="mt-2 flex flex-wrap items-center gap-2 text-xs text-ink-soft"
          data-testid="queue-progress"
          role="status"
        >
          <span className="tabular">
            Showing {rows.length} {rows.length === 1 ? "submission" : "submissions"}; the queue has more.
          </span>
          {whole.failure ? (
            <>
              <span className="text-fault">The rest could not be loaded: {whole.failure}</span>
              <Button size="sm" onClick={whole.retry}>
                Try again
              </Button>
            </>
          ) : (
            <span>Loading the rest…</span>
          )}
        </p>
      ) : null}
      <Panel className="mt-2 overflow-x-auto">
        <DataTable
          key={generation}
          label="Review queue"
          data={ordered}
          columns={columns}
          getRowId={(r) => r.id}
          filter={search}
          initialSorting={sort ? [{ id: sort.column, desc: sort.order === "desc" }] : []}
          onSortingChange={onSortingChange}
          testId="review-queue"
          rowTestId="queue-row"
          empty={
            <div className="p-4">
              <EmptyState title="Nothing here">No submissions match these filters.</EmptyState>
            </div>
          }
          noMatch="No submission in the queue matches this search."
        />
      </Panel>
    </>
  );
}
