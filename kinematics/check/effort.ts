/**
 * `effort-over`: recursive Newton–Euler plus joint friction against `maxEffort`, along each move
 * and at the start pose; and the shortest duration that brings a move's effort within its limit.
 * Per-move peaks are written into the move context's `figures` (copied into the move's report).
 *
 * @module
 */
import { gravityEffort, inverseDynamics } from "../arm/dynamics";
import { limitTolerance, severityOf } from "./report";
import { moveBlend, scalingAt } from "../motion/shapes";
import { sampleGoal, sampleMove, sampleRateOf, stateOf, type ArmState } from "./arm-state";
import type { MoveChecker, MoveContext, PlanChecker } from "./types";
import { formatDurationUp, formatNumber, formatPercent, jointLabel, limitLevel, moveLabel } from "./wording";

/** Peak |τⱼ| over the sampled move into `peak`, and the time of each peak into `at`. */
function effortPeaks(s: ArmState, count: number, peak: Float64Array, at: Float64Array, gravityOnly = false): void {
  peak.fill(0);
  at.fill(0);
  for (let k = 0; k < count; k++) {
    if (gravityOnly) gravityEffort(s.chain, s.dynamics, s.q, s.tau, k * s.n);
    else inverseDynamics(s.chain, s.dynamics, s.q, s.qd, s.qdd, s.tau, k * s.n);
    for (let j = 0; j < s.n; j++) {
      const v = Math.abs(s.tau[j]);
      if (v > peak[j]) {
        peak[j] = v;
        at[j] = s.time[k];
      }
    }
  }
}

function effortUnit(type: "revolute" | "prismatic"): string {
  return type === "prismatic" ? "N" : "N·m";
}

/**
 * Move checker `effort-over`: the peak joint effort along the move (rigid-body dynamics with
 * payload, plus friction) against each joint's `maxEffort` (fault above it, caution above
 * cautionRatio × it). When gravity alone exceeds the limit, the message says no duration fixes
 * it; otherwise it names the shortest duration (found by bisection) that passes.
 */
export const checkEffort: MoveChecker = (context, out) => {
  const s = stateOf(context.plan);
  if (!s) return;
  const { arm } = context;
  const n = s.n;
  const peak = new Float64Array(n), at = new Float64Array(n);
  const count = context.instant ? sampleGoal(s, context) : sampleMove(s, context, context.move.duration, sampleRateOf(s, context));
  effortPeaks(s, count, peak, at);
  const figures = context.figures;
  if (figures) figures.peakEffort = arm.joints.map((_, j) => (j < n ? peak[j] : null));
  const startS = context.startS;
  const gPeak = new Float64Array(n), gAt = new Float64Array(n);
  let gravityDone = false;
  for (let j = 0; j < n; j++) {
    const joint = arm.joints[j];
    if (joint.maxEffort === undefined) continue;
    const severity = severityOf(peak[j], joint.maxEffort, arm.cautionRatio);
    if (!severity) continue;
    if (!gravityDone) {
      effortPeaks(s, count, gPeak, gAt, true);
      gravityDone = true;
    }
    const unit = effortUnit(joint.type);
    const label = `${moveLabel(context.index, context.instant)}, ${jointLabel(joint)}`;
    const level = limitLevel(severity, arm.cautionRatio, `${formatNumber(joint.maxEffort)} ${unit}`);
    let fix: string;
    const gravitySeverity = severityOf(gPeak[j], joint.maxEffort, arm.cautionRatio);
    if (gravitySeverity === severity || gravitySeverity === "fault") {
      fix =
        `Gravity alone needs ${formatNumber(gPeak[j])} ${unit} at ${formatNumber(gAt[j])} s to hold the arm there, so no duration fixes it: ` +
        `choose a pose that keeps the load closer to the joint, or carry less.`;
    } else if (context.instant) {
      fix = `Hold the goal pose for less load or reach it with a timed move.`;
    } else {
      const ok = shortestEffortDuration(s, context, j, severity === "fault" ? 1 : arm.cautionRatio);
      fix = ok
        ? `Lengthen the move to at least ${formatDurationUp(ok)} to stay ${severity === "fault" ? "within the limit" : `below ${formatPercent(arm.cautionRatio)} of it`}.`
        : `No duration up to 64 times longer fixes it; friction and gravity dominate.`;
    }
    const outcome = severity === "fault" ? "; the motor cannot deliver it and the controller will stop the arm. " : ". ";
    out.push({
      kind: "effort-over",
      severity,
      move: context.index,
      joint: j,
      value: peak[j],
      limit: joint.maxEffort,
      message: `${label}: peak effort ${formatNumber(peak[j])} ${unit} at ${formatNumber(at[j])} s is ${level}${outcome}${fix}`,
      timeS: startS + at[j],
    });
  }
};

/** Points of the τ grid the effort duration search solves on (the answer is confirmed at the control rate). */
const effortSearchPoints = 400;

/**
 * Shortest duration (s) at which joint j's peak effort stays within ratio × maxEffort; null past 64 T.
 *
 * Along a fixed path the effort at one point τ of the move splits by how it scales with the
 * duration T (derived from the Newton–Euler equations with q̇ = D·s′/T, q̈ = D·s″/T²):
 * inertial and Coriolis terms ∝ 1/T², viscous friction ∝ 1/T, gravity and Coulomb friction
 * constant: τ(x) = a·x² + b·x + c with x = 1/T. One Newton–Euler pass without gravity or
 * friction at "T = 1" gives a, the joint's coefficients give b and c, and the smallest positive
 * root of a·x² + b·x + c = ±limit over the grid gives the candidate. The smoothed Coulomb sign
 * and the trapezoid's blend depend on T, so the candidate is refined until it settles, then
 * confirmed on the samples the check itself uses (stepping up by 0.5%); should that not settle
 * (a trapezoid whose blend keeps changing), a bisection on those samples decides.
 */
