/**
 * A review queue longer than one page, in Chromium against the production server: the page comes
 * with the first 200 submissions, the browser loads the rest through the API until the last page,
 * and only then stops saying how many are shown; the search then finds a submission of the last
 * page. When a later page cannot be fetched the page says how many it shows and that more exist,
 * and "Try again" carries on. Screenshots: .data/test/screenshots/review-queue-*.png.
 */
import bcrypt from "bcryptjs";
import { randomUUID } from "node:crypto";
import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { db } from "@/db";
import { demoArms } from "@/db/demo";
import { createAssignment, createCourse } from "@/db/queries/courses";
import { createUser } from "@/db/queries/users";
import { armRevisions, users } from "@/db/schema";
import { courses, submissions } from "@/db/schema/courses";
import { openBrowser, screenshotDir, type BrowserSession } from "./browser";

const SUBMISSIONS = 230; // more than the page's first 200
const password = "queue-teacher-01";
const tag = randomUUID().slice(0, 8);
const teacherEmail = `queue-teacher-${tag}@example.com`;
let courseId = "";
const userIds: string[] = [];

const name = (i: number) => `Queue student ${String(i).padStart(3, "0")}`;

beforeAll(async () => {
  const teacher = await createUser({
    email: teacherEmail,
    name: "Queue teacher",
    siteRole: "instructor",
    passwordHash: await bcrypt.hash(password, 4),
  });
  if (!teacher) throw new Error("teacher not created");
  userIds.push(teacher.id);
  const course = await createCourse({ userId: teacher.id, title: `Long queue ${tag}`, term: "Autumn" });
  courseId = course.id;
  const [revision] = await db
    .select({ id: armRevisions.id })
    .from(armRevisions)
    .where(and(eq(armRevisions.armId, demoArms[0].id), eq(armRevisions.revision, 1)));
  const assignment = await createAssignment({
    courseId,
    userId: teacher.id,
    title: "Base sweep",
    instructions: "",
    dueAt: new Date("2026-12-20T12:00:00Z"),
    requiredArmRevisionId: revision.id,
    poseTolerance: 0.001,
  });
  if (!assignment) throw new Error("assignment not created");
  const students = await db
    .insert(users)
    .values(
      Array.from({ length: SUBMISSIONS }, (_, i) => ({
        email: `queue-student-${tag}-${i + 1}@example.com`,
        name: name(i + 1),
        siteRole: "student" as const,
        passwordHash: "not a password hash: these accounts never sign in",
      })),
    )
    .returning({ id: users.id });
  userIds.push(...students.map((s) => s.id));
  // Student 001 waited longest; student 230 submitted last, so it is on the last page.
  await db.insert(submissions).values(
    students.map((s, i) => ({
      assignmentId: assignment.id,
      studentId: s.id,
      planVersionNumber: 1,
      document: {},
      armRevisionId: revision.id,
      report: { verdict: "pass", findings: [] },
      verdict: "pass" as const,
      late: false,
      submittedAt: new Date(Date.UTC(2026, 11, 1, 8, 0) + i * 60_000),
    })),
  );
});

afterAll(async () => {
  if (courseId) await db.delete(courses).where(eq(courses.id, courseId));
  if (userIds.length) await db.delete(users).where(inArray(users.id, userIds));
});

async function signIn(page: Page) {
  await page.goto("/sign-in?callbackUrl=%2Freviews");
  await page.getByLabel("E-mail").fill(teacherEmail);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL(/\/reviews$/);
}

describe("a review queue longer than one page", () => {
  let s: BrowserSession;
  beforeAll(async () => {
    s = await openBrowser();
    await s.page.setViewportSize({ width: 1440, height: 900 });
  });
  afterAll(async () => {
    await s?.close();
  });

  it("loads every page, then finds a submission of the last one by search", async () => {
    const pagesAsked: string[] = [];
    s.page.on("request", (r) => {
      if (/\/api\/v1\/reviews\?.*cursor=/.test(r.url())) pagesAsked.push(r.url());
    });
    await signIn(s.page);
    await s.page.getByRole("table", { name: "Review queue" }).waitFor();
    // the line saying more exist goes once the last page is in
    await s.page.getByTestId("queue-progress").waitFor({ state: "detached", timeout: 30_000 });
    // 200 came with the page; the other 30 in one more page through the API
    expect(pagesAsked).toHaveLength(1);
    expect(new URL(pagesAsked[0]).searchParams.get("limit")).toBe("200");
    const firstRow = s.page.getByTestId("queue-row").first();
    expect(await firstRow.textContent()).toContain(name(1));
    await s.page.getByRole("searchbox", { name: "Search the queue" }).fill(name(SUBMISSIONS));
    await expect.poll(() => s.page.getByTestId("queue-row").count()).toBe(1);
    expect(await s.page.getByTestId("queue-row").first().textContent()).toContain(name(SUBMISSIONS));
    await s.page.getByRole("searchbox", { name: "Search the queue" }).fill("");
    await s.page.screenshot({ path: `${screenshotDir}/review-queue-long.png` });
    expect(s.errors).toEqual([]);
  });

  it("says how many are shown when a later page cannot be fetched, and carries on when asked", async () => {
    const page = await s.context.newPage();
    await page.setViewportSize({ width: 1440, height: 900 });
    // the browser's own request for the next page fails on the way (the server is not touched)
    await page.route("**/api/v1/reviews?*", (route) => route.abort("connectionfailed"));
    await page.goto("/reviews");
    const progress = page.getByTestId("queue-progress");
    await progress.getByText("could not be loaded").waitFor();
    expect(await progress.textContent()).toContain("Showing 200 submissions; the queue has more.");
    await page.screenshot({ path: `${screenshotDir}/review-queue-cut.png` });
    await page.unroute("**/api/v1/reviews?*");
    await progress.getByRole("button", { name: "Try again" }).click();
    await progress.waitFor({ state: "detached", timeout: 30_000 });
    await page.getByRole("searchbox", { name: "Search the queue" }).fill(name(SUBMISSIONS));
    await expect.poll(() => page.getByTestId("queue-row").count()).toBe(1);
    await page.close();
  });
});
