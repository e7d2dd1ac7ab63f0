/**
 * The checkers `check()` runs by default, in report order: the joint checks, then the arm-model
 * checks (effort, clearance, tool speed), which do nothing for an arm without a chain.
 *
 * @module
 */
import { checkClearance } from "./clearance";
import { checkEffort, checkStartEffort } from "./effort";
import { checkAcceleration, checkGoalRange, checkSpeed, checkStartRange } from "./joint-checks";
import { checkToolSpeed } from "./tool-speed";
import type { MoveChecker, PlanChecker } from "./types";

/** The arm-model move checkers, in report order. */
export const armMoveCheckers: readonly MoveChecker[] = [checkEffort, checkClearance, checkToolSpeed];

/** The arm-model plan checkers. */
export const armPlanCheckers: readonly PlanChecker[] = [checkStartEffort];

/** The plan checkers {@link check} runs by default. */
export const defaultPlanCheckers: readonly PlanChecker[] = [checkStartRange, ...armPlanCheckers];

/** The move checkers {@link check} runs by default, in report order. */
export const defaultMoveCheckers: readonly MoveChecker[] = [
  checkGoalRange,
  checkSpeed,
  checkAcceleration,
  ...armMoveCheckers,
];
