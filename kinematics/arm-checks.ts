/**
 * The arm-model checks of a plan, as move checkers for `check()`: `effort-over` (recursive
 * Newton–Euler plus joint friction against `maxEffort`), `clearance` (collision shapes
 * against the work surface and keep-out boxes) and `tool-speed` (tool-point speed against
 * the plan's `maxToolSpeed`). They run only when the arm has a `chain`; a plan without one
 * gets exactly the joint checks. Each move is sampled at the arm's control rate.
 *
 * Per-move figures (`peakEffort` per joint, `peakToolSpeed`) are written into the move
 * context's `figures`, which `check()` copies into the move's report.
 *
 * @module
 */
import type { MoveContext, PlanChecker, MoveChecker } from "./check";
import { chainLimits, compileChain, forwardKinematics, type CompiledChain } from "./chain";
import { clearanceZones, compileCollision, createClearanceScanner, scanClearanceBounded, type ClearanceScanner } from "./clearance";
import { createDynamicsWorkspace, gravityEffort, inverseDynamics, type DynamicsWorkspace } from "./dynamics";
import type { Plan } from "./plan";
import { limitTolerance, severityOf, type Finding } from "./report";
import { moveBlend, scalingAt } from "./shapes";
import { compileReachBounds, linkSpeedBounds, toolAccelerationBound, type ReachBounds } from "./motion-bounds";
import { createToolSpeedScanner, scanToolSpeedBounded, type ToolSpeedScanner } from "./toolspeed";
import { formatDurationUp, formatNumber, formatPercent, jointLabel } from "./wording";

/** Everything the arm checks reuse across the moves of one plan. */
interface ArmState {
  chain: CompiledChain;
  n: number;
  dynamics: DynamicsWorkspace;
  clearance: ClearanceScanner;
  toolSpeed: ToolSpeedScanner;
  /** Distance bounds for the sample-skipping scans of clearance and tool speed. */
  reach: ReachBounds;
  /** Per-link speed bounds (m/s) of the current move, n + 1 values. */
  linkSpeed: Float64Array;
  rateHz: number;
  /** Sample buffers (stride = chain joints), grown as needed. */
  time: Float64Array;
  q: Float64Array;
  qd: Float64Array;
  qdd: Float64Array;
  tau: Float64Array;
  scale: Float64Array;
  /** One-sample scratch for the effort duration search (chain joints). */
  searchQ: Float64Array;
  searchQd: Float64Array;
  searchQdd: Float64Array;
  /** What the state was built from; a plan object edited in place gets a fresh state. */
  source: readonly unknown[];
}

/** The plan parts the compiled state depends on (compared by identity). */
function sourceOf(plan: Plan): unknown[] {
  return [plan.arm, plan.arm.chain, plan.arm.joints, plan.payload, plan.keepOut, plan.surfaceMargin];
}

const states = new WeakMap<Plan, ArmState>();

/** The compiled arm model of a plan, or null when its arm has no chain (cached per plan object). */
function stateOf(plan: Plan): ArmState | null {
  const cached = states.get(plan);
  const source = sourceOf(plan);
  if (cached && cached.source.every((v, i) => v === source[i])) return cached;
  const arm = plan.arm;
  if (!arm.chain) return null;
  const chain = compileChain(arm.chain, arm.joints.map((j) => j.type), plan.payload);
  const n = chain.jointCount;
  const collision = compileCollision(arm.chain);
  const travelM = arm.joints.slice(0, n).map((j) => Math.max(Math.abs(j.min), Math.abs(j.max)));
  const state: ArmState = {
    chain,
    n,
    dynamics: createDynamicsWorkspace(chain, arm.joints.slice(0, n).map((j) => j.friction)),
    clearance: createClearanceScanner(chain, collision, clearanceZones(plan.surfaceMargin ?? 0, plan.keepOut ?? [])),
    toolSpeed: createToolSpeedScanner(chain),
    reach: compileReachBounds(chain, collision, travelM),
    linkSpeed: new Float64Array(n + 1),
    rateHz: arm.controlRateHz,
    time: new Float64Array(0),
    q: new Float64Array(0),
    qd: new Float64Array(0),
    qdd: new Float64Array(0),
    tau: new Float64Array(n),
    scale: new Float64Array(3),
    searchQ: new Float64Array(n),
    searchQd: new Float64Array(n),
    searchQdd: new Float64Array(n),
    source,
  };
  states.set(plan, state);
  return state;
}

/**
 * Samples a rest-to-rest move of duration `durationS` (> 0) at the control rate into the state's
 * buffers (chain joints only) and returns the sample count. q = q₀ + s·D, q̇ = D·s′/T, q̈ = D·s″/T²
 * (chain rule, τ = t/T), the same interpolation as `sampleMoveAt`.
 */
