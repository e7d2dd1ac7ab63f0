/**
 * Target resolution: turns the Cartesian tool-point `target` of a move into a joint `goal` before the
 * plan document is parsed, so that the rest of the engine only ever sees joint goals.
 *
 * @module
 */
import { chainLimits, compileChain, type CompiledChain } from "../arm/chain";
import { solveIk } from "../arm/ik";
import { armChainSchema, cartesianGoalSchema } from "./arm-model";
import { isRecord } from "./fields";
import { homePose } from "./arm";
import type { InputProblem } from "./problems";

function numberList(v: unknown): number[] | null {
  return Array.isArray(v) && v.every((x) => typeof x === "number" && Number.isFinite(x)) ? (v as number[]) : null;
}

/**
 * Resolves Cartesian goals in a plan document before it is parsed: every move that has a
 * `target` (tool-point position, optional rpy) and no `goal` gets the joint goal found by
 * `solveIk`, seeded from the pose before the move and kept inside the joint travel; joints
 * outside the chain (a gripper) keep their previous value. A move with both keeps its `goal`.
 * Returns a copy of the document and the problems (unreachable targets, a missing chain, a chain
 * longer than the joint list); the input is not changed. The document is raw JSON that has not
 * been validated yet, so every field is read defensively.
 */
export function resolveCartesianGoals(input: unknown): { document: unknown; problems: InputProblem[] } {
  const problems: InputProblem[] = [];
  if (!isRecord(input) || !Array.isArray(input.moves) || !isRecord(input.arm)) return { document: input, problems };
  const arm = input.arm;
  const joints = Array.isArray(arm.joints) ? (arm.joints as unknown[]) : [];
  const rawChain = arm.chain;
  let compiled: CompiledChain | null = null;
  if (rawChain !== undefined) {
    const parsed = armChainSchema.safeParse(rawChain);
    if (parsed.success) {
      if (parsed.data.joints.length > joints.length) {
        problems.push({
          path: ["arm", "chain", "joints"],
          message: `has ${parsed.data.joints.length} entries, more than the arm's ${joints.length} joints`,
        });
      } else {
        compiled = compileChain(
          parsed.data,
          joints.map((j) => (isRecord(j) && (j.type === "prismatic" || j.type === "revolute") ? j.type : "revolute")),
        );
      }
    }
  }
  const wantsIk = input.moves.some((m) => isRecord(m) && m.target !== undefined && m.goal === undefined);
  if (!wantsIk) return { document: input, problems };
  const n = joints.length;
  const travel = joints.map((j) => ({
    name: "",
    min: isRecord(j) && typeof j.min === "number" ? j.min : null,
    max: isRecord(j) && typeof j.max === "number" ? j.max : null,
  }));
  const limits = chainLimits(travel, n);
  // without a start pose, seed from home; a joint without a finite travel seeds at 0
  const home = homePose({ joints: travel.map((_, i) => ({ min: limits.lower[i], max: limits.upper[i] })) }).map((q) =>
    Number.isFinite(q) ? q : 0,
  );
  let pose: number[] = numberList(input.start)?.slice() ?? home;
  const moves = input.moves.map((m, i) => {
    if (!isRecord(m)) return m;
    const goal = numberList(m.goal);
    if (goal) {
      pose = goal.slice();
      return m;
    }
    if (m.target === undefined) return m;
    const target = cartesianGoalSchema.safeParse(m.target);
    if (!target.success) {
      for (const issue of target.error.issues) {
        problems.push({
          path: ["moves", i, "target", ...issue.path.map((p) => (typeof p === "number" ? p : String(p)))],
          message: issue.message,
        });
      }
      return m;
    }
    if (!compiled) {
      problems.push({
        path: ["moves", i, "target"],
        message: "needs the arm's chain (arm.chain) to be turned into a joint goal",
      });
      return m;
    }
    const result = solveIk(compiled, target.data, { seed: pose, lower: limits.lower, upper: limits.upper });
    const resolved = result.pose.slice(0, n);
    while (resolved.length < n) resolved.push(pose[resolved.length] ?? 0);
    if (!result.reachable) {
      const p = target.data.position;
      problems.push({
        path: ["moves", i, "target"],
        message:
          `the tool point cannot reach (${p.map((v) => Number(v.toPrecision(4))).join(", ")}) m${target.data.rpy ? " with that orientation" : ""} ` +
          `within the joint travel: the closest pose found is ${Number((result.positionErrorM * 1000).toPrecision(3))} mm away` +
          (target.data.rpy
            ? ` and ${Number(((result.orientationErrorRad * 180) / Math.PI).toPrecision(3))}° off`
            : "") +
          `; choose a nearer target or give a joint goal`,
      });
    }
    pose = resolved;
    return { ...m, goal: resolved };
  });
  return { document: { ...input, moves }, problems };
}
