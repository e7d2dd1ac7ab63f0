/**
 * `clearance`: every link's collision shapes against the work surface (plus the plan's margin)
 * and the plan's keep-out boxes.
 *
 * @module
 */
import { linkSpeedBounds } from "../arm/motion-bounds";
import { scanClearanceBounded } from "../arm/clearance";
import type { Finding } from "./report";
import { sampleGoal, sampleMove, sampleRateOf, stateOf } from "./arm-state";
import type { MoveChecker } from "./types";
import { formatNumber, moveLabel } from "./wording";

/**
 * A `clearance` finding: names the link and the zone, and the time of the deepest intrusion both
 * from the move's start (`time`, s) and from the plan's start (`timeS`).
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
