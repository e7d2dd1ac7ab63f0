/**
 * The plans the engine, browser and server benchmarks check (invented, deterministic): the issue's
 * 10- and 50-move plans of 2 s moves on the heavy demo arm with one keep-out box, and a 5-move plan
 * on the light demo arm with its chain, for the API. Shared by Node (bench/run.ts), the browser
 * bundle (bench/browser/engine-bench.ts) and the load bench (bench/server-load.ts).
 */
import armH from "../kinematics/arm/presets/bench-arm-h.json";
import armL from "../kinematics/arm/presets/bench-arm-l.json";

type ArmDocument = typeof armH;

/** A plan document as the API and parsePlan take it. */
export interface PlanDocument {
  format: "jointproof.plan";
  version: 1;
  arm: ArmDocument;
  start: number[];
  keepOut?: { name: string; min: number[]; max: number[] }[];
  moves: { goal: number[]; duration: number; shape: "cubic" | "quintic" | "trapezoid" }[];
}

/** A pose of the arm from per-joint fractions of its travel, kept 20% inside both ends. */
function poseOf(arm: ArmDocument, fractions: readonly number[]): number[] {
  return arm.joints.map((joint, j) => {
    const u = fractions[j] ?? 0.5;
    return joint.min + (0.2 + 0.6 * u) * (joint.max - joint.min);
  });
}

const shapes = ["quintic", "cubic", "trapezoid"] as const;

/**
 * `moves` moves of `durationS` each on `arm`, from a fixed pose; each goal a smooth function of the
 * move's index, so the plan is the same on every run and on every machine.
 */
function sequence(arm: ArmDocument, moves: number, durationS: number, keepOut: PlanDocument["keepOut"]): PlanDocument {
  const goal = (i: number) =>
    poseOf(
      arm,
      arm.joints.map((_, j) => 0.5 + 0.4 * Math.sin(0.9 * i + 1.3 * j)),
    );
  return {
    format: "jointproof.plan",
    version: 1,
    arm,
    start: poseOf(arm, []),
    ...(keepOut ? { keepOut } : {}),
    moves: Array.from({ length: moves }, (_, i) => ({
      goal: goal(i),
      duration: durationS,
      shape: shapes[i % shapes.length],
    })),
  };
}

/** The one keep-out box of the engine benchmarks: a tray beside the arm, on the work surface. */
export const benchKeepOut = [{ name: "tray", min: [0.3, -0.15, 0], max: [0.45, 0.15, 0.08] }];

/** `moves` moves of 2 s on the heavy demo arm with one keep-out box. */
export function heavyPlan(moves: number): PlanDocument {
  return sequence(armH, moves, 2, benchKeepOut);
}

/** The API benchmark's plan: 5 moves of 2 s on the light demo arm with its chain. */
export function lightPlan(): PlanDocument {
  return sequence(armL as ArmDocument, 5, 2, undefined);
}

/**
 * A copy of `document` whose keep-out box is moved by `offsetM` (m): a different plan by content,
 * so nothing cached from an earlier check is reused (a cold, full check).
 */
export function coldCopy(document: PlanDocument, offsetM: number): PlanDocument {
  const boxes = document.keepOut ?? benchKeepOut;
  return {
    ...document,
    keepOut: boxes.map((b) => ({ ...b, min: b.min.map((v) => v + offsetM), max: b.max.map((v) => v + offsetM) })),
  };
}

/**
 * A fixed CPU calibration loop (floating-point recurrence, no allocation), run beside each figure so
 * that a loaded machine shows in the calibration time rather than hiding in the result. Returns its
 * wall-clock milliseconds; the `sink` keeps the loop from being optimised away.
 */
export function calibrationLoop(): { ms: number; sink: number } {
  const t0 = performance.now();
  let x = 0.5,
    y = 0.25;
  for (let i = 0; i < 20_000_000; i++) {
    x = x * 0.999999 + y * 1e-6 + 1e-9;
    y = Math.sqrt(x * y + 1e-12);
  }
  return { ms: performance.now() - t0, sink: x + y };
}

/** Sorted-copy percentile (nearest rank) of `values`, p in 0..100. */
export function percentile(values: readonly number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  if (sorted.length === 0) return NaN;
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[rank];
}

/** Median, best and 95th percentile (ms) of a list of timings. */
export function summary(times: readonly number[]): { medianMs: number; bestMs: number; p95Ms: number; runs: number } {
  const round = (v: number) => Number(v.toFixed(3));
  return {
    medianMs: round(percentile(times, 50)),
    bestMs: round(Math.min(...times)),
    p95Ms: round(percentile(times, 95)),
    runs: times.length,
  };
}

/** The engine figures both Node and the browser measure. */
export interface EngineFigures {
  check10: ReturnType<typeof summary>;
  check50: ReturnType<typeof summary>;
  durationChange10: ReturnType<typeof summary>;
  calibrationMs: number;
  findings10: number;
  findings50: number;
}
