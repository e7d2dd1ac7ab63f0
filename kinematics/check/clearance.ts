/**
 * `clearance`: every link's collision shapes against the work surface (plus the plan's margin)
 * and the plan's keep-out boxes.
 *
 * @module
 */
import { linkSpeedBounds } from "../arm/motion-bounds";
import { certifyClearPath, scanClearanceBounded } from "../arm/clearance";
import { scalingAt, speedShareOn, velocityFactor } from "../motion/shapes";
import type { Finding } from "./report";
import { sampleGoal, sampleMove, sampleRateOf, stateOf, type ArmState } from "./arm-state";
import type { MoveChecker, MoveContext } from "./types";
import { formatNumber, moveLabel } from "./wording";

/**
 * A `clearance` finding: names the link and the zone, and the time of the deepest intrusion both
 * from the move's start (`time`, s) and from the plan's start (`timeS`).
 */
export type ClearanceFinding = Finding & { link: string; zone: string; time: number; timeS: number };

/** Whether each path (by shape, blend, start and displacement) is certified clear, per compiled arm. */
const clearPaths = new WeakMap<ArmState, Map<string, boolean>>();
const maxClearPaths = 512;

/**
 * Whether the timed move's path is provably clear along its whole length (see `certifyClearPath`):
 * the path, and so the answer, does not depend on the duration, so it is computed once per path
 * and a change of duration needs no clearance scan. Links move at most linkSpeed m per unit τ,
 * from the peak joint speeds at T = 1 (q = q₀ + s(τ)·D, dq/dτ = D·s′(τ)).
 */
function pathCertifiedClear(s: ArmState, context: MoveContext): boolean {
  const shape = context.timeline.shape[context.index];
  const blend = context.timeline.blend[context.index];
  const { from, delta } = context;
  let key = `${shape}|${blend}`;
  for (let i = 0; i < s.n; i++) key += `|${from[i]}|${delta[i]}`;
  let paths = clearPaths.get(s);
  if (!paths) clearPaths.set(s, (paths = new Map()));
  const known = paths.get(key);
  if (known !== undefined) return known;
  // peak |dq/dτ| = |Dⱼ|·max s′ (the shape's velocity factor), with a margin for rounding
  const perTau = Float64Array.from(
    { length: s.n },
    (_, i) => Math.abs(delta[i]) * velocityFactor(shape, blend) * (1 + 1e-6),
  );
  const speeds = linkSpeedBounds(s.reach, s.chain, perTau, new Float64Array(s.n + 1));
  const scale = new Float64Array(3);
  // on [a, b] the path moves at most this share of its peak speed along τ (with the same rounding margin)
  const share = (a: number, b: number) => Math.min(1, speedShareOn(shape, blend, a, b, scale) * (1 + 1e-6));
  const clear = certifyClearPath(
    s.clearance,
    (tau, q) => {
      scalingAt(shape, blend, tau, scale);
      for (let i = 0; i < s.n; i++) q[i] = from[i] + scale[0] * delta[i];
    },
    speeds,
    16,
    share,
  );
  paths.set(key, clear);
  if (paths.size > maxClearPaths) paths.delete(paths.keys().next().value as string);
  return clear;
}

/**
 * Move checker `clearance`: every link's collision shapes against the work surface (plus the
 * plan's `surfaceMargin`) and the plan's keep-out boxes, at every sample. One fault per link and
 * zone with the deepest intrusion (m) and its time. The path does not depend on the duration.
 * An instant move is checked at its goal pose only (the controller's path for a jump is not modelled).
 */
export const checkClearance: MoveChecker = (context, out) => {
  const s = stateOf(context.plan);
  if (!s) return;
  // a path certified clear has no intrusion at any sample (the control-rate mode scans regardless)
  if (!context.instant && context.sampling === "path" && pathCertifiedClear(s, context)) return;
  const count = context.instant
    ? sampleGoal(s, context)
    : sampleMove(s, context, context.move.duration, sampleRateOf(s, context));
  // Links move at most linkSpeed m/s (from the move's peak joint speeds), so samples between two
  // provably clear ones are skipped; the result equals the full scan (see scanClearanceBounded).
  // An instant move has one sample and no peak speeds to bound with.
  const speeds = context.instant
    ? s.linkSpeed.fill(Infinity)
    : linkSpeedBounds(s.reach, s.chain, context.peakVelocity, s.linkSpeed);
  const hits = scanClearanceBounded(s.clearance, s.q, s.n, s.time, count, speeds);
  const margin = context.plan.surfaceMargin ?? 0;
  for (const h of hits) {
    const into =
      h.zone < 0
        ? margin > 0
          ? `${formatNumber(h.depthM * 1000)} mm into the ${formatNumber(margin * 1000)} mm margin above the work surface`
          : `${formatNumber(h.depthM * 1000)} mm into the work surface`
        : `${formatNumber(h.depthM * 1000)} mm into ${h.zoneName}`;
    const span =
      h.firstTimeS === h.lastTimeS
        ? `at ${formatNumber(h.timeS)} s`
        : `from ${formatNumber(h.firstTimeS)} s to ${formatNumber(h.lastTimeS)} s, deepest at ${formatNumber(h.timeS)} s`;
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
        `${moveLabel(context.index, context.instant)}: link "${h.linkName}" goes ${into} ${span}; on the hardware the arm would hit it. ` +
        `The path does not depend on the duration, so a longer move does not help: change the goal or add a waypoint that keeps the link clear.`,
      timeS: context.startS + h.timeS,
    };
    out.push(finding);
  }
};
