// Every page of the words-and-tables pass at 1440×900, screenshots under .data/test/screenshots/,
// and the behaviours they pin: the landing names every check, the API reference shows methods
// in plain monospace, a 404 of our own, the demo data's hand-guided names, TanStack tables that
// sort on a header click, and a server field error shown under its field.
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoCourse, demoPeople, demoPlans, demoProjects } from "@/db/demo";
import { baseUrl as baseURL, openBrowser, screenshotDir, type BrowserSession } from "./browser";

const instructor = demoPeople[0];
const researcher = demoPeople[3];
const aiko = demoPeople[2];
const researchProject = demoProjects[1];
const researchPlan = demoPlans.find((p) => p.projectId === researchProject.id)!;

/** The error text an input points at with aria-describedby (its last id is the error). */
async function errorUnder(page: Page, label: string): Promise<string | null> {
  const ids = (await page.getByLabel(label, { exact: true }).getAttribute("aria-describedby")) ?? "";
  const last = ids.split(" ").filter(Boolean).at(-1);
  return last ? page.locator(`[id="${last}"]`).textContent() : null;
}

/** Blank space under the footer: how far the page's scrollable height runs past the footer's bottom. */
async function spaceUnderFooter(page: Page): Promise<number> {
  return page.evaluate(() => {
    const footer = document.querySelector("body > footer")!.getBoundingClientRect();
    return document.documentElement.scrollHeight - (footer.bottom + window.scrollY);
  });
}

/** The elements that reach below the footer (what makes the blank space), for the failure message. */
async function belowFooter(page: Page): Promise<string> {
  return page.evaluate(() => {
    const bottom = document.querySelector("body > footer")!.getBoundingClientRect().bottom + 1;
    return [...document.querySelectorAll("body *")]
      .filter((e) => e.getBoundingClientRect().bottom > bottom && !e.closest("footer"))
      .slice(0, 6)
      .map(
        (e) =>
          `${e.tagName.toLowerCase()}.${String(e.getAttribute("class") ?? "").slice(0, 60)} (${Math.round(e.getBoundingClientRect().bottom - bottom)} px)`,
      )
      .join("; ");
  });
}

async function shot(page: Page, name: string) {
  await page.screenshot({ path: `${screenshotDir}/pages-${name}.png`, fullPage: true });
}

async function signIn(page: Page, email: string, password: string) {
  await page.context().clearCookies();
  await page.goto("/sign-in?callbackUrl=%2Fprojects");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL(/\/projects$/);
}

