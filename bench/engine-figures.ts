/**
 * The engine's check figures of the targets, measured the same way in Node and in Chromium:
 * a cold full check of the 10- and 50-move heavy-arm plans (nothing cached from an earlier run), and
 * one move's duration changed on an already checked 10-move plan (the incremental check), each with
 * the fixed calibration loop run in the same process.
 */
import { check, formatProblem, parsePlan, type Plan } from "../kinematics";
import { calibrationLoop, coldCopy, heavyPlan, summary, type EngineFigures, type PlanDocument } from "./plans";

function parse(document: PlanDocument): Plan {
  const result = parsePlan(document);
  if (!result.ok) throw new Error(result.problems.map((p) => formatProblem(p)).join("; "));
  return result.value;
}

/** Milliseconds of each of `runs` calls of `fn(run)`, after `warmup` untimed calls. */
function times(runs: number, warmup: number, fn: (run: number) => void): number[] {
  for (let r = 0; r < warmup; r++) fn(-1 - r);
  const out: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    fn(r);
    out.push(performance.now() - t0);
  }
  return out;
}

/** Measures {@link EngineFigures}; `scale` multiplies the run counts (1 for the bench). */
export function measureEngine(scale = 1): EngineFigures {
  const runs = (n: number) => Math.max(3, Math.round(n * scale));
  const ten = heavyPlan(10);
  const fifty = heavyPlan(50);
  // a distinct box offset per run: parsing is outside the timing, the check is cold
  let offset = 0;
  const coldPlans = (document: PlanDocument, count: number) =>
    Array.from({ length: count }, () => parse(coldCopy(document, (offset += 1e-7))));

  const cold10 = coldPlans(ten, runs(30) + 3);
  let findings10 = 0;
  const check10 = times(runs(30), 3, (r) => {
    findings10 = check(cold10[r < 0 ? -1 - r : r + 3]).findings.length;
  });
  const cold50 = coldPlans(fifty, runs(10) + 2);
  let findings50 = 0;
  const check50 = times(runs(10), 2, (r) => {
    findings50 = check(cold50[r < 0 ? -1 - r : r + 2]).findings.length;
  });

  // one move's duration changed on a checked plan: move 5 gets a new duration each run
  const base = parse(ten);
  check(base);
  const edited = Array.from({ length: runs(60) + 5 }, (_, r) =>
    parse({ ...ten, moves: ten.moves.map((m, i) => (i === 4 ? { ...m, duration: 2 + 0.001 * (r + 1) } : m)) }),
  );
  const durationChange = times(runs(60), 5, (r) => {
    check(edited[r < 0 ? -1 - r : r + 5]);
  });

  const calibration = calibrationLoop();
  return {
    check10: summary(check10),
    check50: summary(check50),
    durationChange10: summary(durationChange),
    calibrationMs: Number(calibration.ms.toFixed(1)),
    findings10,
    findings50,
  };
}
