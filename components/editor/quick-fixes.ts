/**
 * Which one-click fix each finding offers, decided without React so it can be tested with real engine
 * reports and run in the check worker. Every fix is applied to a copy of the plan and checked before it
 * is offered; a fix that would leave its move faulting, or add a fault anywhere, is not offered.
 *
 * - A timing fault (speed, acceleration, jump, effort, tool speed) on a move offers "this move only":
 *   the move set to the report's `minSafeDuration` (the engine's shortest duration that passes every
 *   timing-dependent check), rounded up to the millisecond. It never shortens a faulting move.
 * - "Whole plan, one factor" comes from the engine's `scaleToPass` and is offered only when the scaled
 *   copy has no fault and the factor stretches the plan.
 * - A fault that no duration fixes (travel, clearance, effort when `minSafeDuration` is null) offers no
 *   timing fix and says what would fix it.
 * - A move that already passes is only ever shortened to its shortest passing duration, never stretched,
 *   except by the whole-plan factor the user chooses.
 */
import {
  check,
  moveLabel,
  scaleToPass,
  type Finding,
  type FindingKind,
  type Plan,
  type Report,
  type Verdict,
} from "@/kinematics";
import { kindWords } from "@/components/findings/finding-time";
import { ceilToMs, formatJointValue, type AngleUnit } from "@/lib/shared/units";
import { planReducer, type BenchPlan, type PlanAction } from "./plan-state";

/** Finding kinds whose value depends on the move's duration: a longer duration can clear them. */
export const timingKinds: ReadonlySet<FindingKind> = new Set<FindingKind>([
  "speed-over",
  "accel-over",
  "jump",
  "effort-over",
  "tool-speed",
]);

/** One verified fix: the edit to dispatch, what it is, and what the checked copy showed. */
export interface QuickFix {
  /** `move`: this move only; `plan`: every move's duration × one factor; `pose`: one joint value. */
  scope: "move" | "plan" | "pose";
  /** The move the fix edits (`null` for the start pose and for the whole plan). */
  move: number | null;
  action: PlanAction;
  /** The plan's verdict after the fix, from the check of the copy. */
  verdictAfter: Verdict;
  /** Faults left in the whole plan after the fix. */
  faultsAfter: number;
  /** `plan` only: the timing factor every duration is multiplied by. */
  factor: number | null;
}

/** What one finding offers: verified fixes, and in words what would fix it when no duration does. */
export interface FindingFixes {
  fixes: QuickFix[];
  /** One or two sentences on what fixes it; `null` when a listed fix is the whole answer. */
  remedy: string | null;
}

/** The fixes of one report. */
export interface QuickFixes {
  /** Index-aligned with `report.findings`. */
  findings: FindingFixes[];
  /**
   * Per move: the move set to its shortest passing duration, when that is verified. For a faulting move
   * it stretches the move; for a passing one it shortens it (tuning); `null` otherwise.
   */
  moves: (QuickFix | null)[];
  /** "Whole plan, one factor", only when the scaled copy has no fault. */
  plan: QuickFix | null;
  /** Faults that no duration fixes (travel, clearance, effort with no passing duration). */
  untimed: number;
}

/** A check of a plan: the engine's full `check` unless a test or a caller passes its own options. */
export type PlanCheck = (plan: Plan) => Report;

/** At most this many candidate copies are checked per report; the rest are not offered. */
export const maxCandidates = 24;

/** The report's shortest passing duration of a move, or null when no duration passes (or none is known). */
export function shortestPassing(report: Report, move: number): number | null {
  const value: number | null | undefined = report.moves[move]?.minSafeDuration;
  if (value === null || value === undefined || !Number.isFinite(value) || value <= 0) return null;
  return ceilToMs(value);
}

/** Fault counts by move (key -1: the start pose and plan-wide findings). */
function faultsByMove(report: Report): Map<number, number> {
  const counts = new Map<number, number>();
  for (const f of report.findings) {
    if (f.severity !== "fault") continue;
    const key = f.move ?? -1;
    counts.set(key, (counts.get(key) ?? 0) + 1);
  }
  return counts;
}

const faultCount = (report: Report) => report.findings.filter((f) => f.severity === "fault").length;

/** True when no move (nor the start pose) has more faults in `after` than in `before`. */
function noNewFaults(before: Report, after: Report): boolean {
  const was = faultsByMove(before);
  for (const [key, n] of faultsByMove(after)) if (n > (was.get(key) ?? 0)) return false;
  return true;
}

function movePasses(report: Report, move: number): boolean {
  return !report.findings.some((f) => f.move === move && f.severity === "fault");
}

/**
 * The fixes for a plan and its full report. `checkPlan` checks each candidate copy; it must be the
 * same check that produced `report` (the bench passes the engine's full check).
 */
