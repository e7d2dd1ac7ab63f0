/**
 * The sentence for a move that no duration fixes, shared by every timing-dependent check so that
 * their messages agree with the report's `minSafeDuration` (null).
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { longestTimingFixS, type SafeDuration } from "./safe-duration";
import { formatNumber, formatQuantity, jointLabel } from "./wording";

/** Why no duration fixes a move, and what would: a different pose or path, a lighter payload, the other tool. */
export function noTimingFix(arm: Arm, safe: SafeDuration): string {
  const joint = safe.joint >= 0 ? arm.joints[safe.joint] : undefined;
  if (safe.beyondTravel && joint) {
    return (
      `No duration fixes this move: it moves ${jointLabel(joint)} farther than its whole travel ` +
      `(${formatQuantity(joint.min, joint, "position")} to ${formatQuantity(joint.max, joint, "position")}), so it starts or ends outside it. ` +
      `Change its goal or the pose before it.`
    );
  }
  if (safe.check === "effort" && joint && safe.gravityEffort !== undefined) {
    const unit = joint.type === "prismatic" ? "N" : "N·m";
    return (
      `No duration fixes this move: on its path gravity alone needs ${formatNumber(safe.gravityEffort)} ${unit} at ${jointLabel(joint)}, ` +
      `above its limit of ${formatNumber(joint.maxEffort ?? 0)} ${unit}. Choose a pose or path that keeps the load closer to the joint, carry less, or use the lighter tool.`
    );
  }
  return (
    `No duration up to ${formatNumber(longestTimingFixS)} s fixes this move (friction or the load keep it over a limit); ` +
    `change its goal or its path, carry less, or use the lighter tool.`
  );
}
