/**
 * An assignment's rules applied to a plan: the arm's limits tightened by the course's and the
 * assignment's limits (the strictest wins), the engine's check against them, and the rules the
 * engine does not know (required arm revision, start pose, goal poses). Pure: the server runs it at
 * submission time, the student's editor can run the same to preview.
 */
import { check, formatNumber, type Arm, type Plan, type Report } from "@/kinematics";
import type { Limits } from "@/lib/shared/schemas/courses";

/** One assignment rule the plan does not meet. */
export type RuleProblem = { rule: "arm-revision" | "start-pose" | "goal-pose" | "joint-count"; message: string };

/** Returns a copy of the arm with every limit no looser than each of `limits` asks. */
export function tightenArm(arm: Arm, ...limits: (Limits | null | undefined)[]): Arm {
  const joints = arm.joints.map((joint) => ({ ...joint }));
  for (const l of limits) {
    if (!l) continue;
    for (const joint of joints) {
      if (l.speedPercent !== undefined) joint.maxVelocity = (joint.maxVelocity * l.speedPercent) / 100;
      if (l.accelPercent !== undefined && joint.maxAcceleration !== undefined) {
        joint.maxAcceleration = (joint.maxAcceleration * l.accelPercent) / 100;
      }
    }
    for (const cap of l.joints ?? []) {
      const joint = joints[cap.joint];
      if (!joint) continue;
      if (cap.min !== undefined) joint.min = Math.max(joint.min, cap.min);
      if (cap.max !== undefined) joint.max = Math.min(joint.max, cap.max);
      // A caps pair that crosses leaves no travel; keep min ≤ max so the engine still reads it (every value is out of range but one).
      if (joint.min > joint.max) joint.min = joint.max;
      if (cap.maxVelocity !== undefined) joint.maxVelocity = Math.min(joint.maxVelocity, cap.maxVelocity);
      if (cap.maxAcceleration !== undefined) {
        joint.maxAcceleration =
          joint.maxAcceleration === undefined
            ? cap.maxAcceleration
            : Math.min(joint.maxAcceleration, cap.maxAcceleration);
      }
    }
  }
  return { ...arm, joints };
}

/** What an assignment asks of a plan. */
export type AssignmentRules = {
  requiredArmRevisionId: string;
  /** Also required by the course, when it sets one. */
  courseArmRevisionId?: string | null;
  requiredStart?: number[] | null;
  requiredGoals?: number[][] | null;
  /** rad or m per joint. */
  poseTolerance: number;
  courseLimits?: Limits | null;
  limits?: Limits | null;
};

function near(a: readonly number[], b: readonly number[], tolerance: number): boolean {
  return a.length === b.length && a.every((v, j) => Math.abs(v - b[j]) <= tolerance);
}

/** Which required poses a plan meets: the start pose, and each required goal reached in order. */
export type RequiredPoseStatus = { start: boolean | null; goals: boolean[] };

/**
 * Whether the plan meets each required pose, within the tolerance: the start pose (`null` when none is
 * required), and the required goals reached in order by some of the plan's moves (others may come between).
 */
export function requiredPoseStatus(
  plan: Plan,
  rules: Pick<AssignmentRules, "requiredStart" | "requiredGoals" | "poseTolerance">,
): RequiredPoseStatus {
  const start = rules.requiredStart ? near(plan.start, rules.requiredStart, rules.poseTolerance) : null;
  const required = rules.requiredGoals ?? [];
  let next = 0;
  for (const move of plan.moves) {
    const goal = required[next];
    if (goal && near(move.goal, goal, rules.poseTolerance)) next += 1;
  }
  return { start, goals: required.map((_, k) => k < next) };
}

/** The assignment rules (other than limits) the plan breaks, in a stable order. */
export function ruleProblems(plan: Plan, armRevisionId: string, rules: AssignmentRules): RuleProblem[] {
  const out: RuleProblem[] = [];
  const n = plan.arm.joints.length;
  if (
    armRevisionId !== rules.requiredArmRevisionId ||
    (rules.courseArmRevisionId && armRevisionId !== rules.courseArmRevisionId)
  ) {
    out.push({
      rule: "arm-revision",
      message:
        "The plan was saved for another arm revision than the assignment requires; open it on the required arm and save again.",
    });
  }
  const poses = [rules.requiredStart ?? undefined, ...(rules.requiredGoals ?? [])].filter(
    (p): p is number[] => p !== undefined,
  );
  if (poses.some((p) => p.length !== n)) {
    out.push({
      rule: "joint-count",
      message: `The plan's arm has ${n} joints, but the assignment's poses do not; check the required arm.`,
    });
    return out;
  }
  if (rules.requiredStart && !near(plan.start, rules.requiredStart, rules.poseTolerance)) {
    out.push({
      rule: "start-pose",
      message: `The plan does not start at the required start pose (within ${toleranceText(rules.poseTolerance)} per joint); set the start pose to the assignment's.`,
    });
  }
  // The required goals must be reached in order by some of the plan's moves (other moves may come between).
  const next = requiredPoseStatus(plan, rules).goals.filter(Boolean).length;
  const total = rules.requiredGoals?.length ?? 0;
  if (next < total) {
    out.push({
      rule: "goal-pose",
      message: `Required goal pose ${next + 1} of ${total} is not reached (in order, within ${toleranceText(rules.poseTolerance)} per joint); add a move whose goal is that pose.`,
    });
  }
  return out;
}

/** A pose tolerance with its units: radians for revolute joints, millimetres for prismatic ones. */
function toleranceText(tolerance: number): string {
  return `${formatNumber(tolerance)} rad, or ${formatNumber(tolerance * 1000)} mm for the gripper,`;
}

/** The server-side re-check: the plan on the required arm with tightened limits, and the rule problems. */
export function checkAgainstAssignment(
  plan: Plan,
  requiredArm: Arm,
  armRevisionId: string,
  rules: AssignmentRules,
): { report: Report; problems: RuleProblem[]; arm: Arm } {
  const prepared = assignmentCheckInput(plan, requiredArm, armRevisionId, rules);
  return { report: check(prepared.plan), problems: prepared.problems, arm: prepared.arm };
}

/**
 * What {@link checkAgainstAssignment} checks, without running the check (the server runs it in its
 * check pool): the plan on the required arm with tightened limits, and the rule problems.
 */
export function assignmentCheckInput(
  plan: Plan,
  requiredArm: Arm,
  armRevisionId: string,
  rules: AssignmentRules,
): { plan: Plan; problems: RuleProblem[]; arm: Arm } {
  const problems = ruleProblems(plan, armRevisionId, rules);
  const sameJoints = requiredArm.joints.length === plan.arm.joints.length;
  if (!sameJoints && !problems.some((p) => p.rule === "joint-count")) {
    problems.push({
      rule: "joint-count",
      message: `The required arm has ${requiredArm.joints.length} joints; the plan has ${plan.arm.joints.length}.`,
    });
  }
  // Check against the required arm's limits (not the ones in the document), tightened.
  const arm = tightenArm(sameJoints ? requiredArm : plan.arm, rules.courseLimits, rules.limits);
  return { plan: { ...plan, arm }, problems, arm };
}
