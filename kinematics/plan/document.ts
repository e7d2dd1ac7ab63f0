/**
 * The plan document, version 1: one zod schema shared by the command line, the API and the forms.
 *
 * Units: revolute joints in radians, prismatic joints (a gripper) in metres; velocities per second,
 * accelerations per second squared; durations in seconds; the control rate in hertz.
 *
 * Extending the document: build on the exported object schemas with `.safeExtend({ … })` and pass
 * them to {@link makePlanSchema}, so the cross-field rules (pose lengths, travel order, unique joint
 * names) stay in one place. A version-1 document without the extra fields must keep meaning exactly
 * what it means here.
 *
 * @module
 */
import { z } from "zod";
import { addJointIssues, armSchema } from "./arm";
import { cartesianGoalSchema, keepOutBoxSchema, payloadSchema } from "./arm-model";
import { finite, isObjectPayload, listOf, nonNegative, positive, typeError } from "./fields";
import { strictObject } from "./unknown-fields";

/** Names of the interpolation shapes the engine knows; see `motion/shapes.ts` for their definitions. */
export const shapeNames = ["cubic", "quintic", "trapezoid"] as const;

/** How a move is interpolated between its start and goal poses. */
export const shapeSchema = z.enum(shapeNames, {
  error: `must be one of ${shapeNames.map((s) => `"${s}"`).join(", ")}`,
});

/** Shape name: `cubic`, `quintic` or `trapezoid`. */
export type ShapeName = z.infer<typeof shapeSchema>;

/** A pose: one value per joint (rad or m). Its length is checked against the arm in the plan. */
export const poseSchema = z.array(finite(), { error: typeError("a list of numbers, one per joint") });

/** A pose: one value per joint (rad or m). */
export type Pose = z.infer<typeof poseSchema>;

/**
 * One move: from the previous pose to `goal` over `duration` seconds (0 = instant move: the controller
 * must be at the goal at its next cycle), rest to rest, with a `shape` (default `quintic`). A move may
 * give a Cartesian tool-point `target` instead of `goal`; parsing fills `goal` from it by inverse
 * kinematics (`targets.ts`).
 */
export const moveSchema = strictObject(
  {
    goal: poseSchema,
    duration: nonNegative(),
    shape: shapeSchema.default("quintic"),
    target: cartesianGoalSchema.optional(),
  },
  "an object (a move)",
);

/** A move after parsing (defaults applied). */
export type Move = z.infer<typeof moveSchema>;

/** Value of the `format` field of every plan document. */
export const planFormat = "jointproof.plan";

/** The only plan document version this module reads and writes. */
export const planVersion = 1;

/** The object shape a plan document schema needs from its arm and move schemas. */
type ArmLike = z.ZodType<{ joints: { name: string; min: number; max: number }[] }>;
type MoveLike = z.ZodType<{ goal: number[] }>;

/**
 * Builds the plan document schema over the given arm and move schemas, with the cross-field rules:
 * every pose has one value per joint, each joint's `min` is not above its `max`, joint names are
 * unique, and no object holds a key it does not know (`unknown-fields.ts`). Used for
 * {@link planSchema}; extensions pass their extended arm and move schemas.
 * Plan-level arm-model fields: `payload` (carried mass at the tool), `keepOut` boxes,
 * `surfaceMargin` (m) and `maxToolSpeed` (m/s).
 */
export function makePlanSchema<A extends ArmLike, M extends MoveLike>(arm: A, move: M) {
  return strictObject(
    {
      format: z.literal(planFormat, { error: `must be "${planFormat}"` }),
      version: z.literal(planVersion, { error: `must be ${planVersion} (the only version this checker reads)` }),
      arm,
      start: poseSchema,
      moves: z.array(move, { error: typeError("a list of moves") }),
      payload: payloadSchema.optional(),
      keepOut: z.array(keepOutBoxSchema).optional(),
      surfaceMargin: nonNegative().optional(),
      maxToolSpeed: positive().optional(),
    },
    "an object (a plan document)",
  ).superRefine(
    (plan, ctx) => {
      // Runs even when other fields failed (`when` below), so the value may be partial: read defensively.
      const joints = listOf((plan as { arm?: { joints?: unknown } }).arm?.joints);
      if (joints) addJointIssues(joints, ctx, ["arm"]);
      if (!joints) return;
      const jointCount = joints.length;
      const poseIssue = (pose: unknown, path: (string | number)[]) => {
        if (Array.isArray(pose) && pose.length !== jointCount) {
          ctx.addIssue({
            code: "custom",
            path,
            message: `must have ${jointCount} value${jointCount === 1 ? "" : "s"}, one per joint (has ${pose.length})`,
          });
        }
      };
      poseIssue((plan as { start?: unknown }).start, ["start"]);
      listOf((plan as { moves?: unknown }).moves)?.forEach((m, i) =>
        poseIssue((m as { goal?: unknown } | null)?.goal, ["moves", i, "goal"]),
      );
    },
    { when: isObjectPayload },
  );
}

/** The plan document, version 1. */
export const planSchema = makePlanSchema(armSchema, moveSchema);

/** A plan after parsing (defaults applied). */
export type Plan = z.infer<typeof planSchema>;

/** A plan document as written (defaults may be missing). */
export type PlanInput = z.input<typeof planSchema>;
