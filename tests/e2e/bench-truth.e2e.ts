/**
 * The bench and the review walked as a student and an instructor would, in Chromium against the
 * production server (issue 11 items 3, 6, 7, 8, 9, 10; issue 15 item 10): every verdict, fix button,
 * approval and notice the user sees must tell the truth. A screenshot is taken at each step
 * (.data/test/screenshots/bench-truth-*.png).
 *
 * The student is the demo's enrolled student (db/demo.ts); the test works on plans of its own in her
 * personal project, so the seeded plans stay as they are. Expectations about verdicts are read from
 * the engine itself (`check`), run here in Node on the same plan the bench gets.
 *
 * The mail fake and worker are those of `npm test` when it runs them; otherwise this test starts its
 * own, as tests/e2e/review.e2e.ts does.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoCourse, demoPeople, demoProjects } from "@/db/demo";
import armH from "@/kinematics/arm/presets/bench-arm-h.json";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { check, parsePlan, type Plan } from "@/kinematics";
import { tightenArm } from "@/lib/shared/courses/rules";
import { readFakeMailbox, startFakeSmtp, type FakeMessage, type FakeSmtp } from "@/scripts/fakes/smtp";
import { baseUrl, openBrowser, screenshotDir, type BrowserSession } from "./browser";

const student = demoPeople.find((p) => p.email === "aiko.marsh@example.com")!;
const instructor = demoPeople.find((p) => p.role === "instructor")!;
const sandbox = demoProjects.find((p) => p.createdBy === student.id && p.kind === "personal")!;
const lightArmId = "00000000-0000-4000-8000-000000000201";
const reachAssignment = demoCourse.assignments.find((a) => a.title === "Reach without faults")!;
const reach = reachAssignment.requiredGoals![0];
const home = [0, 0, 0, 0, 0, 0, 0.01];
const stamp = Date.now().toString(36);
const mailDir = process.env.MAIL_FAKE_DIR ?? mkdtempSync(path.join(tmpdir(), "jp-e2e-mail-"));
const smtpPort = Number(process.env.SMTP_PORT ?? 54341);
/** Words no page or e-mail may say: the product never permits running anything. */
const permitsRunning = /may be run|can be run|cleared to run|safe to run|allowed to run|permitted to run|ready to run/i;

let s: BrowserSession;
let instructorContext: BrowserContext;
let teacher: Page;
let fake: FakeSmtp | undefined;
let worker: ChildProcess | undefined;
const pageErrors: string[] = [];
/** Dialogs the browser showed the student (a reload with unsaved edits asks first); each is accepted. */
const dialogs: string[] = [];
const startedAt = Date.now();

const shot = (page: Page, name: string) =>
  page.screenshot({ path: `${screenshotDir}/bench-truth-${name}.png`, fullPage: false });

function planOf(arm: unknown, start: number[], moves: { goal: number[]; duration: number; shape?: string }[]): Plan {
  const parsed = parsePlan({
    format: "jointproof.plan",
    version: 1,
    arm,
    start,
    moves: moves.map((m) => ({ shape: "cubic", ...m })),
  });
  if (!parsed.ok) throw new Error(parsed.problems.map((p) => p.message).join("; "));
  return parsed.value;
}

