/**
 * The bench page's own figures, in Chromium against the running server (bench/server.sh): the
 * try-out bench (`/bench`, light demo arm) grown to a 10-move plan, then the time from an edit of a
 * duration or of a pose value until the findings (the worker's full check) and the plots show the
 * new result, and the time of "Add move" on a 30-move plan. Each edit is timed inside the page with
 * performance marks: the mark before the edit, and the mark in the first animation frame after both
 * the check status has gone from pending (any text but "Full check in a worker") to the new full
 * check and the plots have re-rendered, the effort chart and the duration sweep included (both come
 * from workers).
 *
 * Each timed edit starts from a quiet page (two frames and an idle period after the previous one, so
 * its trailing 3D frame has been drawn), as a user's keystrokes about 100 ms apart find it; the same
 * edits are then timed back to back, each the moment the previous one has shown its result, which
 * charges every edit with the previous one's 3D frame (20–60 ms without a GPU).
 */
import type { Page } from "playwright-core";
import { openBrowser, screenshotDir } from "../tests/e2e/browser";
import { join } from "node:path";
import { summary } from "./plans";

export interface BenchPageFigures {
  moves10: {
    durationEdit: ReturnType<typeof summary>;
    poseEdit: ReturnType<typeof summary>;
    durationEditBackToBack: ReturnType<typeof summary>;
    poseEditBackToBack: ReturnType<typeof summary>;
  };
  moves30: { addMove: ReturnType<typeof summary> };
  screenshots: string[];
}

/**
 * In-page code (a string, so that the bundler's helpers do not leak into the page), defining
 * `window.jointproofEdit(label, act)`: marks, runs `act`, waits until the check status has gone
 * through pending to "Full check in a worker" and the plots have changed, then marks in the next
 * animation frame and resolves with the measured milliseconds; and `window.jointproofType(label,
 * value, measure, nth)`, which types into a field inside that timer.
 */
const timerScript = `
window.jointproofEdit = function (label, act) {
  return new Promise(function (resolve, reject) {
    var status = document.querySelector('[data-testid="check-status"]');
    var plots = document.querySelector('[data-testid="plots"]');
    if (!status || !plots) return reject(new Error("the bench page has no check status or plots"));
    var sawRunning = false, checked = false, plotted = false, timer = 0;
    var statusObserver, plotObserver, pendingObserver;
    function finish() {
      // the effort chart's series and the duration sweep come from workers of their own: wait for them too
      if (!checked || !plotted || document.querySelector("[data-pending]")) return;
      statusObserver.disconnect();
      plotObserver.disconnect();
      pendingObserver.disconnect();
      clearTimeout(timer);
      requestAnimationFrame(function () {
        performance.mark(label + ":end");
        resolve(performance.measure(label, label + ":start", label + ":end").duration);
      });
    }
    statusObserver = new MutationObserver(function () {
      var text = status.textContent || "";
      var done = text.indexOf("Full check in a worker") >= 0;
      if (!done) sawRunning = true;
      else if (sawRunning) checked = true;
      finish();
    });
    plotObserver = new MutationObserver(function () { plotted = true; finish(); });
    pendingObserver = new MutationObserver(finish);
    timer = setTimeout(function () { reject(new Error(label + ": no new result within 30 s")); }, 30000);
    statusObserver.observe(status, { subtree: true, childList: true, characterData: true });
    plotObserver.observe(plots, { subtree: true, childList: true, characterData: true, attributes: true });
    pendingObserver.observe(document.body, { subtree: true, childList: true, attributes: true, attributeFilter: ["data-pending"] });
    performance.mark(label + ":start");
    act();
  });
};
window.jointproofType = function (label, value, measure, nth) {
  var field = nth === null
    ? document.querySelector('input[aria-label="' + label + '"]')
    : document.querySelectorAll('input[aria-label$="' + label + '"]')[nth];
  if (!field) throw new Error("no field labelled " + label);
  var setValue = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value").set;
  return window.jointproofEdit(measure, function () {
    setValue.call(field, value);
    field.dispatchEvent(new Event("input", { bubbles: true }));
  });
};
window.jointproofAdd = function (measure) {
  var button = Array.prototype.find.call(document.querySelectorAll("button"), function (b) {
    return (b.textContent || "").trim() === "Add move";
  });
  if (!button) throw new Error("no Add move button");
  return window.jointproofEdit(measure, function () { button.click(); });
};
window.jointproofFieldLabel = function (joint) {
  var found = Array.prototype.map
    .call(document.querySelectorAll("input[aria-label]"), function (i) { return i.getAttribute("aria-label"); })
    .find(function (l) { return l.indexOf(joint + " (") === 0; });
  return found || null;
};
`;

