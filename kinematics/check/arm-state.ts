/**
 * The compiled arm model the arm-model checks share across the moves of one plan (chain,
 * dynamics workspace, clearance and tool-speed scanners, sample buffers), cached per plan object,
 * and the sampling of a move into its buffers. The checks run only when the arm has a `chain`;
 * a plan without one gets exactly the joint checks.
 *
 * @module
 */
import { chainLimits, compileChain, type CompiledChain } from "../arm/chain";
import { clearanceZones, compileCollision, createClearanceScanner, type ClearanceScanner } from "../arm/clearance";
import { createDynamicsWorkspace, type DynamicsWorkspace } from "../arm/dynamics";
import type { Plan } from "../plan/document";
import { moveBlend, scalingAt } from "../motion/shapes";
import { compileReachBounds, type ReachBounds } from "../arm/motion-bounds";
import { createToolSpeedScanner, type ToolSpeedScanner } from "../arm/tool-speed";
import type { MoveContext } from "./types";
import type { MovePath, PathSegment } from "./move-path";

/** Everything the arm checks reuse across the moves of one plan. */
export interface ArmState {
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
  /** Cached path terms of the moves checked with this arm (see move-path.ts). */
  paths: Map<string, MovePath>;
  /** Cached path terms by geometric segment (start and displacement), shared by every shape and duration. */
  segments: Map<string, PathSegment>;
  /** Scratch for one channel's values at the path grid points. */
  pathValues: Float64Array;
  /** What the state was built from; a plan object edited in place gets a fresh state. */
  source: readonly unknown[];
}

/** The plan parts the compiled state depends on (compared by identity). */
function sourceOf(plan: Plan): unknown[] {
  return [plan.arm, plan.arm.chain, plan.arm.joints, plan.payload, plan.keepOut, plan.surfaceMargin];
}

const states = new WeakMap<Plan, ArmState>();

/**
 * States by the content of what they were built from, so that a plan rebuilt after an edit (or
 * copied to a worker) finds its compiled arm and cached paths again; the oldest are dropped.
 */
const statesByContent = new Map<string, ArmState>();
const maxStatesByContent = 8;

/**
 * The compiled arm model of a plan, or null when its arm has no chain (cached per plan object, and
 * by content across plan objects).
 */
export function stateOf(plan: Plan): ArmState | null {
  const cached = states.get(plan);
  const source = sourceOf(plan);
  if (cached && cached.source.every((v, i) => v === source[i])) return cached;
  const arm = plan.arm;
  if (!arm.chain) return null;
  const contentKey = JSON.stringify(source);
  const same = statesByContent.get(contentKey);
  if (same) {
    statesByContent.delete(contentKey);
    statesByContent.set(contentKey, same);
    same.source = source;
    states.set(plan, same);
    return same;
  }
  const chain = compileChain(
    arm.chain,
    arm.joints.map((j) => j.type),
    plan.payload,
  );
  const n = chain.jointCount;
  const collision = compileCollision(arm.chain);
  const travelM = arm.joints.slice(0, n).map((j) => Math.max(Math.abs(j.min), Math.abs(j.max)));
  const state: ArmState = {
    chain,
    n,
    dynamics: createDynamicsWorkspace(
      chain,
      arm.joints.slice(0, n).map((j) => j.friction),
    ),
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
    paths: new Map(),
    segments: new Map(),
    pathValues: new Float64Array(0),
    source,
  };
  states.set(plan, state);
  statesByContent.set(contentKey, state);
  if (statesByContent.size > maxStatesByContent) statesByContent.delete(statesByContent.keys().next().value as string);
  return state;
}

/**
 * Samples a rest-to-rest move of duration `durationS` (> 0) at the control rate into the state's
 * buffers (chain joints only) and returns the sample count. q = q₀ + s·D, q̇ = D·s′/T, q̈ = D·s″/T²
 * (chain rule, τ = t/T), the same interpolation as `sampleMoveAt`.
 */
export function sampleMove(s: ArmState, context: MoveContext, durationS: number, rateHz = s.rateHz): number {
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
    const v = s.scale[1] / durationS,
      a = s.scale[2] / (durationS * durationS);
    for (let j = 0; j < n; j++) {
      s.q[k * n + j] = from[j] + s.scale[0] * delta[j];
      s.qd[k * n + j] = delta[j] * v;
      s.qdd[k * n + j] = delta[j] * a;
    }
  }
  return count;
}

/** The rate (Hz) the arm checks sample a move at: the check's `sampleRateHz` option, else the control rate. */
export function sampleRateOf(s: ArmState, context: MoveContext): number {
  const r = context.sampleRateHz;
  return r !== undefined && r > 0 && Number.isFinite(r) ? r : s.rateHz;
}

/** Writes the goal pose, at rest, as a single sample (instant moves). */
export function sampleGoal(s: ArmState, context: MoveContext): number {
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

/** Joint travel of the chain joints (for IK), from a plan arm. */
export function planChainLimits(plan: Plan) {
  return chainLimits(plan.arm.joints, plan.arm.chain?.joints.length ?? 0);
}
