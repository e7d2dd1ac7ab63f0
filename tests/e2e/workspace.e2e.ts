// The workspace end to end (issue 6), in Chromium against the real server and database:
// sign in as the demo researcher, build a plan on the bench, shorten a move until the engine
// reports a speed-over fault, apply the shortest safe duration, save, export JSON and verify it
// with bin/jointproof check; then upload a recording with jumps, repair it and save it as a plan.
import { execFileSync } from "node:child_process";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoPeople } from "@/db/demo";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { check } from "@/kinematics";
import { parsePlan } from "@/kinematics";
import { baseUrl, openBrowser, screenshotDir, type BrowserSession } from "./browser";

const researcher = demoPeople.find((p) => p.role === "researcher")!;
// The test works in a project of its own (created through the dashboard), so other tests' data stays as seeded.
const project = { id: "", name: `Bench tuning ${Date.now().toString(36)}` };
const outDir = join(process.cwd(), ".data", "test", "workspace");
const stamp = Date.now().toString(36);
const n = armL.joints.length;
const pose = (...v: number[]) => Array.from({ length: n }, (_, j) => v[j] ?? 0);

/** The plan the test pastes into the bench: Move 2 (`moves[1]`) swings the base 1.2 rad in 2 s. */
const moves = [
  { goal: pose(0, -0.2, 1.0, 0.6), duration: 1.5, shape: "quintic" },
  { goal: pose(1.2, -0.2, 1.0, 0.6), duration: 2, shape: "quintic" },
  { goal: pose(1.2, 0.3, 0.7, 0.4, 0, 0, 0.015), duration: 1.2, shape: "cubic" },
  { goal: pose(0, 0, 0.8, 0.5), duration: 2, shape: "trapezoid" },
];

/** Signs in through the sign-in page, arriving there the way a new visitor does: redirected from /projects. */
async function signIn(page: Page, email: string, password: string) {
  await page.goto("/projects");
  await page.waitForURL(/\/sign-in\?callbackUrl=%2Fprojects/);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL(/\/projects$/);
  const me = await page.request.get("/api/v1/me");
  expect(me.status()).toBe(200);
}

async function speedFaults(page: Page): Promise<number> {
  return page.getByRole("button", { name: /^Fault: Speed over limit, base, move 2\./ }).count();
}