/** Resolves once the page is quiet: two animation frames, then an idle period (at most 1 s). */
async function quiet(page: Page): Promise<void> {
  await page.evaluate(
    "new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(() => requestIdleCallback(() => resolve(null), { timeout: 1000 }))))",
  );
}

async function installTimer(page: Page): Promise<void> {
  await page.evaluate(timerScript);
}

/**
 * Types `value` into a text field (as a user's keystrokes end: one input event) inside the timer:
 * the field labelled `label`, or with `nth`, the nth field (0-based) whose label ends with `label`.
 */
async function typeInto(page: Page, label: string, value: string, measure: string, nth?: number): Promise<number> {
  const call = `window.jointproofType(${JSON.stringify(label)}, ${JSON.stringify(value)}, ${JSON.stringify(measure)}, ${nth ?? "null"})`;
  return (await page.evaluate(call)) as number;
}

/** Clicks "Add move" inside the timer. */
async function addMove(page: Page, measure: string): Promise<number> {
  return (await page.evaluate(`window.jointproofAdd(${JSON.stringify(measure)})`)) as number;
}

/** The label of a joint's pose field ("base (°)"), read from the page. */
async function poseFieldLabel(page: Page, joint: string): Promise<string> {
  const label = (await page.evaluate(`window.jointproofFieldLabel(${JSON.stringify(joint)})`)) as string | null;
  if (!label) throw new Error(`no pose field for ${joint}`);
  return label;
}

/** Adds moves until the plan has `count`, each new goal moved on two joints (so every move moves). */
async function growTo(page: Page, count: number): Promise<void> {
  const rows = async () => page.locator('[data-testid^="move-row-"]').count();
  const base = await poseFieldLabel(page, "base");
  const elbow = await poseFieldLabel(page, "elbow");
  for (let i = await rows(); i < count; i++) {
    await addMove(page, `grow-${i}`);
    await typeInto(page, base, String(((i * 37) % 120) - 60), `grow-base-${i}`);
    await typeInto(page, elbow, String(20 + ((i * 23) % 60)), `grow-elbow-${i}`);
  }
  if ((await rows()) !== count) throw new Error(`the plan has ${await rows()} moves, not ${count}`);
}

export async function benchPageFigures(baseUrl: string): Promise<BenchPageFigures> {
  const session = await openBrowser();
  const { page } = session;
  const screenshots: string[] = [];
  try {
    await page.goto(`${baseUrl}/bench`, { waitUntil: "networkidle" });
    await page.getByText("Full check in a worker").waitFor({ timeout: 60_000 });
    await installTimer(page);
    await growTo(page, 10);
    // durations of the fifth move and the shoulder of the selected (last) move, a new value each edit
    const shoulder = await poseFieldLabel(page, "shoulder");
    const edits = async (settle: boolean) => {
      const durationEdit: number[] = [];
      for (let r = 0; r < 25; r++) {
        if (settle) await quiet(page);
        durationEdit.push(await typeInto(page, "duration (s)", (1.2 + 0.013 * r).toFixed(3), `duration-${r}`, 4));
      }
      const poseEdit: number[] = [];
      for (let r = 0; r < 25; r++) {
        if (settle) await quiet(page);
        poseEdit.push(await typeInto(page, shoulder, String(10 + 0.7 * r), `pose-${r}`));
      }
      return { durationEdit, poseEdit };
    };
    const quietEdits = await edits(true);
    const backToBack = await edits(false);
    const shot10 = join(screenshotDir, "bench-page-10-moves.png");
    await page.screenshot({ path: shot10, fullPage: true });
    screenshots.push(shot10);

    await growTo(page, 30);
    // "Add move" on 30 moves: add (timed), then delete the new move again (untimed)
    const add: number[] = [];
    for (let r = 0; r < 12; r++) {
      await quiet(page);
      add.push(await addMove(page, `add-${r}`));
      await page.locator('button[aria-label^="Delete move"]').last().click();
      await page.waitForFunction(`document.querySelectorAll('[data-testid^="move-row-"]').length === 30`);
      await page.getByText("Full check in a worker").waitFor();
    }
    const shot30 = join(screenshotDir, "bench-page-30-moves.png");
    await page.screenshot({ path: shot30, fullPage: true });
    screenshots.push(shot30);
    if (session.errors.length) throw new Error(`the bench page logged errors: ${session.errors.join("; ")}`);
    return {
      moves10: {
        durationEdit: summary(quietEdits.durationEdit),
        poseEdit: summary(quietEdits.poseEdit),
        durationEditBackToBack: summary(backToBack.durationEdit),
        poseEditBackToBack: summary(backToBack.poseEdit),
      },
      moves30: { addMove: summary(add) },
      screenshots,
    };
  } finally {
    await session.close();
  }
}
