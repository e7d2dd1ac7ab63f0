/**
 * The try-out bench's duration sweep and 3D view in Chromium against the production server: the
 * sweep says the engine's shortest safe duration (the engine run here in Node on the plan the page
 * starts from), is kept while only another move changes and follows this move's goal; and an edit
 * draws the 3D view again without compiling any shader again (without a GPU a compile costs the page
 * tens of milliseconds per edit).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { scratchPlan } from "@/components/editor/demo-plan";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { armChainSchema, check, parseArm } from "@/kinematics";
import { openBrowser, screenshotDir, type BrowserSession } from "./browser";

describe("the try-out bench's sweep and 3D view", () => {
  let s: BrowserSession;
  beforeAll(async () => {
    s = await openBrowser();
  });
  afterAll(async () => {
    expect(s.errors).toEqual([]);
    await s.close();
  });

  it("try-out bench: the duration sweep of the selected move says the engine's shortest safe duration, stays current when another move changes, and follows this move's goal", async () => {
    const { page } = s;
    await page.goto("/bench");
    await page.getByText("Full check in a worker").first().waitFor();
    // the engine in Node on the plan the page starts from: the second move's shortest safe duration
    const parsed = parseArm(armL);
    if (!parsed.ok) throw new Error("the light demo arm does not parse");
    const plan = scratchPlan({ ...parsed.value, chain: armChainSchema.parse(armL.chain) });
    const safe = check(plan).moves[1].minSafeDuration;
    expect(safe).not.toBeNull();
    await page.getByTestId("move-row-1").locator("td").first().click();
    await page.locator("[data-testid='move-row-1'][aria-selected='true']").waitFor();
    const figure = page.locator("figure[aria-label^='Duration sweep']");
    const settled = async () => {
      await page.getByText("Full check in a worker").first().waitFor();
      await page.waitForFunction(() => document.querySelector("[data-pending='sweep']") === null);
      return (await figure.locator(".recharts-line-curve").getAttribute("d")) ?? "";
    };
    const before = await settled();
    // 49 durations, one vertex each
    expect(before.split(/[ML]/).filter(Boolean).length).toBe(49);
    await expect(figure.getAttribute("aria-label")).resolves.toContain(
      `shortest safe duration ${(Math.ceil(safe! * 1000 - 1e-9) / 1000).toFixed(3)} s`,
    );
    // another move's duration: the same sweep, current again once the check has answered
    await page.getByLabel("Move 3 duration (s)").fill("2.2");
    await page.getByLabel("Move 3 duration (s)").press("Tab");
    const total = plan.moves.reduce((t, m, i) => t + (i === 2 ? 2.2 : m.duration), 0).toFixed(3);
    await page.getByText(`/ ${total} s`).waitFor();
    expect(await settled()).toBe(before);
    // this move's goal: a new sweep
    const shoulder = page.locator("input[aria-label^='shoulder (']");
    await shoulder.fill(String(Number(await shoulder.inputValue()) + 15));
    await shoulder.press("Tab");
    await page.waitForFunction((old) => {
      const d = document.querySelector("figure[aria-label^='Duration sweep'] .recharts-line-curve")?.getAttribute("d");
      return d && d !== old && document.querySelector("[data-pending='sweep']") === null;
    }, before);
    await page.screenshot({ path: `${screenshotDir}/bench-view-sweep.png` });
  });

  it("try-out bench: an edit draws the 3D view again without compiling any shader again", async () => {
    const { page } = s;
    // count WebGL program links from the page's first script on (three.js links one per material kind)
    await page.addInitScript(() => {
      const w = window as unknown as { jpLinks: number };
      w.jpLinks = 0;
      for (const C of [WebGLRenderingContext, WebGL2RenderingContext]) {
        const link = C.prototype.linkProgram;
        C.prototype.linkProgram = function (this: WebGLRenderingContext, program: WebGLProgram) {
          w.jpLinks++;
          return link.call(this, program);
        };
      }
    });
    await page.goto("/bench");
    const drawn = async () => {
      await page.getByText("Full check in a worker").first().waitFor();
      await page.waitForFunction(() => document.querySelector("[data-pending]") === null);
      // the view draws in the frames after the figures: give it a few
      await page.evaluate(
        () => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(() => setTimeout(r, 300)))),
      );
      return page.evaluate(() => (window as unknown as { jpLinks: number }).jpLinks);
    };
    const first = await drawn();
    expect(first).toBeGreaterThan(0); // the 3D view was drawn
    const duration = page.getByLabel("Move 1 duration (s)");
    // the try-out plan's other moves take 0.9 + 1.2 + 1.5 s: the transport's total shows each edit arrived
    for (const value of [1.7, 1.8, 1.65]) {
      await duration.fill(value.toFixed(3));
      await page.getByText(`/ ${(value + 3.6).toFixed(3)} s`).waitFor();
      expect(await drawn()).toBe(first);
    }
  });
});