export function quickFixes(plan: BenchPlan, report: Report, checkPlan: PlanCheck = check): QuickFixes {
  let budget = maxCandidates;
  const tryCopy = (action: PlanAction): { copy: BenchPlan; after: Report } | null => {
    if (budget <= 0) return null;
    budget--;
    const copy = planReducer(plan, action);
    if (copy === plan) return null;
    return { copy, after: checkPlan(copy) };
  };
  const asFix = (
    scope: QuickFix["scope"],
    move: number | null,
    action: PlanAction,
    after: Report,
    factor: number | null = null,
  ): QuickFix => ({
    scope,
    move,
    action,
    verdictAfter: after.verdict,
    faultsAfter: faultCount(after),
    factor,
  });

  const moves: (QuickFix | null)[] = plan.moves.map((move, m) => {
    const safe = shortestPassing(report, m);
    if (safe === null) return null;
    const faulting = !movePasses(report, m);
    const hasTimingFault = report.findings.some(
      (f) => f.move === m && f.severity === "fault" && timingKinds.has(f.kind),
    );
    if (faulting && !hasTimingFault) return null; // no duration fixes this move's faults
    // a faulting move is only stretched (or given a duration when instant); a passing one only shortened
    const allowed = faulting
      ? move.duration === 0 || safe > move.duration + 5e-4
      : move.duration > 0 && safe < move.duration - 5e-4;
    if (!allowed) return null;
    const action: PlanAction = { type: "set-duration", index: m, duration: safe };
    const tried = tryCopy(action);
    if (!tried || !movePasses(tried.after, m) || !noNewFaults(report, tried.after)) return null;
    return asFix("move", m, action, tried.after);
  });

  let planFix: QuickFix | null = null;
  if (report.verdict === "fault" && plan.moves.some((m) => m.duration > 0) && budget > 0) {
    const scaled = scaleToPass(plan);
    if (scaled.factor !== null && scaled.factor > 1 + 1e-9) {
      const action: PlanAction = { type: "set-durations", durations: scaled.plan.moves.map((m) => m.duration) };
      const tried = tryCopy(action);
      if (tried && tried.after.verdict !== "fault") planFix = asFix("plan", null, action, tried.after, scaled.factor);
    }
  }

  // A move that no duration makes pass is checked once more at a long duration: a timing fault that
  // is gone there is cleared by time and held back only by the move's other faults; one that is still
  // there (gravity alone over an effort limit, say) no duration fixes.
  const stretched = new Map<number, Report>();
  plan.moves.forEach((move, m) => {
    if (shortestPassing(report, m) !== null) return;
    if (!report.findings.some((f) => f.move === m && f.severity === "fault" && timingKinds.has(f.kind))) return;
    const tried = tryCopy({ type: "set-duration", index: m, duration: Math.max(probeDurationS, 4 * move.duration) });
    if (tried) stretched.set(m, tried.after);
  });

  let untimed = 0;
  const findings: FindingFixes[] = report.findings.map((finding) => {
    if (finding.severity !== "fault") return { fixes: [], remedy: null };
    const fixes: QuickFix[] = [];
    const m = finding.move;
    if (timingKinds.has(finding.kind) && m !== null) {
      const moveFix = moves[m];
      if (moveFix && moveFix.action.type === "set-duration" && moveFix.action.duration > plan.moves[m].duration)
        fixes.push(moveFix);
      if (planFix && plan.moves[m].duration > 0) fixes.push(planFix);
    }
    if (finding.kind === "range" && finding.joint !== null) {
      const action: PlanAction = {
        type: "set-joint",
        target: m === null ? "start" : m,
        joint: finding.joint,
        value: finding.limit,
      };
      const tried = tryCopy(action);
      const cleared =
        tried !== null &&
        !tried.after.findings.some(
          (f) => f.kind === "range" && f.severity === "fault" && f.move === m && f.joint === finding.joint,
        );
      if (tried && cleared && noNewFaults(report, tried.after) && faultCount(tried.after) < faultCount(report)) {
        fixes.push(asFix("pose", m, action, tried.after));
      }
    }
    const atLength = m === null ? undefined : stretched.get(m);
    const noDuration =
      !timingKinds.has(finding.kind) ||
      m === null ||
      (shortestPassing(report, m) === null && (atLength === undefined || persists(finding, atLength)));
    if (noDuration) untimed++;
    return { fixes, remedy: remedyFor(finding, plan, report, fixes.length > 0, atLength) };
  });

  return { findings, moves, plan: planFix, untimed };
}

/** The duration a move is stretched to when probing which of its timing faults time clears, s. */
export const probeDurationS = 20;

