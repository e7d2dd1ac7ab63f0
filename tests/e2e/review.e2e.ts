/**
 * The course review flow through the pages, in Chromium against the production server: the demo
 * instructor creates a course and an assignment, the demo student joins with the code and submits,
 * the instructor's e-mail arrives (the local SMTP fake), the instructor comments and returns, the
 * student's e-mail arrives, the student resubmits, the instructor approves. Screenshots of the
 * review queue, the review page and the development mail page go to .data/test/screenshots.
 *
 * The SMTP fake and the mail worker are those of `npm test` when it runs them; otherwise this
 * test starts its own (the fake on SMTP_PORT, the worker as a child process — a second worker is
 * harmless, since each message is claimed once).
 */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext, Page } from "playwright-core";
import { readFakeMailbox, startFakeSmtp, type FakeMessage, type FakeSmtp } from "@/scripts/fakes/smtp";
import { baseUrl, openBrowser, screenshotDir, type BrowserSession } from "./browser";

const instructor = { email: "ines.varga@example.com", password: "bench-instructor-01" };
const student = { email: "tomas.reyes@example.com", password: "bench-student-01", name: "Tomas Reyes" };
const mailDir = process.env.MAIL_FAKE_DIR ?? mkdtempSync(path.join(tmpdir(), "jp-e2e-mail-"));
const smtpPort = Number(process.env.SMTP_PORT ?? 54341);

let s: BrowserSession;
let studentContext: BrowserContext;
let studentPage: Page;
let fake: FakeSmtp | undefined;
let worker: ChildProcess | undefined;
const pageErrors: string[] = [];

