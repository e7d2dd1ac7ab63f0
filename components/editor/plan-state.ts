/**
 * The bench's editing state: the plan document being edited, as a pure reducer, so every edit is
 * one action that component tests and the page share. Values are stored as the document stores
 * them (radians, metres, seconds); display units live at the UI edge (lib/shared/units.ts).
 */
import { homePose as homePoseOf, type ArmChain, type KeepOutBox, type Plan, type ShapeName } from "@/kinematics";

/** The plan the bench edits: a parsed version-1 document, plus the arm model's optional fields. */
export type BenchPlan = Plan & {
  arm: Plan["arm"] & { chain?: ArmChain };
  keepOut?: KeepOutBox[];
  surfaceMargin?: number;
};

/** Which pose the pose editor shows: the start pose or a move's goal. */
export type PoseTarget = "start" | number;

export type PlanAction =
  | { type: "replace"; plan: BenchPlan }
  | { type: "set-joint"; target: PoseTarget; joint: number; value: number }
  | { type: "set-pose"; target: PoseTarget; pose: readonly number[] }
  | { type: "add-move"; after?: number }
  | { type: "duplicate-move"; index: number }
  | { type: "move-move"; index: number; by: -1 | 1 }
  | { type: "delete-move"; index: number }
  | { type: "set-duration"; index: number; duration: number }
  | { type: "set-shape"; index: number; shape: ShapeName }
  | { type: "set-durations"; durations: readonly number[] };

/** Default duration of a newly added move, s. */
export const NEW_MOVE_DURATION_S = 1;

/** The pose at a target: the start pose or move i's goal. */
export function poseOf(plan: BenchPlan, target: PoseTarget): number[] {
  return target === "start" ? plan.start : (plan.moves[target]?.goal ?? plan.start);
}

/** The pose a move starts from: the start pose for move 0, else the previous goal. */
export function poseBefore(plan: BenchPlan, index: number): number[] {
  return index <= 0 ? plan.start : plan.moves[index - 1].goal;
}

/** The arm's rest pose ("home", the engine's `homePose`). */
export function homePose(plan: BenchPlan): number[] {
  return homePoseOf(plan.arm);
}

function withPose(plan: BenchPlan, target: PoseTarget, pose: number[]): BenchPlan {
  if (target === "start") return { ...plan, start: pose };
  if (!plan.moves[target]) return plan;
  const moves = plan.moves.slice();
  moves[target] = { ...moves[target], goal: pose };
  return { ...plan, moves };
}

function withMove(plan: BenchPlan, index: number, patch: Partial<BenchPlan["moves"][number]>): BenchPlan {
  if (!plan.moves[index]) return plan;
  const moves = plan.moves.slice();
  moves[index] = { ...moves[index], ...patch };
  return { ...plan, moves };
}

/** Applies one edit; returns the same object when nothing changes. */
export function planReducer(plan: BenchPlan, action: PlanAction): BenchPlan {
  switch (action.type) {
    case "replace":
      return action.plan;
    case "set-joint": {
      if (!Number.isFinite(action.value)) return plan;
      const pose = poseOf(plan, action.target).slice();
      if (action.joint < 0 || action.joint >= pose.length) return plan;
      pose[action.joint] = action.value;
      return withPose(plan, action.target, pose);
    }
    case "set-pose":
      if (action.pose.length !== plan.arm.joints.length || !action.pose.every(Number.isFinite)) return plan;
      return withPose(plan, action.target, action.pose.slice());
    case "add-move": {
      const after = action.after ?? plan.moves.length - 1;
      const from = after < 0 ? plan.start : (plan.moves[after]?.goal ?? plan.start);
      const moves = plan.moves.slice();
      moves.splice(after + 1, 0, { goal: from.slice(), duration: NEW_MOVE_DURATION_S, shape: "quintic" });
      return { ...plan, moves };
    }
    case "duplicate-move": {
      const m = plan.moves[action.index];
      if (!m) return plan;
      const moves = plan.moves.slice();
      moves.splice(action.index + 1, 0, { ...m, goal: m.goal.slice() });
      return { ...plan, moves };
    }
    case "move-move": {
      const to = action.index + action.by;
      if (!plan.moves[action.index] || to < 0 || to >= plan.moves.length) return plan;
      const moves = plan.moves.slice();
      [moves[action.index], moves[to]] = [moves[to], moves[action.index]];
      return { ...plan, moves };
    }
    case "delete-move":
      if (!plan.moves[action.index]) return plan;
      return { ...plan, moves: plan.moves.filter((_, i) => i !== action.index) };
    case "set-duration":
      if (!Number.isFinite(action.duration) || action.duration < 0) return plan;
      return withMove(plan, action.index, { duration: action.duration });
    case "set-shape":
      return withMove(plan, action.index, { shape: action.shape });
    case "set-durations":
      if (action.durations.length !== plan.moves.length) return plan;
      return { ...plan, moves: plan.moves.map((m, i) => ({ ...m, duration: action.durations[i] })) };
  }
}