describe("workspace", () => {
  let s: BrowserSession;
  let armName: string;
  let planUrl: string;

  beforeAll(async () => {
    mkdirSync(outDir, { recursive: true });
    s = await openBrowser();
    await signIn(s.page, researcher.email, researcher.password);
    await s.page.getByRole("button", { name: "New project" }).click();
    await s.page.getByLabel("Name", { exact: true }).fill(project.name);
    await s.page.getByRole("button", { name: "Create project" }).click();
    await s.page.getByRole("heading", { name: project.name }).waitFor();
    const list = (await (await s.page.request.get("/api/v1/projects")).json()) as {
      projects: { id: string; name: string }[];
    };
    project.id = list.projects.find((p) => p.name === project.name)!.id;
    // A custom arm with the light demo arm's full model (geometry included), so the stage draws its links.
    armName = `Bench arm L with geometry ${stamp}`;
    const res = await s.page.request.post(`/api/v1/projects/${project.id}/arms`, {
      data: { name: armName, description: armL, note: "browser test" },
      headers: { Origin: baseUrl },
    });
    expect(res.status()).toBe(201);
  });

  afterAll(async () => {
    await s?.close();
  });

  it("creates a plan from the dashboard and fills it by importing a plan document", async () => {
    const { page } = s;
    await page.goto("/projects");
    await page.getByRole("button", { name: `New plan in ${project.name}` }).click();
    await page.getByLabel("Plan name").fill(`Base swing ${stamp}`);
    await page.getByLabel("Arm", { exact: true }).selectOption({ label: `${armName} (custom)` });
    await page.getByRole("button", { name: "Create and open" }).click();
    await page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
    planUrl = page.url();
    await expect(page.getByTestId("plan-name").textContent()).resolves.toBe(`Base swing ${stamp}`);

    await page.getByRole("button", { name: "Import" }).click();
    // a field error first: the import names the field path
    await page.getByLabel("…or paste the JSON").fill(
      JSON.stringify({
        format: "jointproof.plan",
        version: 1,
        arm: armL,
        start: pose(),
        moves: [{ goal: pose(), duration: -1 }],
      }),
    );
    await expect(page.getByTestId("import-problems").textContent()).resolves.toContain("moves[0].duration");
    await page
      .getByLabel("…or paste the JSON")
      .fill(JSON.stringify({ format: "jointproof.plan", version: 1, arm: armL, start: pose(), moves }));
    await page.getByRole("button", { name: "Replace the bench's plan" }).click();
    await expect(page.getByTestId("move-row-3").isVisible()).resolves.toBe(true);
    await page.waitForSelector("[data-testid=stage] canvas");
    await page.waitForTimeout(1500);
    await page.screenshot({ path: `${screenshotDir}/workspace-editor.png` });
    await page.getByTestId("stage").screenshot({ path: `${screenshotDir}/workspace-viewer.png` });

    // a tablet: the outline keeps 400 px, every move's duration field fits inside it, the stage sits beside it
    await page.setViewportSize({ width: 1024, height: 768 });
    await page.waitForTimeout(500);
    const rail = (await page.getByRole("complementary", { name: "Plan outline" }).boundingBox())!;
    expect(rail.width).toBeGreaterThanOrEqual(399);
    const duration = (await page.getByLabel("Move 4 duration (s)").boundingBox())!;
    expect(duration.x + duration.width).toBeLessThanOrEqual(rail.x + rail.width);
    const stageBox = (await page.getByTestId("stage").boundingBox())!;
    expect(stageBox.x).toBeGreaterThanOrEqual(rail.x + rail.width - 1);
    expect(stageBox.height).toBeGreaterThan(300);
    await page.screenshot({ path: `${screenshotDir}/workspace-tablet.png` });
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.getByTestId("plots").screenshot({ path: `${screenshotDir}/workspace-plots.png` });

    // play moves the shared playhead; pause holds it
    await page.getByRole("button", { name: "Play" }).click();
    await page.waitForTimeout(1200);
    await page.getByRole("button", { name: "Pause" }).click();
    const shown = Number((await page.getByTestId("playhead-time").textContent())!.split(" / ")[0]);
    expect(shown).toBeGreaterThan(0.3);
    expect(shown).toBeLessThan(6.7);
    await page.getByTestId("stage").screenshot({ path: `${screenshotDir}/workspace-viewer-playing.png` });
    await page.waitForTimeout(300);
    expect(Number((await page.getByTestId("playhead-time").textContent())!.split(" / ")[0])).toBe(shown);
  });

  it("shortening Move 2 raises a speed-over fault; the shortest safe duration clears it", async () => {
    const { page } = s;
    const duration = page.getByLabel("Move 2 duration (s)");
    let d = 2;
    while ((await speedFaults(page)) === 0 && d > 0.1) {
      d = Math.round((d - 0.1) * 1000) / 1000;
      await duration.fill(String(d));
    }
    expect(await speedFaults(page)).toBe(1);
    // the engine agrees: at this duration the base is over its speed limit, 0.1 s longer it was not
    const at = (dur: number) => {
      const parsed = parsePlan({
        format: "jointproof.plan",
        version: 1,
        arm: armL,
        start: pose(),
        moves: moves.map((m, i) => (i === 1 ? { ...m, duration: dur } : m)),
      });
      if (!parsed.ok) throw new Error("test plan does not parse");
      return check(parsed.value);
    };
    expect(at(d).findings.some((f) => f.kind === "speed-over" && f.severity === "fault" && f.move === 1)).toBe(true);
    expect(at(d + 0.1).findings.some((f) => f.kind === "speed-over" && f.severity === "fault" && f.move === 1)).toBe(
      false,
    );
    await expect(page.getByTestId("move-row-1").getAttribute("aria-label")).resolves.toBe("Move 2: fault");
    // a click on the finding moves the playhead to its moment: mid-Move 2 (Moves 1 and 2 run back to back)
    await page.getByRole("button", { name: /^Fault: Speed over limit, base, move 2\./ }).click();
    await expect(page.getByTestId("playhead-time").textContent()).resolves.toMatch(
      new RegExp(`^${(1.5 + d / 2).toFixed(3)} / `),
    );
    await page.screenshot({ path: `${screenshotDir}/workspace-speed-fault.png` });

    await page.getByTestId("move-row-1").click({ position: { x: 20, y: 10 } });
    await page.getByRole("button", { name: /Set move 2 to its shortest safe duration/ }).click();
    const safe = Math.ceil(at(d).moves[1].minSafeDuration! * 1000 - 1e-9) / 1000;
    await expect(duration.inputValue()).resolves.toBe(safe.toFixed(3));
    expect(await speedFaults(page)).toBe(0);
    await expect(page.getByTestId("move-row-1").getAttribute("aria-label")).resolves.not.toBe("Move 2: fault");
  });

  it("saves a version with a note, exports the JSON behind the safety caution, and the command-line checker agrees", async () => {
    const { page } = s;
    await page.getByRole("button", { name: "Save version" }).click();
    await page.getByLabel("Note (what changed and why)").fill("Move 2 at its shortest safe duration");
    await page.getByRole("button", { name: "Save", exact: true }).click();
    await page
      .getByTestId("save-state")
      .getByText(/Saved as version 1/)
      .waitFor({ timeout: 15_000 });
    const savedVerdict = await page.getByTestId("save-state").locator("[data-verdict]").getAttribute("data-verdict");
    expect(["pass", "caution"]).toContain(savedVerdict);

    await page.getByRole("button", { name: "Export" }).click();
    const caution = page.getByRole("region", { name: "Safety caution" });
    await expect(caution.textContent()).resolves.toContain("emergency stop");
    expect(await page.getByRole("link", { name: "Download JSON" }).count()).toBe(0); // not before the caution is acknowledged
    await page.getByLabel(/I have read the caution/).check();
    await page.screenshot({ path: `${screenshotDir}/workspace-export.png` });
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByRole("link", { name: "Download JSON" }).click(),
    ]);
    const file = join(outDir, download.suggestedFilename());
    await download.saveAs(file);
    const command = await page.getByTestId("check-command").textContent();
    expect(command).toBe(`bin/jointproof check ${download.suggestedFilename()}`);

    const out = execFileSync("bin/jointproof", ["check", file, "--json"], { encoding: "utf8" });
    const report = JSON.parse(out) as { verdict: string; moves: { duration: number }[] };
    expect(report.verdict).toBe(savedVerdict);
    expect(report.moves).toHaveLength(4);
    const exported = JSON.parse(readFileSync(file, "utf8")) as { export: { sha256: string; waypoints: unknown[] } };
    expect(exported.export.sha256).toMatch(/^[0-9a-f]{64}$/);
    // one waypoint per control cycle (1 kHz) over the plan, end point included
    const totalS = report.moves.reduce((sum, m) => sum + m.duration, 0);
    expect(Math.abs(exported.export.waypoints.length - (Math.floor(totalS * 1000) + 1))).toBeLessThanOrEqual(1);
    await page.keyboard.press("Escape");
  });

  it("a save that races another one gets a clear choice, and two versions compare move by move", async () => {
    const { page } = s;
    const planId = planUrl.split("/").pop()!;
    await page.getByLabel("Move 3 duration (s)").fill("1.5");
    await page.getByRole("button", { name: "Save version" }).click();
    await page.getByLabel("Note (what changed and why)").fill("Move 3 slower");
    await page.getByRole("button", { name: "Save", exact: true }).click();
    await page
      .getByTestId("save-state")
      .getByText(/Saved as version 2/)
      .waitFor({ timeout: 15_000 });

    // someone else saves version 3 on top of version 2 (another tab, the API)
    const v2 = (await (await page.request.get(`/api/v1/plans/${planId}/versions/2`)).json()) as {
      version: { document: unknown };
    };
    const other = await page.request.post(`/api/v1/plans/${planId}/versions`, {
      data: { baseVersion: 2, document: v2.version.document, note: "from another tab" },
      headers: { Origin: baseUrl },
    });
    expect(other.status()).toBe(201);

    await page.getByLabel("Move 4 duration (s)").fill("2.5");
    await page.getByRole("button", { name: "Save version" }).click();
    await page.getByRole("button", { name: "Save", exact: true }).click();
    const conflict = page.getByRole("dialog", { name: "Someone saved this plan in the meantime" });
    await conflict.waitFor();
    await expect(conflict.textContent()).resolves.toContain(
      "You started from version 2; version 3 has been saved since.",
    );
    await page.screenshot({ path: `${screenshotDir}/workspace-conflict.png` });
    await conflict.getByRole("button", { name: /Save my edits as version 4/ }).click();
    await page
      .getByTestId("save-state")
      .getByText(/Saved as version 4/)
      .waitFor({ timeout: 15_000 });

    await page.getByRole("button", { name: "Versions" }).click();
    const versions = page.getByRole("dialog", { name: "Versions" });
    await versions.getByRole("checkbox", { name: "Compare version 1" }).check();
    await versions.getByRole("checkbox", { name: "Compare version 4" }).check();
    const comparison = versions.getByRole("region", { name: "Comparison" });
    await comparison.getByText("Move 3 duration: 1.2 → 1.5").waitFor();
    await comparison.getByText("Move 4 duration: 2 → 2.5").waitFor();
    await page.screenshot({ path: `${screenshotDir}/workspace-versions.png` });
    await page.keyboard.press("Escape");
  });

  it("uploads a recording with jumps, repairs it and saves it as a plan", async () => {
    const { page } = s;
    // 3 s at 1 kHz: a slow base sweep with three sudden steps of 0.25 rad (far above 3.2 rad/s × 1 ms)
    const names = armL.joints.map((j) => j.name);
    const lines = [`t,${names.join(",")}`];
    for (let k = 0; k <= 3000; k++) {
      const t = k / 1000;
      const steps = (t >= 0.8 ? 0.25 : 0) + (t >= 1.6 ? -0.25 : 0) + (t >= 2.2 ? 0.25 : 0);
      const q = pose(0.4 * Math.sin(t) + steps, -0.2, 1.0 + 0.1 * Math.sin(2 * t), 0.6, 0, 0, 0.01);
      lines.push([t.toFixed(3), ...q.map((v) => v.toFixed(6))].join(","));
    }
    const csv = join(outDir, `guided-${stamp}.csv`);
    writeFileSync(csv, lines.join("\n") + "\n");

    await page.goto(`/projects/${project.id}/recordings`);
    await page.getByLabel("Arm the recording is for").selectOption({ label: `${armName} (revision 1)` });
    await page.getByLabel("Recording CSV file").setInputFiles(csv);
    const findings = page.getByTestId("stream-findings");
    await findings.waitFor();
    await expect(
      page.getByRole("progressbar", { name: "Reading the file" }).getAttribute("aria-valuenow"),
    ).resolves.toBe("100");
    expect(await findings.getByText("Jump too far").count()).toBe(3);
    // keep the original in the project: uploaded with a progress bar, then listed
    await page.getByRole("button", { name: "Keep the original in the project" }).click();
    await page.getByRole("button", { name: "Kept in the project" }).waitFor({ timeout: 20_000 });
    await expect(
      page.getByRole("progressbar", { name: "Uploading the recording" }).getAttribute("aria-valuenow"),
    ).resolves.toBe("100");
    await page.getByRole("region", { name: "Stored recordings" }).getByText(`guided-${stamp}.csv`).waitFor();
    await expect(
      page.getByRole("region", { name: "Stream check" }).locator("[data-verdict]").first().getAttribute("data-verdict"),
    ).resolves.toBe("fault");
    await page.getByRole("button", { name: /^Repair/ }).click();
    const repaired = page.getByRole("region", { name: "Repaired recording" });
    await expect(repaired.locator("[data-verdict]").first().getAttribute("data-verdict")).resolves.toBe("pass");
    await page.waitForTimeout(300);
    await page.screenshot({ path: `${screenshotDir}/workspace-recording.png`, fullPage: true });

    await page.getByLabel("Plan name").fill(`Guided sweep ${stamp}`);
    await page.getByRole("button", { name: "Save as plan" }).click();
    await page.waitForURL(/\/plans\/[0-9a-f-]{36}$/);
    await expect(page.getByTestId("plan-name").textContent()).resolves.toBe(`Guided sweep ${stamp}`);
    const planId = page.url().split("/").pop()!;
    const versions = (await (await page.request.get(`/api/v1/plans/${planId}/versions`)).json()) as {
      versions: { number: number; verdict: string }[];
    };
    expect(versions.versions).toHaveLength(1);
    expect(versions.versions[0].verdict).not.toBe("fault");
    await page.waitForTimeout(1000);
    await page.screenshot({ path: `${screenshotDir}/workspace-recording-plan.png` });
  });

  it("edits an arm's limits with field errors from the engine's schema, and saves a new revision", async () => {
    const { page } = s;
    await page.goto(`/projects/${project.id}/arms`);
    await page.getByRole("button", { name: new RegExp(`^${armName}`) }).click();
    await page.waitForSelector("[data-testid=arm-stage] canvas");
    const speed = page.getByLabel("elbow Max speed (°/s)");
    await speed.fill("0");
    await page.getByRole("button", { name: "Save as revision 2" }).click();
    await page.getByText("must be greater than 0").waitFor();
    await expect(speed.getAttribute("aria-invalid")).resolves.toBe("true");
    await page.screenshot({ path: `${screenshotDir}/workspace-arms.png` });
    await speed.fill("180");
    await page.getByRole("button", { name: "Save as revision 2" }).click();
    await page.getByRole("status").getByText("Saved.", { exact: true }).waitFor();
    const arms = (await (await page.request.get(`/api/v1/projects/${project.id}/arms`)).json()) as {
      arms: { name: string; latestRevision: number }[];
    };
    expect(arms.arms.find((a) => a.name === armName)?.latestRevision).toBe(2);
  });

  it("ran without console errors (the one 409 of the raced save is expected)", () => {
    const conflicts = s.errors.filter((e) => e.includes("status of 409"));
    expect(conflicts).toHaveLength(1);
    expect(s.errors.filter((e) => !e.includes("status of 409"))).toEqual([]);
    expect(planUrl).toContain(project.id);
  });
});