async function waitForMail(match: (m: FakeMessage) => boolean, timeoutMs = 30_000): Promise<FakeMessage> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const found = (await readFakeMailbox(mailDir)).find(match);
    if (found) return found;
    if (Date.now() > until) throw new Error(`no matching e-mail in ${mailDir} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

function linkIn(message: FakeMessage, pathPrefix: string): string {
  const url = message.text.match(/https?:\/\/\S+/g)?.find((u) => new URL(u).pathname.startsWith(pathPrefix));
  if (!url) throw new Error(`no ${pathPrefix} link in "${message.subject}"`);
  const u = new URL(url);
  return `${u.pathname}${u.search}`;
}

async function signIn(page: Page, who: { email: string; password: string }, next: string) {
  await page.goto(`/sign-in?callbackUrl=${encodeURIComponent(next)}`);
  await page.getByLabel("E-mail").fill(who.email);
  await page.getByLabel("Password").fill(who.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`**${next}`);
}

beforeAll(async () => {
  try {
    fake = await startFakeSmtp({ port: smtpPort, dir: mailDir });
  } catch (err) {
    // `npm test` already runs the fake on this port (and stores under MAIL_FAKE_DIR).
    if ((err as NodeJS.ErrnoException).code !== "EADDRINUSE") throw err;
  }
  // A plain node process (not a tsx wrapper), so the PID stopped below is the worker itself.
  worker = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", "lib/server/mail/run-worker.ts"], {
    env: { ...process.env, SMTP_HOST: "127.0.0.1", SMTP_PORT: String(smtpPort), MAIL_RETRY_DELAY_S: "1" },
    stdio: "ignore",
  });
  s = await openBrowser();
  s.page.on("pageerror", (e) => pageErrors.push(`instructor: ${e.message}`));
  studentContext = await s.browser.newContext({ baseURL: baseUrl, viewport: { width: 1280, height: 800 } });
  studentPage = await studentContext.newPage();
  studentPage.on("pageerror", (e) => pageErrors.push(`student: ${e.message}`));
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

describe("review flow in the browser", () => {
  it("goes from a new course to an approved resubmission, with each e-mail arriving", async () => {
    const page = s.page;
    const title = `Robot Motion I (${Date.now().toString(36)})`;

    // The instructor creates the course and an assignment on the light arm.
    await signIn(page, instructor, "/courses");
    await page.getByLabel("Title").fill(title);
    await page.getByLabel("Term").fill("Autumn");
    await page.getByRole("button", { name: "Create course" }).click();
    await page.waitForURL(/\/courses\/[0-9a-f-]{36}$/);
    const courseUrl = new URL(page.url()).pathname;
    const joinCode = ((await page.getByTestId("join-code").textContent()) ?? "").trim();
    expect(joinCode).toMatch(/^[A-Z0-9]{8}$/);
    await page.getByLabel("Title").fill("Reach without faults");
    await page.getByLabel("Due (UTC)").fill("2099-06-01T12:00");
    await page.getByLabel("Required arm").selectOption({ label: "Bench arm · guide handle · revision 1" });
    await page.getByRole("button", { name: "Set assignment" }).click();
    await page.getByTestId("assignment-row").filter({ hasText: "Reach without faults" }).waitFor();
    await page.screenshot({ path: `${screenshotDir}/course-instructor.png`, fullPage: true });

    // The student joins with the code and submits the 0.74 s reach: within the arm's limits, but a
    // fault at the course's 70% speed limit, which the server's re-check applies.
    await signIn(studentPage, student, "/courses");
    await studentPage.getByLabel("Join code").fill(joinCode);
    await studentPage.getByRole("button", { name: "Join", exact: true }).click();
    await studentPage.waitForURL(`**${courseUrl}`);
    const row = studentPage.getByTestId("assignment-row").filter({ hasText: "Reach without faults" });
    await row
      .getByLabel("Plan version")
      .selectOption({ label: "Robot Motion I / Fast reach, just long enough · version 2" });
    await row.getByRole("button", { name: "Submit" }).click();
    await expect(row.getByRole("status").textContent()).resolves.toContain("Fault");

    // Every e-mail names the course, whose title is new in each run: older messages never match.
    const received = await waitForMail(
      (m) =>
        m.to === instructor.email &&
        m.text.includes(title) &&
        m.subject.includes(`${student.name}, Reach without faults`) &&
        !m.subject.includes("attempt"),
    );
    const reviewPath = linkIn(received, "/reviews/");

    // The queue, then the review page from the e-mail's link.
    await page.goto("/reviews?status=submitted&sort=submittedAt&order=desc");
    const queueRow = page
      .getByTestId("queue-row")
      .filter({ hasText: student.name })
      .filter({ hasText: "Reach without faults" });
    await queueRow.first().waitFor();
    await page.screenshot({ path: `${screenshotDir}/review-queue.png`, fullPage: true });
    await page.goto(reviewPath);
    await expect(page.getByTestId("review-title").textContent()).resolves.toContain("Reach without faults");
    await page.getByTestId("plots").locator("svg").first().waitFor();
    // pin the comment half a second into the plan (the first move), so the student's click visibly moves the playhead
    await page.getByLabel("Time on the plan's timeline").evaluate((el: HTMLInputElement) => {
      Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")!.set!.call(el, "0.5");
      el.dispatchEvent(new Event("input", { bubbles: true }));
    });
    await page.getByText("Pin to move 1 at t = 0.500 s", { exact: false }).waitFor();
    await page
      .getByRole("textbox", { name: "Comment", exact: true })
      .fill("The base runs above 70% of its speed here; lengthen this move.");
    await page.getByRole("combobox", { name: "Joint", exact: true }).selectOption({ label: "base" });
    await page.getByRole("button", { name: "Add comment" }).click();
    await page.getByTestId("comments").getByText("lengthen this move").waitFor();
    await page.screenshot({ path: `${screenshotDir}/review-page.png` });

    // Approving this faulting submission first opens a dialog that lists the faults and asks for a
    // reason; without a reason the approval cannot be sent. The instructor cancels and returns it.
    await page.getByRole("button", { name: "Approve despite faults…" }).click();
    const dialog = page.getByRole("dialog", { name: "Approve a plan whose check found faults?" });
    await dialog.waitFor();
    // the severity, then the engine's message, which names the move and the joint itself (once)
    const faultLines = (await dialog.getByTestId("approval-faults").textContent()) ?? "";
    expect(faultLines).toMatch(/^Fault: Move 1, joint "base": /);
    expect(faultLines).not.toContain("Move 1 · ");
    expect(await dialog.getByRole("button", { name: "Approve with this reason" }).isDisabled()).toBe(true);
    await dialog
      .getByRole("textbox", { name: "Reason for approving (the student sees it)" })
      .fill("Accepted to discuss the speed fault in class.");
    expect(await dialog.getByRole("button", { name: "Approve with this reason" }).isDisabled()).toBe(false);
    await page.screenshot({ path: `${screenshotDir}/review-approve-faults-dialog.png` });
    await dialog.getByRole("button", { name: "Cancel" }).click();
    await dialog.waitFor({ state: "detached" });
    await expect(page.getByTestId("review-status").textContent()).resolves.toBe("Waiting for review");
    await page.getByRole("textbox", { name: "Summary for the student" }).fill("Slow the reach down and submit again.");
    await page.getByRole("button", { name: "Return with comments" }).click();
    await expect(
      page.getByTestId("review-status").filter({ hasText: "Returned with comments" }).waitFor(),
    ).resolves.toBeUndefined();

    // The student's e-mail arrives; its link opens the review with the pinned comment.
    const returned = await waitForMail(
      (m) =>
        m.to === student.email &&
        m.text.includes(title) &&
        m.subject === "Returned with comments: Reach without faults",
    );
    await studentPage.goto(linkIn(returned, "/reviews/"));
    await studentPage.getByTestId("comments").getByText("lengthen this move").click();
    await expect(studentPage.getByTestId("review-summary").textContent()).resolves.toContain("Slow the reach down");

    // The student's bench for the returned plan lists the comment; a click moves the playhead to its pin.
    await studentPage.goto("/projects");
    await studentPage.getByRole("link", { name: "Fast reach, just long enough", exact: true }).first().click();
    await studentPage.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
    const rail = studentPage.getByTestId("review-comments");
    await rail.getByText("Slow the reach down", { exact: false }).waitFor();
    await expect(studentPage.getByTestId("playhead-time").textContent()).resolves.toMatch(/^0\.000 \//);
    await rail.getByRole("button", { name: /lengthen this move/ }).click();
    await expect(studentPage.getByTestId("playhead-time").textContent()).resolves.toMatch(/^0\.500 \//);
    await studentPage.waitForTimeout(800);
    await studentPage.screenshot({ path: `${screenshotDir}/bench-review-comments.png` });

    // Resubmit a passing plan; the instructor approves it.
    await studentPage.goto(courseUrl);
    const again = studentPage.getByTestId("assignment-row").filter({ hasText: "Reach without faults" });
    await expect(again.textContent()).resolves.toContain("Returned with comments");
    await again.getByLabel("Plan version").selectOption({ label: "Robot Motion I / Gentle pose change · version 1" });
    await again.getByRole("button", { name: "Submit" }).click();
    await expect(again.getByRole("status").textContent()).resolves.toContain("attempt 2");

    const second = await waitForMail(
      (m) =>
        m.to === instructor.email && m.text.includes(title) && m.subject.includes("Reach without faults (attempt 2)"),
    );
    await page.goto(linkIn(second, "/reviews/"));
    await page.getByRole("button", { name: "Approve" }).click();
    await page.getByTestId("review-status").filter({ hasText: "Approved" }).waitFor();
    await waitForMail(
      (m) => m.to === student.email && m.text.includes(title) && m.subject === "Approved: Reach without faults",
    );

    // The development mail page is for a signed-in admin only (tests/integration/hardening/dev-mail.test.ts
    // reads it as the admin): the instructor signed in here gets a plain 404, not the mailbox.
    const dev = await page.goto("/dev/mail");
    expect(dev?.status()).toBe(404);
    expect(pageErrors).toEqual([]);
  });
});
