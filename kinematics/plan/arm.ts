/**
 * The arm schema: its joints and their limits, the controller's control rate, the caution ratio and
 * the optional chain of the arm model (`arm-model.ts`). Used inside a plan document and on its own
 * (an arm revision, the arm file of a recording scan).
 *
 * Units: revolute joints in radians, prismatic joints (a gripper) in metres; velocities per second,
 * accelerations per second squared; the control rate in hertz.
 *
 * @module
 */
import { z } from "zod";
import { armChainSchema, jointFrictionSchema } from "./arm-model";
import { finite, isObjectPayload, listOf, nonNegative, positive, typeError } from "./fields";
import { strictObject } from "./unknown-fields";

/** How a joint moves: `revolute` (radians) or `prismatic` (metres). */
export const jointTypeSchema = z.enum(["revolute", "prismatic"], {
  error: 'must be "revolute" or "prismatic"',
});

/** Joint type: `revolute` (radians) or `prismatic` (metres). */
export type JointType = z.infer<typeof jointTypeSchema>;

/**
 * One joint and its limits. `min`..`max` is its travel (rad or m), `maxVelocity` in rad/s or m/s,
 * `maxAcceleration` (optional) in rad/s² or m/s², `maxEffort` (optional) in N·m (N for a prismatic
 * joint), `friction` (optional) Coulomb and viscous; `type` defaults to `revolute`.
 */
export const jointSchema = strictObject(
  {
    name: z.string({ error: typeError("a text") }).min(1, { error: "must not be empty" }),
    type: jointTypeSchema.default("revolute"),
    min: finite(),
    max: finite(),
    maxVelocity: positive(),
    maxAcceleration: positive().optional(),
    maxEffort: nonNegative().optional(),
    friction: jointFrictionSchema.optional(),
  },
  "an object (a joint)",
);

/** A joint after parsing (defaults applied). */
export type Joint = z.infer<typeof jointSchema>;

/**
 * The arm a plan is for: its joints, its controller's control rate (Hz), the caution ratio (a value
 * above `cautionRatio` × limit, and not above the limit, is a caution; default 0.9) and optionally
 * the geometry, masses and collision shapes of its first `chain.joints.length` joints.
 */
export const armSchema = strictObject(
  {
    name: z.string({ error: typeError("a text") }).min(1, { error: "must not be empty" }),
    controlRateHz: positive(),
    cautionRatio: finite()
      .positive({ error: "must be greater than 0" })
      .max(1, { error: "must be at most 1" })
      .default(0.9),
    joints: z
      .array(jointSchema, { error: typeError("a list of joints") })
      .min(1, { error: "must list at least one joint" }),
    chain: armChainSchema.optional(),
  },
  "an object (an arm)",
);

/** An arm after parsing (defaults applied). */
export type Arm = z.infer<typeof armSchema>;

/**
 * Adds the joints' cross-field issues (travel order, unique names) to a refinement context, at
 * `base` + `joints[j]`. The joints may be partial (other fields failed), so they are read defensively.
 */
export function addJointIssues(joints: unknown[], ctx: z.RefinementCtx, base: (string | number)[]): void {
  const seen = new Map<string, number>();
  joints.forEach((raw, j) => {
    const joint = raw as { name?: unknown; min?: unknown; max?: unknown } | null;
    if (!joint || typeof joint !== "object") return;
    if (typeof joint.min === "number" && typeof joint.max === "number" && joint.min > joint.max) {
      ctx.addIssue({
        code: "custom",
        path: [...base, "joints", j, "max"],
        message: `must not be below min (${joint.min})`,
      });
    }
    if (typeof joint.name !== "string") return;
    const earlier = seen.get(joint.name);
    if (earlier !== undefined) {
      ctx.addIssue({
        code: "custom",
        path: [...base, "joints", j, "name"],
        message: `repeats the name "${joint.name}" of an earlier joint (joints[${earlier}]); give each joint its own name`,
      });
    } else {
      seen.set(joint.name, j);
    }
  });
}

/**
 * The arm object on its own, with the same cross-field rules as inside a plan (an arm revision, the
 * arm file of a recording scan).
 */
export const armDocumentSchema = armSchema.superRefine(
  (arm, ctx) => {
    const joints = listOf((arm as { joints?: unknown } | null)?.joints);
    if (joints) addJointIssues(joints, ctx, []);
  },
  { when: isObjectPayload },
);

/**
 * The arm's rest pose ("home"): each joint at 0 when 0 is inside its travel, else at the middle of
 * its travel. The pose new plans start from, the arm is drawn in at rest, and the inverse
 * kinematics seeds from when a plan has no start pose.
 */
export function homePose(arm: { joints: readonly { min: number; max: number }[] }): number[] {
  return arm.joints.map((j) => (j.min <= 0 && j.max >= 0 ? 0 : (j.min + j.max) / 2));
}