describe("pages at 1440×900", () => {
  let s: BrowserSession;
  beforeAll(async () => {
    s = await openBrowser();
    // A reader in Britain, so dates read "2 Dec 2026, 14:05" (the browser's own locale decides).
    await s.page.close();
    s.context = await s.browser.newContext({
      baseURL,
      viewport: { width: 1440, height: 900 },
      locale: "en-GB",
      timezoneId: "Europe/London",
    });
    s.page = await s.context.newPage();
    s.page.on("console", (msg) => {
      if (msg.type() === "error") s.errors.push(msg.text());
    });
    s.page.on("pageerror", (err) => s.errors.push(err.message));
  });
  afterAll(async () => {
    await s?.close();
  });

  it("landing: names every check, links sign-in, sign-up and the try-out bench, and claims no proof", async () => {
    const { page } = s;
    expect((await page.goto("/"))?.status()).toBe(200);
    const checks = await page.locator("#checks + ul h3").allTextContents();
    expect(checks).toEqual([
      "Travel",
      "Speed",
      "Acceleration",
      "Instant-move jump",
      "Effort",
      "Clearance",
      "Tool speed",
      "Recordings",
    ]);
    const main = page.locator("main");
    await expect(main.getByRole("link", { name: "Create an account" }).getAttribute("href")).resolves.toBe("/sign-up");
    await expect(main.getByRole("link", { name: "Open the try-out bench" }).getAttribute("href")).resolves.toBe(
      "/bench",
    );
    await expect(main.getByRole("link", { name: "Sign in" }).getAttribute("href")).resolves.toBe("/sign-in");
    expect(await page.locator("body").innerText()).not.toMatch(/\bprove(n)?\b|\bproof\b/i);
    await shot(page, "landing");
  });

  it("API reference: every method in plain monospace, no background colour per method", async () => {
    const { page } = s;
    expect((await page.goto("/api-docs"))?.status()).toBe(200);
    const methods = page.locator("tbody td:first-child span");
    expect(await methods.count()).toBeGreaterThan(30);
    const looks = await methods.evaluateAll((els) =>
      els.map((e) => {
        const css = getComputedStyle(e);
        return `${e.textContent}|${css.backgroundColor}|${css.color}|${css.fontFamily.includes("mono") || css.fontFamily.includes("JetBrains")}`;
      }),
    );
    const byMethod = new Map(looks.map((l) => [l.split("|")[0], l.split("|").slice(1).join("|")]));
    // One look for get, post, patch and delete alike: transparent background, the same colour, monospace.
    expect(new Set(byMethod.values()).size).toBe(1);
    expect([...byMethod.values()][0]).toMatch(/^rgba\(0, 0, 0, 0\)\|.*\|true$/);
    await shot(page, "api-docs");
  });

  it("try-out bench: the plan is called Unsaved plan and the page Try-out bench", async () => {
    const { page } = s;
    expect((await page.goto("/bench"))?.status()).toBe(200);
    await expect(page.getByTestId("plan-name").textContent()).resolves.toBe("Unsaved plan");
    await expect(page.title()).resolves.toMatch(/^Try-out bench/);
    await expect(page.getByText("Try-out bench: nothing is saved.").isVisible()).resolves.toBe(true);
    await page.waitForTimeout(800);
    await shot(page, "try-out-bench");
  });

  it("an unknown address answers 404 with our own page and a way on", async () => {
    const { page } = s;
    const res = await page.goto("/no-such-page");
    expect(res?.status()).toBe(404);
    await expect(page.locator("h1").textContent()).resolves.toBe("This page does not exist");
    await expect(page.getByRole("link", { name: "Try-out bench" }).first().getAttribute("href")).resolves.toBe(
      "/bench",
    );
    await shot(page, "not-found");
  });

  it("account pages: forgot-password refuses a bad address in the API's words, reset and verify explain a missing link", async () => {
    const { page } = s;
    await page.goto("/forgot-password");
    await page.getByLabel("E-mail").fill("not-an-address");
    await page.getByRole("button", { name: "Send the reset link" }).click();
    await expect(page.getByText("E-mail must be an e-mail address.").isVisible()).resolves.toBe(true);
    await shot(page, "forgot-password");
    await page.goto("/reset-password?token=abc");
    await page.getByLabel("New password", { exact: true }).fill("short");
    await page.getByRole("button", { name: "Set the new password" }).click();
    await expect(page.getByText("The password must be at least 10 characters.").isVisible()).resolves.toBe(true);
    await shot(page, "reset-password");
    await page.goto("/reset-password");
    await expect(page.locator("main").getByRole("alert").textContent()).resolves.toContain(
      "needs the link from the reset e-mail",
    );
    await page.goto("/verify-email?token=abc");
    await shot(page, "verify-email");
    await page.goto("/safety");
    await shot(page, "safety");
  });

  it("sign-in and sign-up: field errors in the API schema's words under their fields", async () => {
    const { page } = s;
    expect((await page.goto("/sign-in"))?.status()).toBe(200);
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await page.waitForFunction(
      () => document.querySelector('input[type="email"]')?.getAttribute("aria-invalid") === "true",
    );
    await expect(errorUnder(page, "E-mail")).resolves.toBe("E-mail must be an e-mail address.");
    await expect(errorUnder(page, "Password")).resolves.toBe("Password is required.");
    await shot(page, "sign-in");
    await page.getByLabel("E-mail").fill(researcher.email);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await expect(page.locator("main").getByRole("alert").textContent()).resolves.toContain(
      "E-mail or password is wrong",
    );
    await shot(page, "sign-in-refused");

    expect((await page.goto("/sign-up"))?.status()).toBe(200);
    await page.getByLabel("Name").fill("Pages Test");
    await page.getByLabel("E-mail").fill("pages-test-at-example");
    await page.getByLabel("Password").fill("short");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForFunction(
      () => document.querySelector('input[type="email"]')?.getAttribute("aria-invalid") === "true",
    );
    await expect(errorUnder(page, "E-mail")).resolves.toBe("E-mail must be an e-mail address.");
    await expect(errorUnder(page, "Password")).resolves.toBe("The password must be at least 10 characters.");
    await shot(page, "sign-up");
  });

  it("projects: the demo project is hand-guided, plan tables sort on a header click", async () => {
    const { page } = s;
    await signIn(page, researcher.email, researcher.password);
    await page.getByRole("heading", { name: "Hand-guided demonstrations" }).waitFor();
    expect(await page.locator("main").innerText()).not.toMatch(/lead[- ]arm/i);
    const table = page.getByRole("table", { name: "Plans in Hand-guided demonstrations" });
    await expect(table.locator("tbody tr").first().innerText()).resolves.toContain("Bench arm · gripper");
    const changed = table.getByRole("columnheader", { name: /Changed/ });
    await expect(changed.getAttribute("aria-sort")).resolves.toBe("descending");
    await table.getByRole("button", { name: /Plan/ }).click();
    await expect(table.getByRole("columnheader", { name: /Plan/ }).getAttribute("aria-sort")).resolves.toBe(
      "ascending",
    );
    // Dates in the one format: day, short month, year, 24-hour time.
    expect(await table.locator("tbody time").first().textContent()).toMatch(
      /^\d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2}$/,
    );
    await shot(page, "projects");
  });

  it("project page: adding an unknown e-mail shows the API's field error under the E-mail field", async () => {
    const { page } = s;
    await page.getByRole("link", { name: "Hand-guided demonstrations" }).first().click();
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
    const members = page.getByTestId("members-table");
    await expect(members.innerText()).resolves.toContain(researcher.email);
    const form = page.getByRole("form", { name: "Add a member" });
    await form.getByLabel("E-mail").fill("nobody-here@example.com");
    await form.getByRole("button", { name: "Add or change role" }).click();
    const email = form.getByLabel("E-mail");
    await page.waitForFunction(
      () =>
        document.querySelector('form[aria-label="Add a member"] input[type="email"]')?.getAttribute("aria-invalid") ===
        "true",
    );
    const errorId = (await email.getAttribute("aria-describedby"))!.split(" ").at(-1)!;
    await expect(page.locator(`[id="${errorId}"]`).textContent()).resolves.toBe("The e-mail has no account.");
    // A real member: listed after a reload, and the audit log says who added them.
    await form.getByLabel("E-mail").fill(aiko.email);
    await form.getByRole("button", { name: "Add or change role" }).click();
    await members.getByText(aiko.email).waitFor();
    await page.reload();
    await expect(page.getByTestId("members-table").innerText()).resolves.toContain(aiko.email);
    const audit = page.getByTestId("audit-table");
    await expect(audit.innerText()).resolves.toContain("member.set");
    await expect(audit.innerText()).resolves.toContain(researcher.name);
    await shot(page, "project");
  });

  it("API tokens: the form and the table, with a new token listed", async () => {
    const { page } = s;
    await page.goto("/settings/tokens");
    await page.getByLabel("Name", { exact: true }).fill(`pages test ${Date.now()}`);
    await page.getByRole("button", { name: "Create token" }).click();
    await page.getByText("Copy your new token now").waitFor();
    const rows = page.getByRole("table", { name: "Your API tokens" }).locator("tbody tr");
    expect(await rows.count()).toBeGreaterThan(0);
    await shot(page, "tokens");
    expect(s.errors.filter((e) => !/404|401|400|422/.test(e))).toEqual([]);
  });

  it("bench at 1440×900: every plot at least 120 px tall, saying Speed; the viewer is the 3D view", async () => {
    const { page } = s;
    await signIn(page, researcher.email, researcher.password);
    await page.goto(`/projects/${researchProject.id}/plans/${researchPlan.id}`);
    await page.getByTestId("plot-box").first().waitFor();
    const figures = await page
      .locator("figure[aria-label$='against time']")
      .evaluateAll((els) => els.map((e) => e.getAttribute("aria-label") ?? ""));
    expect(figures.some((f) => f.startsWith("Speed ("))).toBe(true);
    expect(figures.join(" ")).not.toMatch(/velocity/i);
    const heights = await page
      .getByTestId("plot-box")
      .evaluateAll((els) => els.map((e) => e.getBoundingClientRect().height));
    expect(heights.length).toBeGreaterThanOrEqual(3);
    for (const h of heights) expect(h).toBeGreaterThanOrEqual(120);
    // each chart draws its traces over recharts' frame, with tick labels on both axes
    // the effort chart's series comes from a worker after the page renders: wait until no chart is pending
    await page.waitForFunction(
      () =>
        document.querySelectorAll("[data-testid='plot-box']").length > 0 &&
        document.querySelector("[data-testid='plots'] [data-pending]") === null &&
        [...document.querySelectorAll("[data-testid='plot-box']")].every((box) =>
          box.querySelector("path[data-joint]"),
        ),
    );
    const charts = await page.getByTestId("plot-box").evaluateAll((els) =>
      els.map((e) => ({
        vertices: (e.querySelector("path[data-joint]")?.getAttribute("d") ?? "").split("L").length,
        timeTicks: e.querySelectorAll("[data-testid='time-tick']").length,
        valueTicks: e.querySelectorAll(".recharts-yAxis .recharts-cartesian-axis-tick").length,
      })),
    );
    for (const c of charts) {
      expect(c.vertices).toBeGreaterThan(20);
      expect(c.timeTicks).toBeGreaterThanOrEqual(3);
      expect(c.valueTicks).toBeGreaterThanOrEqual(3);
    }
    expect(await page.locator("body").innerText()).not.toMatch(/3D stage/i);
    await page.waitForTimeout(1000);
    await shot(page, "bench-1440");
    await page.setViewportSize({ width: 1024, height: 768 });
    await page.waitForTimeout(800);
    await shot(page, "bench-1024");
    await page.setViewportSize({ width: 1440, height: 900 });
  });

  it("recordings, arms and datasets pages: no blank space under the footer", async () => {
    const { page } = s;
    for (const [path, name] of [
      [`/projects/${researchProject.id}/recordings`, "recordings"],
      [`/projects/${researchProject.id}/arms`, "arms"],
      [`/projects/${researchProject.id}/datasets`, "datasets"],
    ] as const) {
      expect((await page.goto(path))?.status(), path).toBe(200);
      await page.waitForTimeout(600);
      expect(await spaceUnderFooter(page), `${path}: ${await belowFooter(page)}`).toBeLessThanOrEqual(1);
      await shot(page, name);
    }
    // With a stored recording open, the traces, the stream check and the timed replay fill the page.
    await page.goto(`/projects/${researchProject.id}/recordings`);
    const stored = page.getByRole("table", { name: "Stored recordings" });
    await stored.getByRole("button", { name: "Open" }).first().click();
    await page.getByTestId("recording-plot").waitFor();
    await page.waitForTimeout(800);
    await shot(page, "recordings-loaded");
    expect(await spaceUnderFooter(page), await belowFooter(page)).toBeLessThanOrEqual(1);
  });

  it("course page for a student: each assignment links to its bench, with a preview before submitting", async () => {
    const { page } = s;
    await signIn(page, aiko.email, aiko.password);
    await page.goto("/courses");
    await page.getByRole("table", { name: "Your courses" }).waitFor();
    await shot(page, "courses-student");
    await page.goto(`/courses/${demoCourse.id}`);
    const row = page.getByTestId("assignment-row").filter({ hasText: demoCourse.assignments[0].title });
    const preview = row.getByRole("link", { name: /preview it on the bench/ });
    const href = (await preview.getAttribute("href"))!;
    expect(href).toMatch(
      new RegExp(`^/projects/[0-9a-f-]{36}/plans/[0-9a-f-]{36}\\?assignment=${demoCourse.assignments[0].id}$`),
    );
    await expect(row.getByTestId("submit-preview").textContent()).resolves.toContain(
      "The assignment's limits may be stricter",
    );
    // Dates in the one format.
    expect(await row.locator("time").first().textContent()).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2}$/);
    await shot(page, "course-student");
    // A submission, so that the instructor's review queue and review page have one to show: to the
    // first assignment, which no other browser test submits to (bench-truth.e2e.ts needs the second
    // one open for a submission of its own, whichever file runs first).
    const choice = row.getByLabel("Plan version");
    if (await choice.isEnabled()) {
      await choice.selectOption({ label: "Robot Motion I / Instant swing · version 1" });
      await row.getByRole("button", { name: "Submit" }).click();
      await expect(row.getByRole("status").textContent()).resolves.toContain("attempt 1");
    } else {
      await expect(row.textContent()).resolves.toMatch(/Waiting for review|Approved|Returned with comments/);
    }
    await page.goto(href);
    await page.getByTestId("assignment-rules").waitFor();
    await page.waitForTimeout(800);
    await shot(page, "bench-assignment");
    expect((await page.goto(`/courses/join?code=${demoCourse.joinCode}`))?.status()).toBe(200);
    await shot(page, "course-join");
  });

  it("course, roster and reviews for the instructor: sortable roster, invitation errors under the field", async () => {
    const { page } = s;
    await signIn(page, instructor.email, instructor.password);
    await page.goto("/courses");
    await shot(page, "courses-instructor");
    await page.goto(`/courses/${demoCourse.id}`);
    const roster = page.getByRole("table", { name: "Roster" });
    await expect(roster.innerText()).resolves.toContain(aiko.email);
    await roster.getByRole("button", { name: /E-mail/ }).click();
    await expect(roster.getByRole("columnheader", { name: /E-mail/ }).getAttribute("aria-sort")).resolves.toBe(
      "ascending",
    );
    await page.getByLabel("Addresses").fill(`${aiko.email} not-an-address`);
    await page.getByRole("button", { name: "Send invitations" }).click();
    await page.waitForFunction(() => document.querySelector("textarea")?.getAttribute("aria-invalid") === "true");
    await expect(errorUnder(page, "Addresses")).resolves.toBe("Address 2 (not-an-address) must be an e-mail address.");
    await shot(page, "course-instructor");
    expect((await page.goto("/reviews"))?.status()).toBe(200);
    await shot(page, "reviews");
    await page
      .getByTestId("queue-row")
      .filter({ hasText: demoCourse.assignments[0].title })
      .getByRole("link", { name: aiko.name })
      .first()
      .click();
    await page.waitForURL(/\/reviews\/[0-9a-f-]{36}$/);
    await page.getByTestId("review-status").waitFor();
    await page.waitForTimeout(1000);
    await shot(page, "review");
    expect(s.errors.filter((e) => !/404|401|400|422/.test(e))).toEqual([]);
  });
});