function shortestEffortDuration(s: ArmState, context: MoveContext, j: number, ratio: number): number | null {
  const joint = context.arm.joints[j];
  const limit = joint.maxEffort! * ratio;
  const T0 = context.move.duration;
  const { n, chain, dynamics } = s;
  const fv = dynamics.viscous[j], fc = dynamics.coulomb[j], eps = dynamics.signEpsilon;
  const shape = context.timeline.shape[context.index];
  const { from, delta } = context;
  const q = s.searchQ, qd = s.searchQd, qdd = s.searchQdd, tau = s.tau;
  let T = T0;
  for (let round = 0; round < 8; round++) {
    const blend = moveBlend(shape, delta, T, context.arm.joints);
    let xBest = 1 / T0;
    for (let k = 0; k <= effortSearchPoints; k++) {
      scalingAt(shape, blend, k / effortSearchPoints, s.scale);
      for (let i = 0; i < n; i++) {
        q[i] = from[i] + s.scale[0] * delta[i];
        qd[i] = delta[i] * s.scale[1]; // velocity at T = 1
        qdd[i] = delta[i] * s.scale[2];
      }
      inverseDynamics(chain, dynamics, q, qd, qdd, tau, 0, 0, false, false);
      const a = tau[j];
      gravityEffort(chain, dynamics, q, tau);
      const b = fv * qd[j];
      const c = tau[j] + fc * Math.tanh(qd[j] / (T * eps)); // Coulomb sign as at the current candidate
      if (Math.abs(c) > limit) return null; // gravity and Coulomb friction alone exceed it: no duration helps
      const x = Math.min(firstRoot(a, b, c - limit), firstRoot(a, b, c + limit));
      if (x < xBest) xBest = x;
    }
    const next = 1 / xBest;
    if (Math.abs(next - T) <= 1e-9 * T) break;
    T = next;
  }
  const peak = new Float64Array(n), at = new Float64Array(n);
  const passes = (duration: number, rateHz: number) => {
    effortPeaks(s, sampleMove(s, context, duration, rateHz), peak, at);
    return peak[j] <= limit * (1 + limitTolerance);
  };
  const rate = sampleRateOf(s, context);
  if (T <= 64 * T0) {
    // confirm on the check's own samples: step up by 0.5% until they pass
    for (let k = 0; k < 20; k++, T *= 1.005) if (passes(T, rate)) return T;
  }
  // fallback: bisection on coarser samples (at most 4000 per try), then the same confirmation
  const coarse = (duration: number) => passes(duration, Math.min(rate, 4000 / duration));
  let lo = T0, hi = T0 * 2;
  while (!coarse(hi)) {
    lo = hi;
    hi *= 2;
    if (hi > 64 * T0) return null;
  }
  for (let it = 0; it < 30 && hi - lo > 1e-4; it++) {
    const mid = (lo + hi) / 2;
    if (coarse(mid)) hi = mid;
    else lo = mid;
  }
  for (let k = 0; k < 20; k++, hi *= 1.005) if (passes(hi, rate)) return hi;
  return null;
}

/** The smallest x > 0 with a·x² + b·x + c = 0, or Infinity (the caller's c keeps the sign of no root at 0). */
function firstRoot(a: number, b: number, c: number): number {
  if (Math.abs(a) < 1e-300) {
    const x = b !== 0 ? -c / b : Infinity;
    return x > 0 ? x : Infinity;
  }
  const disc = b * b - 4 * a * c;
  if (disc < 0) return Infinity;
  const r = Math.sqrt(disc);
  // numerically stable pair of roots (Press et al., Numerical Recipes, §5.6)
  const qv = -0.5 * (b + (b >= 0 ? r : -r));
  const x1 = qv / a, x2 = qv !== 0 ? c / qv : Infinity;
  let best = Infinity;
  if (x1 > 0 && x1 < best) best = x1;
  if (x2 > 0 && x2 < best) best = x2;
  return best;
}

/**
 * Plan checker `effort-over` for the start pose: gravity alone at the start pose against
 * maxEffort (the arm must hold it before the first move).
 */
export const checkStartEffort: PlanChecker = ({ plan, arm }, out) => {
  const s = stateOf(plan);
  if (!s) return;
  gravityEffort(s.chain, s.dynamics, plan.start, s.tau);
  for (let j = 0; j < s.n; j++) {
    const joint = arm.joints[j];
    if (joint.maxEffort === undefined) continue;
    const v = Math.abs(s.tau[j]);
    const severity = severityOf(v, joint.maxEffort, arm.cautionRatio);
    if (!severity) continue;
    const unit = effortUnit(joint.type);
    out.push({
      kind: "effort-over",
      severity,
      move: null,
      joint: j,
      value: v,
      limit: joint.maxEffort,
      message:
        `The start pose: ${jointLabel(joint)} needs ${formatNumber(v)} ${unit} against gravity to hold it, ` +
        `${limitLevel(severity, arm.cautionRatio, `${formatNumber(joint.maxEffort)} ${unit}`)}; ` +
        `no duration fixes it. Start from a pose that keeps the load closer to the joint.`,
      timeS: 0,
    });
  }
};

