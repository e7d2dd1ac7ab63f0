// @vitest-environment happy-dom
import { act, cleanup, fireEvent, render, screen } from "@testing-library/react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { AppRouterContext } from "next/dist/shared/lib/app-router-context.shared-runtime";
import type { ReactNode } from "react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { SignUpForm } from "@/app/(site)/sign-up/sign-up-form";
import { CourseView, type CourseViewProps } from "@/components/courses/course-view";
import { CoursesHome } from "@/components/courses/courses-home";
import { formatPath } from "@/kinematics";
import { signUpSchema } from "@/lib/shared/schemas/auth";
import { createCourseSchema, inviteSchema } from "@/lib/shared/schemas/courses";

// The forms use the API's own zod schemas, so a field refused in the browser reads exactly as the
// API's problem list would put it (paths as lib/server/route.ts formats them). No outside source:
// these pin the project's own wording rules (DEVELOPERS.md, "field messages read after the field's name").

/** The API's problem for one field of a refused body, built the way lib/server/route.ts builds it. */
function apiMessage(
  schema: {
    safeParse: (v: unknown) => { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } };
  },
  body: unknown,
  path: string,
): string {
  const parsed = schema.safeParse(body);
  if (parsed.success) throw new Error("expected the body to be refused");
  const issue = parsed.error!.issues.find((i) => formatPath(i.path, "(body)") === path);
  if (!issue) throw new Error(`no problem at ${path}`);
  return issue.message;
}

/** The error text an input points at with aria-describedby (its last id is the error). */
function errorUnder(input: HTMLElement): string | null | undefined {
  const ids = input.getAttribute("aria-describedby")?.split(" ") ?? [];
  return ids.length ? document.getElementById(ids.at(-1)!)?.textContent : null;
}

const pushes: string[] = [];
const router = {
  push: (href: string) => void pushes.push(href),
  replace: (href: string) => void pushes.push(href),
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

let fetchCalls = 0;
beforeEach(() => {
  fetchCalls = 0;
  pushes.length = 0;
  // Counts requests only; nothing answers them, so a test that reaches the network fails.
  vi.spyOn(globalThis, "fetch").mockImplementation(() => {
    fetchCalls++;
    return Promise.reject(new Error("no network in this test"));
  });
});
afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

describe("forms through react-hook-form and the API's schemas", () => {
  it("sign-up puts the API's words for a bad e-mail and a short password under those fields and sends nothing", async () => {
    render(<SignUpForm />, { wrapper: Wrap });
    fireEvent.input(screen.getByLabelText("Name"), { target: { value: "Rosa Example" } });
    fireEvent.input(screen.getByLabelText("E-mail"), { target: { value: "not-an-address" } });
    fireEvent.input(screen.getByLabelText("Password"), { target: { value: "short" } });
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "Create account" })));
    const body = { name: "Rosa Example", email: "not-an-address", password: "short", siteRole: "student" };
    expect(errorUnder(screen.getByLabelText("E-mail"))).toBe(`E-mail ${apiMessage(signUpSchema, body, "email")}.`);
    expect(errorUnder(screen.getByLabelText("Password"))).toBe(
      `The password ${apiMessage(signUpSchema, body, "password")}.`,
    );
    expect(screen.getByLabelText("E-mail").getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByLabelText("Name").getAttribute("aria-invalid")).toBe("false");
    expect(fetchCalls).toBe(0);
  });

  it("new course: a speed limit of 150 % is refused under its own field in the API's words, not dropped", async () => {
    render(<CoursesHome courses={[]} canCreate arms={[]} />, { wrapper: Wrap });
    fireEvent.input(screen.getByLabelText("Title"), { target: { value: "Robot Motion I" } });
    fireEvent.input(screen.getByLabelText("Term"), { target: { value: "Autumn" } });
    const speed = screen.getByLabelText(/^Speed limit for submissions/);
    fireEvent.input(speed, { target: { value: "150" } });
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "Create course" })));
    const message = apiMessage(
      createCourseSchema,
      { title: "Robot Motion I", term: "Autumn", limits: { speedPercent: 150 } },
      "limits.speedPercent",
    );
    expect(message).toMatch(/at most 100/);
    expect(errorUnder(speed)).toBe(`The speed limit ${message}.`);
    expect(fetchCalls).toBe(0);
  });

  it("new course: an empty speed limit means the arm's own limits and is not an error", async () => {
    render(<CoursesHome courses={[]} canCreate arms={[]} />, { wrapper: Wrap });
    fireEvent.input(screen.getByLabelText("Title"), { target: { value: "Robot Motion I" } });
    fireEvent.input(screen.getByLabelText("Term"), { target: { value: "Autumn" } });
    const speed = screen.getByLabelText(/^Speed limit for submissions/);
    fireEvent.input(speed, { target: { value: "" } });
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "Create course" })));
    expect(speed.getAttribute("aria-invalid")).toBe("false");
    // The form is valid, so it is sent (and fails here only because this test has no network).
    expect(fetchCalls).toBe(1);
    expect(await screen.findByRole("alert")).toBeTruthy();
  });

  it("invitations: a bad address is named by its place in the list and its text, in the API's words", async () => {
    const props: CourseViewProps = {
      course: {
        id: "c0ffee00-0000-4000-8000-000000000001",
        title: "Robot Motion I",
        term: "Autumn",
        role: "instructor",
        joinCode: "ABCD1234",
        inviteUrl: "http://127.0.0.1/courses/join?code=ABCD1234",
      },
      // An instructor who manages the course but sets no assignments here: only the invitation form shows.
      can: {
        canManage: true,
        canSeeJoinCode: true,
        canReadRoster: false,
        canManageRoster: false,
        canSetAssignments: false,
        canSubmit: false,
        canReadAllSubmissions: true,
        canReview: false,
        canExportGrades: false,
      },
      assignments: [],
      roster: [],
      arms: [],
      plans: [],
    };
    render(<CourseView {...props} />, { wrapper: Wrap });
    const box = screen.getByLabelText("Addresses");
    fireEvent.input(box, { target: { value: "ana@example.com, not-an-address" } });
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "Send invitations" })));
    const message = apiMessage(inviteSchema, { emails: ["ana@example.com", "not-an-address"] }, "emails[1]");
    expect(errorUnder(box)).toBe(`Address 2 (not-an-address) ${message}.`);
    expect(fetchCalls).toBe(0);
  });
});