function sampleMove(s: ArmState, context: MoveContext, durationS: number, rateHz = s.rateHz): number {
  const { n } = s;
  const count = Math.floor(durationS * rateHz + 1e-9) + 2; // the grid plus the end sample
  if (s.time.length < count) {
    s.time = new Float64Array(count);
    s.q = new Float64Array(count * n);
    s.qd = new Float64Array(count * n);
    s.qdd = new Float64Array(count * n);
  }
  const shape = context.timeline.shape[context.index];
  const blend = moveBlend(shape, context.delta, durationS, context.arm.joints);
  const { from, delta } = context;
  for (let k = 0; k < count; k++) {
    const t = Math.min(k / rateHz, durationS);
    s.time[k] = t;
    scalingAt(shape, blend, t / durationS, s.scale);
    const v = s.scale[1] / durationS, a = s.scale[2] / (durationS * durationS);
    for (let j = 0; j < n; j++) {
      s.q[k * n + j] = from[j] + s.scale[0] * delta[j];
      s.qd[k * n + j] = delta[j] * v;
      s.qdd[k * n + j] = delta[j] * a;
    }
  }
  return count;
}

/** The rate (Hz) the arm checks sample a move at: the check's `sampleRateHz` option, else the control rate. */
function sampleRateOf(s: ArmState, context: MoveContext): number {
  const r = context.sampleRateHz;
  return r !== undefined && r > 0 && Number.isFinite(r) ? r : s.rateHz;
}

/** Writes the goal pose, at rest, as a single sample (instant moves). */
function sampleGoal(s: ArmState, context: MoveContext): number {
  if (s.time.length < 1) {
    s.time = new Float64Array(2);
    s.q = new Float64Array(2 * s.n);
    s.qd = new Float64Array(2 * s.n);
    s.qdd = new Float64Array(2 * s.n);
  }
  s.time[0] = 0;
  for (let j = 0; j < s.n; j++) {
    s.q[j] = context.goal[j];
    s.qd[j] = 0;
    s.qdd[j] = 0;
  }
  return 1;
}

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

function moveName(context: MoveContext): string {
  return context.instant ? `Instant move ${context.index}` : `Move ${context.index}`;
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
    const label = `${moveName(context)}, ${jointLabel(joint)}`;
    const level =
      severity === "fault"
        ? `above its limit of ${formatNumber(joint.maxEffort)} ${unit}`
        : `above ${formatPercent(arm.cautionRatio)} of its limit of ${formatNumber(joint.maxEffort)} ${unit}`;
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
        `${severity === "fault" ? "above its limit" : `above ${formatPercent(arm.cautionRatio)} of its limit`} of ${formatNumber(joint.maxEffort)} ${unit}; ` +
        `no duration fixes it. Start from a pose that keeps the load closer to the joint.`,
      timeS: 0,
    });
  }
};

/**
 * A `clearance` finding: names the link and the zone, and the time of the deepest intrusion both
 * from the move's start (`time`, s, kept for older callers) and from the plan's start (`timeS`).
 */
export type ClearanceFinding = Finding & { link: string; zone: string; time: number; timeS: number };

/**
 * Move checker `clearance`: every link's collision shapes against the work surface (plus the
 * plan's `surfaceMargin`) and the plan's keep-out boxes, at every sample. One fault per link and
 * zone with the deepest intrusion (m) and its time. The path does not depend on the duration.
 * An instant move is checked at its goal pose only (the controller's path for a jump is not modelled).
 */
