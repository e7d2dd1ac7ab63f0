// @vitest-environment happy-dom
// The review queue's table in the browser: the one DataTable, waiting submissions first and oldest
// first until a column is chosen, the chosen column kept in the URL, one wording per state.
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import {
  appendPage,
  queueApiQuery,
  ReviewQueueTable,
  queueHref,
  type QueueRow,
} from "@/components/review/review-queue-table";
import { submissionStatusWords } from "@/components/review/status-words";
import { queueQuerySchema } from "@/lib/shared/schemas/reviews";

afterEach(cleanup);
beforeEach(() => window.history.replaceState(null, "", "/reviews"));

function row(id: string, patch: Partial<QueueRow>): QueueRow {
  return {
    id,
    studentName: `Student ${id}`,
    studentEmail: `${id}@example.test`,
    assignmentTitle: `Assignment ${id}`,
    courseTitle: "Robot Motion I",
    submittedAt: "2026-12-01T09:00:00.000Z",
    dueAt: "2026-12-10T12:00:00.000Z",
    late: false,
    attempt: 1,
    verdict: "pass",
    status: "submitted",
    ...patch,
  };
}

// In the order a sort by student name would give, which is neither the default order nor its reverse.
const rows: QueueRow[] = [
  row("a", { studentName: "Ada", status: "approved", submittedAt: "2026-11-28T10:00:00.000Z", verdict: "fault" }),
  row("b", { studentName: "Bea", status: "submitted", submittedAt: "2026-11-30T10:00:00.000Z", verdict: "caution" }),
  row("c", { studentName: "Cyd", status: "returned", submittedAt: "2026-11-29T10:00:00.000Z", verdict: "pass" }),
  row("d", { studentName: "Dov", status: "submitted", submittedAt: "2026-11-29T08:00:00.000Z", verdict: "fault" }),
];

const noFilter = queueQuerySchema.parse({});

function queue() {
  return screen.getByRole("table", { name: "Review queue" });
}

/** Student names down the queue, top first. */
function studentsInOrder(): string[] {
  return screen
    .getAllByTestId("queue-row")
    .map((tr) => within(tr).getAllByRole("cell")[0].querySelector("a")!.textContent!);
}

function statusesInOrder(): string[] {
  return screen.getAllByTestId("queue-row").map((tr) => within(tr).getAllByRole("cell").at(-1)!.textContent!);
}