/** True when `after` still has a fault of the finding's kind on its move and joint (or link). */
function persists(finding: Finding, after: Report): boolean {
  return after.findings.some(
    (f) =>
      f.severity === "fault" &&
      f.kind === finding.kind &&
      f.move === finding.move &&
      f.joint === finding.joint &&
      f.link === finding.link,
  );
}

/** The joints (or links) of a move whose faults stay at a long duration, by name. */
function heldBack(m: number, plan: BenchPlan, atLength: Report): string {
  const names = new Set<string>();
  for (const f of atLength.findings) {
    if (f.severity !== "fault" || f.move !== m) continue;
    const joint = f.joint === null ? undefined : plan.arm.joints[f.joint];
    names.add(`${joint ? joint.name : f.link ? `link ${f.link}` : "the arm"} (${kindWords[f.kind].toLowerCase()})`);
  }
  return [...names].join(", ") || "another fault";
}

/**
 * What would fix a fault, in one or two sentences; `null` when the offered fix says it all.
 * `atLength` is the check of the plan with this move stretched to a long duration, when no duration
 * passes: it tells a fault that time clears from one it does not.
 */
export function remedyFor(
  finding: Finding,
  plan: BenchPlan,
  report: Report,
  hasFix: boolean,
  atLength?: Report,
): string | null {
  const m = finding.move;
  const joint = finding.joint === null ? undefined : plan.arm.joints[finding.joint];
  const jointName = joint ? joint.name : "the joint";
  const where = m === null ? "the start pose" : `${moveLabel(m, plan.moves[m]?.duration === 0)}`;
  switch (finding.kind) {
    case "range":
      return `No duration fixes this: bring ${jointName} in ${where} back inside its travel${hasFix ? " (the fix sets it to the nearest limit)" : ""}.`;
    case "clearance":
      return `No duration fixes this: choose a different pose or path for ${where} that keeps ${finding.link ? `link ${finding.link}` : "the arm"} clear of ${finding.zone ?? "the zone"}.`;
    default:
      break;
  }
  if (m === null) {
    return `No duration fixes this: holding the start pose against gravity exceeds ${jointName}'s effort limit. Choose a different start pose, a lighter payload or the other tool.`;
  }
  const move = plan.moves[m];
  const safe = shortestPassing(report, m);
  const clearedByTime = safe === null && atLength !== undefined && !persists(finding, atLength);
  if (finding.kind === "jump") {
    const step = `An instant move faults because its step is larger than the joint can travel in one control period (${formatPeriod(plan.arm.controlRateHz)})`;
    if (clearedByTime)
      return `${step}. A duration clears the jump, but ${where} still faults at every duration: ${heldBack(m, plan, atLength)}. Take a smaller step, or fix those first.`;
    if (safe === null) return `${step}. Take a smaller step; no duration of this move passes every check.`;
    return `${step}. Give it a duration (shortest passing: ${safe.toFixed(3)} s${hasFix ? "" : ", once its other faults are fixed"}) or take a smaller step.`;
  }
  if (clearedByTime) {
    return `A longer duration clears this, but ${where} still faults at every duration: ${heldBack(m, plan, atLength)}. Fix those first: a different pose or path, a lighter payload or the other tool.`;
  }
  if (safe === null) {
    if (finding.kind === "effort-over" && atLength !== undefined) {
      return `No duration fixes this: gravity alone holds ${jointName} above its effort limit in ${where}. Choose a different pose or path, a lighter payload or the other tool.`;
    }
    return `No duration of ${where} passes every check: choose a different pose or path.`;
  }
  if (hasFix) return null;
  if (safe <= move.duration + 5e-4) {
    return `A longer duration does not clear this in ${where}: choose a different pose or path, a lighter payload or the other tool.`;
  }
  return `${where} passes its timing checks from ${safe.toFixed(3)} s, but other faults of this move remain at that duration; fix those first.`;
}

function formatPeriod(controlRateHz: number): string {
  return `${Number((1000 / controlRateHz).toPrecision(4))} ms at ${controlRateHz} Hz`;
}

/** The words on a fix's button, in the display unit for a joint value. */
export function fixLabel(fix: QuickFix, plan: BenchPlan, unit: AngleUnit): string {
  const action = fix.action;
  switch (action.type) {
    case "set-duration":
      return `This move only: ${moveLabel(action.index, plan.moves[action.index]?.duration === 0)} to ${action.duration.toFixed(3)} s`;
    case "set-durations":
      return `Whole plan, one factor: durations ×${(fix.factor ?? 1).toFixed(3)}`;
    case "set-joint": {
      const joint = plan.arm.joints[action.joint];
      return `Set ${joint.name} to ${formatJointValue(action.value, joint.type, unit)}`;
    }
    default:
      return "Apply fix";
  }
}