export const checkClearance: MoveChecker = (context, out) => {
  const s = stateOf(context.plan);
  if (!s) return;
  const count = context.instant ? sampleGoal(s, context) : sampleMove(s, context, context.move.duration, sampleRateOf(s, context));
  // Links move at most linkSpeed m/s (from the move's peak joint speeds), so samples between two
  // provably clear ones are skipped; the result equals the full scan (see scanClearanceBounded).
  // An instant move has one sample and no peak speeds to bound with.
  const speeds = context.instant ? s.linkSpeed.fill(Infinity) : linkSpeedBounds(s.reach, s.chain, context.peakVelocity, s.linkSpeed);
  const hits = scanClearanceBounded(s.clearance, s.q, s.n, s.time, count, speeds);
  const margin = context.plan.surfaceMargin ?? 0;
  for (const h of hits) {
    const into =
      h.zone < 0
        ? margin > 0
          ? `${formatNumber(h.depthM * 1000)} mm into the ${formatNumber(margin * 1000)} mm margin above the work surface`
          : `${formatNumber(h.depthM * 1000)} mm into the work surface`
        : `${formatNumber(h.depthM * 1000)} mm into ${h.zoneName}`;
    const span = h.firstTimeS === h.lastTimeS ? `at ${formatNumber(h.timeS)} s` : `from ${formatNumber(h.firstTimeS)} s to ${formatNumber(h.lastTimeS)} s, deepest at ${formatNumber(h.timeS)} s`;
    const finding: ClearanceFinding = {
      kind: "clearance",
      severity: "fault",
      move: context.index,
      joint: null,
      value: h.depthM,
      limit: 0,
      link: h.linkName,
      zone: h.zone < 0 ? "work surface" : h.zoneName,
      time: h.timeS,
      message:
        `${moveName(context)}: link "${h.linkName}" goes ${into} ${span}; on the hardware the arm will hit it. ` +
        `The path does not depend on the duration, so a longer move does not help: change the goal or add a waypoint that keeps the link clear.`,
      timeS: context.startS + h.timeS,
    };
    out.push(finding);
  }
};

/**
 * Move checker `tool-speed`: peak tool-point speed (m/s) against the plan's `maxToolSpeed`
 * (fault above it, caution above cautionRatio × it). Tool speed scales as 1/duration on the
 * same path, so the fix is duration × peak / limit. For an instant move the tool must cover its
 * whole displacement in one control period.
 */
export const checkToolSpeed: MoveChecker = (context, out) => {
  const s = stateOf(context.plan);
  if (!s) return;
  let peak: number, at: number;
  if (context.instant) {
    // |Δp_tool| × control rate: the step is covered in one control period.
    const t = forwardKinematics(s.chain, context.from, s.toolSpeed.buffers);
    const x0 = t[12], y0 = t[13], z0 = t[14];
    forwardKinematics(s.chain, context.goal, s.toolSpeed.buffers);
    peak = Math.hypot(t[12] - x0, t[13] - y0, t[14] - z0) * context.arm.controlRateHz;
    at = 0;
  } else {
    const count = sampleMove(s, context, context.move.duration, sampleRateOf(s, context));
    // The tool speed changes at most accelBound m/s² (from the move's peak joint speeds and
    // accelerations), so only the stretches that could hold the peak are evaluated sample by sample.
    const accelBound = toolAccelerationBound(s.reach, s.chain, context.peakVelocity, context.peakAcceleration ?? context.peakVelocity.map(() => Infinity));
    const r = scanToolSpeedBounded(s.toolSpeed, s.q, s.qd, s.n, s.time, count, accelBound);
    peak = r.peakSpeed;
    at = r.timeS;
  }
  if (context.figures) context.figures.peakToolSpeed = peak;
  const limit = context.plan.maxToolSpeed;
  if (limit === undefined) return;
  const severity = severityOf(peak, limit, context.arm.cautionRatio);
  if (!severity) return;
  const level = severity === "fault" ? `above the plan's limit of ${formatNumber(limit)} m/s` : `above ${formatPercent(context.arm.cautionRatio)} of the plan's limit of ${formatNumber(limit)} m/s`;
  const stepM = peak / context.arm.controlRateHz; // the tool's straight-line step in one control period
  const fix = context.instant
    ? `Give it a duration: covering ${formatNumber(stepM * 1000)} mm at ${formatNumber(limit)} m/s takes at least ${formatDurationUp(stepM / limit)}, and a rest-to-rest shape needs longer; check again.`
    : `Lengthen it to at least ${formatDurationUp((context.move.duration * peak) / limit)} (tool speed falls in proportion to the duration).`;
  out.push({
    kind: "tool-speed",
    severity,
    move: context.index,
    joint: null,
    value: peak,
    limit,
    message: context.instant
      ? `${moveName(context)}: the tool point would jump ${formatNumber(stepM * 1000)} mm in one control period, ${formatNumber(peak)} m/s, ${level}. ${fix}`
      : `${moveName(context)}: the tool point reaches ${formatNumber(peak)} m/s at ${formatNumber(at)} s, ${level}. ${fix}`,
    timeS: context.startS + at,
  });
};

/** The arm-model move checkers, in report order. */
export const armMoveCheckers: readonly MoveChecker[] = [checkEffort, checkClearance, checkToolSpeed];

/** The arm-model plan checkers. */
export const armPlanCheckers: readonly PlanChecker[] = [checkStartEffort];

/** Joint travel of the chain joints (for IK), from a plan arm. */
export function planChainLimits(plan: Plan) {
  return chainLimits(plan.arm.joints, plan.arm.chain?.joints.length ?? 0);
}