describe("review queue table", () => {
  it("shows waiting submissions first, each group oldest first, when no column is chosen", () => {
    render(<ReviewQueueTable filter={noFilter} initialSort={null} courses={[]} rows={rows} />);
    expect(studentsInOrder()).toEqual(["Dov", "Bea", "Ada", "Cyd"]);
    expect(statusesInOrder()).toEqual([
      "Waiting for review",
      "Waiting for review",
      submissionStatusWords.approved,
      submissionStatusWords.returned,
    ]);
    expect(screen.getByTestId("queue-order").textContent).toMatch(/^Waiting for review first/);
    // every sortable header offers sorting, none is marked sorted
    for (const name of ["Student", "Assignment", "Submitted", "Verdict", "Status"])
      expect(
        within(queue())
          .getByRole("columnheader", { name: new RegExp(name) })
          .getAttribute("aria-sort"),
      ).toBe("none");
  });

  it("sorts by a clicked column, writes it into the URL and the filter form, and goes back to waiting first", () => {
    render(<ReviewQueueTable filter={noFilter} initialSort={null} courses={[]} rows={rows} />);
    fireEvent.click(within(queue()).getByRole("button", { name: /Student/ }));
    expect(studentsInOrder()).toEqual(["Ada", "Bea", "Cyd", "Dov"]);
    expect(
      within(queue())
        .getByRole("columnheader", { name: /Student/ })
        .getAttribute("aria-sort"),
    ).toBe("ascending");
    expect(window.location.pathname + window.location.search).toBe("/reviews?sort=student&order=asc");
    expect(screen.getByTestId("queue-order").textContent).toMatch(/^Sorted by student, ascending\./);
    const form = screen.getByRole("form", { name: "Filter the queue" }) as HTMLFormElement;
    expect(Object.fromEntries(new FormData(form))).toMatchObject({ sort: "student", order: "asc" });

    fireEvent.click(within(queue()).getByRole("button", { name: /Student/ }));
    expect(studentsInOrder()).toEqual(["Dov", "Cyd", "Bea", "Ada"]);
    expect(window.location.search).toBe("?sort=student&order=desc");

    fireEvent.click(screen.getByRole("button", { name: "Back to waiting first, oldest first" }));
    expect(studentsInOrder()).toEqual(["Dov", "Bea", "Ada", "Cyd"]);
    expect(window.location.search).toBe("");
    expect(new FormData(screen.getByRole("form", { name: "Filter the queue" }) as HTMLFormElement).has("sort")).toBe(
      false,
    );
  });

  it("opens sorted as the URL says, verdicts and states in the database's order rather than alphabetically", () => {
    const { unmount } = render(
      <ReviewQueueTable
        filter={{ ...noFilter, sort: "verdict", order: "asc" }}
        initialSort={{ column: "verdict", order: "asc" }}
        courses={[]}
        rows={rows}
      />,
    );
    // pass, caution, fault; the two faults keep the waiting-first order between them
    expect(studentsInOrder()).toEqual(["Cyd", "Bea", "Dov", "Ada"]);
    unmount();
    render(
      <ReviewQueueTable
        filter={{ ...noFilter, sort: "status", order: "asc" }}
        initialSort={{ column: "status", order: "asc" }}
        courses={[]}
        rows={rows}
      />,
    );
    expect(statusesInOrder()).toEqual([
      "Waiting for review",
      "Waiting for review",
      "Returned with comments",
      "Approved",
    ]);
  });

  it("filters the rows by the search text and says when nothing matches", () => {
    render(<ReviewQueueTable filter={noFilter} initialSort={null} courses={[]} rows={rows} />);
    const search = screen.getByRole("searchbox", { name: "Search the queue" });
    fireEvent.change(search, { target: { value: "returned" } });
    expect(studentsInOrder()).toEqual(["Cyd"]);
    fireEvent.change(search, { target: { value: "nobody by this name" } });
    expect(screen.queryAllByTestId("queue-row")).toHaveLength(0);
    expect(queue().textContent).toContain("No submission in the queue matches this search.");
  });

  it("says so when the filters leave no submission, with no table", () => {
    render(<ReviewQueueTable filter={noFilter} initialSort={null} courses={[]} rows={[]} />);
    expect(screen.queryByRole("table", { name: "Review queue" })).toBeNull();
    expect(screen.getByText("No submissions match these filters.")).toBeTruthy();
  });

  it("keeps the filters and drops a default sort in the queue's links", () => {
    const id = "6b1f4a52-0f7e-4c47-9f5e-3a1f2b7c9d10";
    expect(queueHref({ ...noFilter, courseId: id, status: "submitted" }, null)).toBe(
      `/reviews?courseId=${id}&status=submitted`,
    );
    expect(queueHref(noFilter, { column: "submittedAt", order: "desc" })).toBe("/reviews?sort=submittedAt&order=desc");
  });

  it("asks the API for the next page with the filters and the first page's order, and the cursor", () => {
    const id = "6b1f4a52-0f7e-4c47-9f5e-3a1f2b7c9d10";
    const url = new URL(
      queueApiQuery(
        { ...noFilter, courseId: id, verdict: "fault" },
        { column: "student", order: "desc" },
        200,
        "abc_-",
      ),
      "http://x.test",
    );
    expect(url.pathname).toBe("/api/v1/reviews");
    expect(Object.fromEntries(url.searchParams)).toEqual({
      courseId: id,
      verdict: "fault",
      sort: "student",
      order: "desc",
      limit: "200",
      cursor: "abc_-",
    });
    // waiting first is the API's default: no sort, no order
    const plain = new URL(queueApiQuery(noFilter, null, 50, "c"), "http://x.test");
    expect(Object.fromEntries(plain.searchParams)).toEqual({ limit: "50", cursor: "c" });
  });

  it("adds a later page's rows once each, a row seen again (its state changed between pages) as last seen", () => {
    const shown = [rows[0], rows[1]];
    const later = [{ ...rows[1], status: "approved" as const }, rows[2]];
    const merged = appendPage(shown, later);
    expect(merged.map((r) => r.id)).toEqual(["a", "b", "c"]);
    expect(merged.find((r) => r.id === "b")!.status).toBe("approved");
  });

  it("says nothing about more rows when the first page is the whole queue", () => {
    render(<ReviewQueueTable filter={noFilter} initialSort={null} courses={[]} rows={rows} nextCursor={null} />);
    expect(screen.queryByTestId("queue-progress")).toBeNull();
    expect(screen.getAllByTestId("queue-row")).toHaveLength(4);
  });
});
