// @vitest-environment happy-dom
// The course page's assignments table: the one DataTable, sortable by its headers, each row marked
// `assignment-row` for the browser tests, one wording per submission state. No outside source.
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { AppRouterContext } from "next/dist/shared/lib/app-router-context.shared-runtime";
import type { ReactNode } from "react";
import { afterEach, describe, expect, it } from "vitest";
import { CourseView, type CourseViewProps } from "@/components/courses/course-view";
import { submissionStatusWords } from "@/components/review/status-words";

afterEach(cleanup);

const router = {
  push: () => {},
  replace: () => {},
  refresh: () => {},
  back: () => {},
  forward: () => {},
  prefetch: () => {},
  bfcacheId: "test",
};

function Wrap({ children }: { children: ReactNode }) {
  return (
    <AppRouterContext.Provider value={router}>
      <QueryClientProvider client={new QueryClient()}>{children}</QueryClientProvider>
    </AppRouterContext.Provider>
  );
}

const id = (n: number) => `c0ffee00-0000-4000-8000-00000000000${n}`;

const studentCan: CourseViewProps["can"] = {
  canManage: false,
  canSeeJoinCode: false,
  canReadRoster: false,
  canManageRoster: false,
  canSetAssignments: false,
  canSubmit: true,
  canReadAllSubmissions: false,
  canReview: false,
  canExportGrades: false,
};

const instructorCan: CourseViewProps["can"] = {
  ...studentCan,
  canSubmit: false,
  canReadAllSubmissions: true,
  canReview: true,
};

function props(role: "student" | "instructor"): CourseViewProps {
  return {
    course: { id: id(0), title: "Robot Motion I", term: "Autumn", role, joinCode: null, inviteUrl: null },
    can: role === "student" ? studentCan : instructorCan,
    // not in due order, so the table's own sorting shows
    assignments: [
      {
        id: id(1),
        title: "Reach",
        instructions: "Reach the cup.",
        dueAt: "2026-12-10T12:00:00.000Z",
        status: "approved",
        latestSubmissionId: id(7),
      },
      {
        id: id(2),
        title: "Avoid the box",
        instructions: "",
        dueAt: "2026-12-03T12:00:00.000Z",
        status: "returned",
        latestSubmissionId: id(8),
      },
      {
        id: id(3),
        title: "Pick and place",
        instructions: "",
        dueAt: "2026-12-20T12:00:00.000Z",
        status: "not-started",
        latestSubmissionId: null,
      },
    ],
    roster: [],
    arms: [],
    plans: [
      { planId: id(4), projectId: id(5), version: 1, label: "Robot Motion I / Reach · version 1", verdict: "pass" },
      { planId: id(4), projectId: id(5), version: 2, label: "Robot Motion I / Reach · version 2", verdict: "fault" },
    ],
  };
}

const table = () => screen.getByRole("table", { name: "Assignments" });
const titles = () =>
  screen
    .getAllByTestId("assignment-row")
    .map((tr) => within(tr).getAllByRole("cell")[0].querySelector("p")!.textContent);

describe("course page assignments table", () => {
  it("lists a student's assignments soonest due first, each row marked, with its state in the one wording", () => {
    render(<CourseView {...props("student")} />, { wrapper: Wrap });
    expect(titles()).toEqual(["Avoid the box", "Reach", "Pick and place"]);
    expect(within(table()).getByRole("columnheader", { name: /Due/ }).getAttribute("aria-sort")).toBe("ascending");
    const rows = screen.getAllByTestId("assignment-row");
    expect(within(rows[0]).getByRole("link", { name: "open" }).getAttribute("href")).toBe(`/reviews/${id(8)}`);
    expect(rows[0].textContent).toContain(submissionStatusWords.returned);
    expect(rows[1].textContent).toContain(submissionStatusWords.approved);
    expect(rows[2].textContent).toContain("Not started");
    // submitting is offered where the state allows it: not for approved work
    expect((within(rows[0]).getByRole("button", { name: "Submit" }) as HTMLButtonElement).disabled).toBe(false);
    expect((within(rows[1]).getByRole("button", { name: "Submit" }) as HTMLButtonElement).disabled).toBe(true);
  });

  it("sorts by a clicked header: due date descending, title, and status in the order of what is left to do", () => {
    render(<CourseView {...props("student")} />, { wrapper: Wrap });
    fireEvent.click(within(table()).getByRole("button", { name: /Due/ }));
    expect(titles()).toEqual(["Pick and place", "Reach", "Avoid the box"]);
    fireEvent.click(within(table()).getByRole("button", { name: /Assignment/ }));
    expect(titles()).toEqual(["Avoid the box", "Pick and place", "Reach"]);
    fireEvent.click(within(table()).getByRole("button", { name: /Status/ }));
    expect(titles()).toEqual(["Pick and place", "Avoid the box", "Reach"]);
  });

  it("keeps a row's chosen plan version when the page's data is reloaded (its submit form is not remounted)", () => {
    const { rerender } = render(<CourseView {...props("student")} />, { wrapper: Wrap });
    const choice = () =>
      within(screen.getAllByTestId("assignment-row")[0]).getByRole("combobox", {
        name: "Plan version",
      }) as HTMLSelectElement;
    fireEvent.change(choice(), { target: { value: `${id(4)}:2` } });
    expect(choice().value).toBe(`${id(4)}:2`);
    // what router.refresh() hands the page: equal data in new objects
    rerender(<CourseView {...structuredClone(props("student"))} />);
    expect(choice().value).toBe(`${id(4)}:2`);
  });

  it("gives an instructor a link to each assignment's submissions and no status or submit column", () => {
    render(<CourseView {...props("instructor")} />, { wrapper: Wrap });
    const headers = within(table())
      .getAllByRole("columnheader")
      .map((th) => th.textContent?.replace(/[▲▼↕]/g, "").trim());
    expect(headers).toEqual(["Assignment", "Due", "Review"]);
    const rows = screen.getAllByTestId("assignment-row");
    expect(rows).toHaveLength(3);
    expect(within(rows[0]).getByRole("link", { name: "Submissions" }).getAttribute("href")).toBe(
      `/reviews?assignmentId=${id(2)}`,
    );
  });
});