async function signIn(page: Page, who: { email: string; password: string }, next: string) {
  await page.goto(`/sign-in?callbackUrl=${encodeURIComponent(next)}`);
  await page.getByLabel("E-mail").fill(who.email);
  await page.getByLabel("Password").fill(who.password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL(`**${next}`);
}

async function waitForMail(match: (m: FakeMessage) => boolean, timeoutMs = 30_000): Promise<FakeMessage> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const found = (await readFakeMailbox(mailDir)).find(match);
    if (found) return found;
    if (Date.now() > until) throw new Error(`no matching e-mail in ${mailDir} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** Creates a plan in the student's project through the API and saves `plan` as its version 1 (unless null). */
async function createPlan(page: Page, name: string, armId: string, plan: Plan | null): Promise<string> {
  const created = await page.request.post(`/api/v1/projects/${sandbox.id}/plans`, {
    data: { name, armId },
    headers: { Origin: baseUrl },
  });
  expect(created.status()).toBe(201);
  const planId = ((await created.json()) as { plan: { id: string } }).plan.id;
  if (plan) {
    const saved = await page.request.post(`/api/v1/plans/${planId}/versions`, {
      data: { baseVersion: 0, document: plan, note: "browser test" },
      headers: { Origin: baseUrl },
    });
    expect(saved.status()).toBe(201);
  }
  return planId;
}

/** Opens a plan's bench and waits until the full check (arm model too) has answered. */
async function openBench(page: Page, planId: string, query = "") {
  await page.goto(`/projects/${sandbox.id}/plans/${planId}${query}`);
  await page.getByTestId("plan-name").waitFor();
  await page.getByTestId("check-status").filter({ hasText: "Full check in a worker" }).waitFor({ timeout: 60_000 });
  await page.getByTestId("check-status").filter({ hasNotText: "checking the fixes" }).waitFor({ timeout: 60_000 });
}

const headerVerdict = (page: Page) =>
  page.getByTestId("plan-verdict").locator("[data-verdict]").getAttribute("data-verdict");
const faultButtons = (page: Page) =>
  page.getByRole("complementary", { name: "Findings" }).getByRole("button", { name: /^Fault:/ });

beforeAll(async () => {
  try {
    fake = await startFakeSmtp({ port: smtpPort, dir: mailDir });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "EADDRINUSE") throw err;
  }
  worker = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", "lib/server/mail/run-worker.ts"], {
    env: { ...process.env, SMTP_HOST: "127.0.0.1", SMTP_PORT: String(smtpPort), MAIL_RETRY_DELAY_S: "1" },
    stdio: "ignore",
  });
  s = await openBrowser();
  s.page.on("pageerror", (e) => pageErrors.push(`student: ${e.message}`));
  s.page.on("dialog", (d) => {
    dialogs.push(d.type());
    void d.accept();
  });
  instructorContext = await s.browser.newContext({ baseURL: baseUrl, viewport: { width: 1280, height: 800 } });
  teacher = await instructorContext.newPage();
  teacher.on("pageerror", (e) => pageErrors.push(`instructor: ${e.message}`));
  await signIn(s.page, student, "/projects");
});

afterAll(async () => {
  await s?.close();
  if (worker && worker.exitCode === null) {
    const exited = new Promise((r) => worker!.once("exit", r));
    worker.kill("SIGTERM");
    await Promise.race([exited, new Promise((r) => setTimeout(r, 5_000))]);
  }
  await fake?.stop();
});

describe("the bench tells the truth", () => {
  // 0.9 s for the reach: within the arm's own speed limits, over the course's 70% of maximum speed.
  const reachPlan = planOf(armL, home, [{ goal: reach, duration: 0.9, shape: "quintic" }]);
  let reachId = "";

  it("a plan for an assignment is checked against the course's limits and lists the required poses (item 3)", async () => {
    const page = s.page;
    const own = check(reachPlan);
    const course = check({ ...reachPlan, arm: tightenArm(reachPlan.arm, demoCourse.limits, null) });
    expect(own.verdict).not.toBe("fault");
    expect(course.verdict).toBe("fault");
    reachId = await createPlan(page, `Reach at 0.9 s ${stamp}`, lightArmId, reachPlan);

    await openBench(page, reachId);
    expect(await headerVerdict(page)).toBe(own.verdict);
    expect(await page.getByTestId("assignment-rules").count()).toBe(0);
    await shot(page, "1-own-limits");

    await openBench(page, reachId, `?assignment=${reachAssignment.id}`);
    const rules = page.getByTestId("assignment-rules");
    await expect(rules.getByRole("list", { name: "Limits the check uses" }).textContent()).resolves.toContain(
      "course limit: 70% of maximum speed",
    );
    await expect(rules.textContent()).resolves.toMatch(
      /Required poses, within ±[\d.]+° \([\d.]+ rad\) on revolute joints/,
    );
    const goal = rules.getByRole("list", { name: "Required poses" }).getByRole("listitem");
    await expect(goal.textContent()).resolves.toBe("Goal pose 1 (in order):met");
    expect(await goal.getAttribute("data-met")).toBe("true");
    // the check uses the course's limits: a fault, never a Pass
    expect(await headerVerdict(page)).toBe("fault");
    expect(await page.getByTestId("plan-verdict").textContent()).not.toMatch(/Pass/);
    expect(await faultButtons(page).count()).toBe(course.findings.filter((f) => f.severity === "fault").length);
    await shot(page, "2-course-limits");

    // moving the goal away: the required pose is no longer met
    await page.getByTestId("move-row-0").click({ position: { x: 20, y: 10 } });
    await page.getByLabel("Move 1 duration (s)").fill("2");
    await page.getByLabel("Move 1 duration (s)").press("Tab");
    const base = page.getByRole("textbox", { name: /^base \(/ });
    await base.fill("10");
    await base.press("Tab");
    await expect(goal.getAttribute("data-met")).resolves.toBe("false");
    await expect(goal.textContent()).resolves.toBe("Goal pose 1 (in order):not met yet");
    await shot(page, "3-pose-not-met");
  });

  it("an effort fault: this move only never adds a fault; the whole plan by one factor is offered beside it (item 6)", async () => {
    const page = s.page;
    // the gripper arm's shoulder raised quickly: effort and acceleration faults that a longer move clears
    const plan = planOf(
      armH,
      [0, 0, 0, 0, 0, 0, 0.02],
      [
        { goal: [0, 0.6, 0.3, 0, 0, 0, 0.02], duration: 0.5 },
        { goal: [0.3, 0.6, 0.3, 0, 0, 0, 0.02], duration: 3 },
      ],
    );
    const report = check(plan);
    const faultsBefore = report.findings.filter((f) => f.severity === "fault").length;
    expect(report.findings.some((f) => f.kind === "effort-over" && f.severity === "fault" && f.move === 0)).toBe(true);
    expect(report.moves[0].minSafeDuration).not.toBeNull();
    const id = await createPlan(page, `Shoulder raise ${stamp}`, "00000000-0000-4000-8000-000000000202", plan);
    await openBench(page, id);
    expect(await faultButtons(page).count()).toBe(faultsBefore);

    const effort = page
      .getByRole("listitem")
      .filter({ has: page.getByRole("button", { name: /^Fault: Effort over limit, shoulder, move 1\./ }) });
    const thisMove = effort.getByRole("button", { name: /^This move only: Move 1 to [\d.]+ s$/ });
    const wholePlan = effort.getByRole("button", { name: /^Whole plan, one factor: durations ×[\d.]+$/ });
    await thisMove.waitFor();
    await wholePlan.waitFor();
    const offered = Number((await thisMove.textContent())!.match(/to ([\d.]+) s/)![1]);
    expect(offered).toBeGreaterThan(0.5);
    await shot(page, "4-effort-fixes");

    await thisMove.click();
    await expect(page.getByLabel("Move 1 duration (s)").inputValue()).resolves.toBe(offered.toFixed(3));
    await page.getByTestId("check-status").filter({ hasText: "Full check in a worker" }).waitFor();
    await page.getByTestId("check-status").filter({ hasNotText: "checking the fixes" }).waitFor();
    const after = await faultButtons(page).count();
    expect(after).toBeLessThan(faultsBefore);
    expect(after).toBe(0);
    // Move 2 passed before and was not stretched by the fix of Move 1
    await expect(page.getByLabel("Move 2 duration (s)").inputValue()).resolves.toMatch(/^3(\.0*)?$/);
    await shot(page, "5-effort-fixed");
  });

  it("an effort fault no duration fixes offers no timing fix and says what would (item 6)", async () => {
    const page = s.page;
    const weak = {
      ...armH,
      name: `${armH.name} weak shoulder ${stamp}`,
      joints: armH.joints.map((j, k) => (k === 1 ? { ...j, maxEffort: 8 } : j)),
    };
    const arm = await page.request.post(`/api/v1/projects/${sandbox.id}/arms`, {
      data: { name: weak.name, description: weak, note: "browser test: shoulder limit below the gravity load" },
      headers: { Origin: baseUrl },
    });
    expect(arm.status()).toBe(201);
    const armId = ((await arm.json()) as { arm: { id: string } }).arm.id;
    const plan = planOf(weak, [0, 0, 0, 0, 0, 0, 0.02], [{ goal: [0, 0.6, 0.3, 0, 0, 0, 0.02], duration: 0.5 }]);
    const report = check(plan);
    expect(report.moves[0].minSafeDuration).toBeNull();
    const id = await createPlan(page, `Shoulder out, weak ${stamp}`, armId, plan);
    await openBench(page, id);

    const findings = page.getByRole("complementary", { name: "Findings" });
    expect(await findings.getByRole("button", { name: /^This move only|^Whole plan, one factor/ }).count()).toBe(0);
    expect(await page.getByRole("button", { name: /^Scale to pass/ }).count()).toBe(0);
    expect(await page.getByRole("button", { name: /shortest safe duration/ }).count()).toBe(0);
    const gravity = findings
      .getByRole("listitem")
      .filter({ has: page.getByRole("button", { name: /^Fault: Effort over limit, shoulder, move 1\./ }) });
    await expect(gravity.getByTestId("finding-remedy").textContent()).resolves.toMatch(
      /^No duration fixes this: gravity alone holds shoulder above its effort limit in Move 1\. Choose a different pose or path, a lighter payload or the other tool\.$/,
    );
    // the elbow's effort at 0.5 s is not gravity's: a longer move clears it, and it says so
    const elbow = findings
      .getByRole("listitem")
      .filter({ has: page.getByRole("button", { name: /^Fault: Effort over limit, elbow, move 1\./ }) });
    if ((await elbow.count()) > 0)
      await expect(elbow.getByTestId("finding-remedy").textContent()).resolves.toMatch(
        /^A longer duration clears this/,
      );
    await expect(page.getByTestId("no-scale").textContent()).resolves.toMatch(/^1 fault no duration fixes/);
    await shot(page, "6-effort-gravity");
  });

  it("an instant move's advice is one message: a duration (the shortest passing one) or a smaller step (item 7)", async () => {
    const page = s.page;
    const plan = planOf(armL, home, [{ goal: [1.2, 0, 0, 0, 0, 0, 0.01], duration: 0 }]);
    const report = check(plan);
    const safe = Math.ceil(report.moves[0].minSafeDuration! * 1000 - 1e-9) / 1000;
    const id = await createPlan(page, `Instant swing ${stamp}`, lightArmId, plan);
    await openBench(page, id);
    const jump = page
      .getByRole("listitem")
      .filter({ has: page.getByRole("button", { name: /^Fault: Jump too far, base, move 1/ }) });
    const remedy = (await jump.getByTestId("finding-remedy").textContent())!;
    expect(remedy).toContain("one control period (1 ms at 1000 Hz)");
    expect(remedy).toContain(`shortest passing: ${safe.toFixed(3)} s`);
    expect(remedy).toContain("smaller step");
    expect(remedy).not.toMatch(/cannot be fixed by timing|No duration fixes/);
    const fix = jump.getByRole("button", { name: /^This move only: / });
    await expect(fix.textContent()).resolves.toContain(`to ${safe.toFixed(3)} s`);
    const plots = (await page.getByTestId("plots").textContent()) ?? "";
    expect(plots).not.toContain("No motion yet");
    expect(plots).toContain("instant move");
    await expect(page.getByTestId("no-scale").textContent()).resolves.toMatch(
      /^An instant move has no duration to scale/,
    );
    await shot(page, "7-instant");
    await fix.click();
    await page.getByTestId("check-status").filter({ hasText: "Full check in a worker" }).waitFor();
    await expect(page.getByLabel("Move 1 duration (s)").inputValue()).resolves.toBe(safe.toFixed(3));
    expect(await headerVerdict(page)).not.toBe("fault");
    await shot(page, "8-instant-fixed");
  });

  it("an empty plan shows No moves yet and no verdict chip (item 8)", async () => {
    const page = s.page;
    const id = await createPlan(page, `Empty ${stamp}`, lightArmId, null);
    await page.goto(`/projects/${sandbox.id}/plans/${id}`);
    await page.getByTestId("plan-name").waitFor();
    await expect(page.getByTestId("plan-verdict").textContent()).resolves.toBe("No moves yet");
    expect(await page.getByTestId("plan-verdict").locator("[data-verdict]").count()).toBe(0);
    expect(await page.getByRole("complementary", { name: "Findings" }).locator("[data-verdict]").count()).toBe(0);
    await expect(page.getByTestId("findings-summary").textContent()).resolves.toMatch(/^No moves yet/);
    await shot(page, "9-empty");
  });

  it("unsaved edits: an in-app link and a reload warn, and the draft is offered back on reopening (item 10)", async () => {
    const page = s.page;
    await openBench(page, reachId);
    await page.getByLabel("Move 1 duration (s)").fill("1.75");
    await page.getByLabel("Move 1 duration (s)").press("Tab");
    await expect(page.getByTestId("save-state").textContent()).resolves.toBe("Unsaved changes");

    await page.getByRole("link", { name: "Courses", exact: true }).click();
    const leave = page.getByRole("dialog", { name: "Leave with unsaved changes?" });
    await leave.waitFor();
    await shot(page, "10-leave-dialog");
    await leave.getByRole("button", { name: "Stay on the bench" }).click();
    await leave.waitFor({ state: "detached" });
    expect(new URL(page.url()).pathname).toBe(`/projects/${sandbox.id}/plans/${reachId}`);

    // a reload asks first (the browser's own prompt, from beforeunload); the test accepts it
    await page.waitForTimeout(600); // the draft is written within 400 ms of an edit
    const before = dialogs.length;
    await page.reload();
    expect(dialogs.slice(before)).toEqual(["beforeunload"]);
    await page.getByTestId("plan-name").waitFor();
    const offer = page.getByTestId("draft-offer");
    await offer.waitFor();
    await expect(offer.textContent()).resolves.toMatch(/Unsaved edits to version 1 from .+ are kept in this browser\./);
    await expect(page.getByLabel("Move 1 duration (s)").inputValue()).resolves.toBe("0.900");
    await shot(page, "11-draft-offer");
    await offer.getByRole("button", { name: "Restore the edits" }).click();
    await expect(page.getByLabel("Move 1 duration (s)").inputValue()).resolves.toBe("1.750");
    await expect(page.getByTestId("save-state").textContent()).resolves.toBe("Unsaved changes");
    await shot(page, "12-draft-restored");
  });

  it("a 503 from the API while the database is down shows a reconnecting notice, not an error page (issue 15 item 10)", async () => {
    const page = s.page;
    // page.route is a test double of the network (the answer the server gives while its database is
    // down, lib/server/route.ts), not of our code: the bench's own data layer reads it.
    const unavailable = {
      status: 503,
      headers: { "Content-Type": "application/json", "Retry-After": "1" },
      body: JSON.stringify({
        error: {
          code: "unavailable:database",
          message:
            "The database cannot be reached right now, so this request may not have been completed. Try again in 5 seconds; if you were saving, reload first to see whether the save arrived.",
          issues: [],
          retryAfterS: 1,
        },
      }),
    };
    const down = (route: import("playwright-core").Route) => route.fulfill(unavailable);
    await page.route("**/api/v1/plans/*/versions", down);
    await page.route("**/api/health", down);
    await page.getByRole("button", { name: "Save version" }).click();
    await page.getByRole("button", { name: "Save", exact: true }).click();
    const notice = page.getByTestId("reconnecting");
    await notice.waitFor();
    await expect(notice.textContent()).resolves.toMatch(/^Reconnecting: the server cannot reach its database/);
    await expect(page.getByRole("dialog", { name: /^Save version/ }).textContent()).resolves.toContain(
      "The version was not saved",
    );
    // the bench is still there and still checks: no error page
    await page.getByTestId("plan-name").waitFor();
    expect(await page.getByTestId("plan-verdict").locator("[data-verdict]").count()).toBe(1);
    await shot(page, "13-reconnecting");

    await page.unroute("**/api/health", down);
    await page.unroute("**/api/v1/plans/*/versions", down);
    await notice.waitFor({ state: "detached", timeout: 10_000 });
    await page.getByRole("button", { name: "Save", exact: true }).click();
    await page.getByTestId("save-state").filter({ hasText: "Saved as version 2" }).waitFor();
    await shot(page, "14-reconnected-saved");
  });

  it("approving a faulting submission asks for a reason the student then sees; nothing says the plan may run (item 9)", async () => {
    const page = s.page;
    const submitted = await page.request.post(`/api/v1/assignments/${reachAssignment.id}/submissions`, {
      data: { planId: reachId, versionNumber: 1 },
      headers: { Origin: baseUrl },
    });
    expect(submitted.status()).toBe(201);
    const submission = (await submitted.json()) as { submission: { id: string }; report: { verdict: string } };
    expect(submission.report.verdict).toBe("fault");
    const submissionId = submission.submission.id;

    await signIn(teacher, instructor, "/reviews");
    const rows = teacher.getByTestId("queue-row");
    await rows.first().waitFor();
    await expect(teacher.getByTestId("queue-order").textContent()).resolves.toMatch(/^Waiting for review first/);
    const statuses = await rows.locator("td:last-child").allTextContents();
    const firstOther = statuses.findIndex((t) => t !== "Waiting for review");
    if (firstOther >= 0) expect(statuses.slice(firstOther).every((t) => t !== "Waiting for review")).toBe(true);
    await shot(teacher, "15-queue");

    await teacher.goto(`/reviews/${submissionId}`);
    await teacher.getByTestId("plots").locator("svg").first().waitFor();
    const chip = (await teacher.locator("header [data-verdict]").first().textContent()) ?? "";
    const summary = (await teacher.getByTestId("findings-summary").textContent()) ?? "";
    const faults = Number(summary.match(/^(\d+) faults?/)![1]);
    expect(chip).toContain(`${faults} fault`);
    await teacher.getByRole("button", { name: "Approve despite faults…" }).click();
    const dialog = teacher.getByRole("dialog", { name: "Approve a plan whose check found faults?" });
    await dialog.waitFor();
    expect(await dialog.getByTestId("approval-faults").getByRole("listitem").count()).toBe(faults);
    const approve = dialog.getByRole("button", { name: "Approve with this reason" });
    expect(await approve.isDisabled()).toBe(true);
    const reason = `Accepted to discuss the course limit in class (${stamp}).`;
    await dialog.getByRole("textbox", { name: "Reason for approving (the student sees it)" }).fill(reason);
    await shot(teacher, "16-approve-dialog");
    await approve.click();
    await teacher.getByTestId("review-status").filter({ hasText: "Approved" }).waitFor();
    expect(await teacher.locator("main").textContent()).not.toMatch(permitsRunning);
    await shot(teacher, "17-approved");

    await page.goto(`/reviews/${submissionId}`);
    const shown = page.getByTestId("fault-approval-reason");
    await expect(shown.textContent()).resolves.toContain(`Reason given: ${reason}`);
    const text = (await page.locator("main").textContent()) ?? "";
    expect(text).not.toMatch(permitsRunning);
    expect(text).toContain("The faults are still in the plan");
    // the student's review page draws the arm too (the screenshot once showed an empty 3D view)
    await page.waitForSelector("[data-testid=stage] canvas");
    await shot(page, "18-student-sees-reason");

    const mail = await waitForMail(
      (m) =>
        m.to === student.email &&
        m.subject === `Approved: ${reachAssignment.title}` &&
        Date.parse(m.receivedAt) >= startedAt,
    );
    expect(mail.text).not.toMatch(permitsRunning);
    expect(mail.html).not.toMatch(permitsRunning);
    expect(pageErrors).toEqual([]);
  });
});
