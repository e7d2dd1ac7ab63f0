/**
 * The plan document, version 1: one zod schema shared by the command line, the API and the forms.
 *
 * Units: revolute joints in radians, prismatic joints (a gripper) in metres; velocities per second,
 * accelerations per second squared; durations in seconds; the control rate in hertz.
 *
 * Extending the document (the arm model adds `arm.chain`, `payload`, keep-out zones, …): build on the
 * exported object schemas with `.safeExtend({ … })` and pass them to {@link makePlanSchema}, so the
 * cross-field rules (pose lengths, travel order, unique joint names) stay in one place. A version-1
 * document without the extra fields must keep meaning exactly what it means here.
 *
 * @module
 */
import { z } from "zod";
// Arm model (issue 4): optional fields; a version-1 document without them means the same.
import { armChainSchema, cartesianGoalSchema, jointFrictionSchema, keepOutBoxSchema, payloadSchema } from "./arm-model";
import { resolveCartesianGoals } from "../arm/ik";

/** Error-message maker for a field that is missing or of the wrong type. */
function typeError(expected: string) {
  return (issue: { input?: unknown }): string => (issue.input === undefined ? "is required" : `must be ${expected}`);
}

/** Message for a field that is missing or not a finite number. */
const numberError = typeError("a number");

/** A finite number (JSON has no NaN or Infinity; zod refuses them too). */
const finite = () => z.number({ error: numberError });

/** A number strictly greater than zero (limits, rates). */
const positive = () => finite().positive({ error: "must be greater than 0" });

/** A number zero or greater (durations). */
const nonNegative = () => finite().nonnegative({ error: "must be 0 or greater" });

/** How a joint moves: `revolute` (radians) or `prismatic` (metres). */
export const jointTypeSchema = z.enum(["revolute", "prismatic"], {
  error: 'must be "revolute" or "prismatic"',
});

/** Joint type: `revolute` (radians) or `prismatic` (metres). */
export type JointType = z.infer<typeof jointTypeSchema>;

/**
 * One joint and its limits. `min`..`max` is its travel (rad or m), `maxVelocity` in rad/s or m/s,
 * `maxAcceleration` (optional) in rad/s² or m/s²; `type` defaults to `revolute`.
 */
export const jointSchema = z.object(
  {
    name: z.string({ error: typeError("a text") }).min(1, { error: "must not be empty" }),
    type: jointTypeSchema.default("revolute"),
    min: finite(),
    max: finite(),
    maxVelocity: positive(),
    maxAcceleration: positive().optional(),
    // Arm model (issue 4): largest effort (N·m, or N for a prismatic joint) and joint friction.
    maxEffort: nonNegative().optional(),
    friction: jointFrictionSchema.optional(),
  },
  { error: typeError("an object (a joint)") },
);

/** A joint after parsing (defaults applied). */
export type Joint = z.infer<typeof jointSchema>;

/**
 * The arm a plan is for: its joints, its controller's control rate (Hz) and the caution ratio
 * (a value above `cautionRatio` × limit, and not above the limit, is a caution; default 0.9).
 */
export const armSchema = z.object(
  {
    name: z.string({ error: typeError("a text") }).min(1, { error: "must not be empty" }),
    controlRateHz: positive(),
    cautionRatio: finite()
      .positive({ error: "must be greater than 0" })
      .max(1, { error: "must be at most 1" })
      .default(0.9),
    joints: z.array(jointSchema, { error: typeError("a list of joints") }).min(1, { error: "must list at least one joint" }),
    // Arm model (issue 4): geometry, masses and collision shapes of the first chain.joints.length joints.
    chain: armChainSchema.optional(),
  },
  { error: typeError("an object (an arm)") },
);

/** An arm after parsing (defaults applied). */
export type Arm = z.infer<typeof armSchema>;

/** Names of the interpolation shapes the engine knows; see `shapes.ts` for their definitions. */
export const shapeNames = ["cubic", "quintic", "trapezoid"] as const;

/** How a move is interpolated between its start and goal poses. */
export const shapeSchema = z.enum(shapeNames, { error: `must be one of ${shapeNames.map((s) => `"${s}"`).join(", ")}` });

/** Shape name: `cubic`, `quintic` or `trapezoid`. */
export type ShapeName = z.infer<typeof shapeSchema>;

/** A pose: one value per joint (rad or m). Its length is checked against the arm in the plan. */
export const poseSchema = z.array(finite(), { error: typeError("a list of numbers, one per joint") });

/** A pose: one value per joint (rad or m). */
export type Pose = z.infer<typeof poseSchema>;

/**
 * One move: from the previous pose to `goal` over `duration` seconds (0 = instant move: the controller
 * must be at the goal at its next cycle), rest to rest, with a `shape` (default `quintic`).
 */
export const moveSchema = z.object(
  {
    goal: poseSchema,
    duration: nonNegative(),
    shape: shapeSchema.default("quintic"),
    // Arm model (issue 4): a Cartesian tool-point goal; parsePlan fills `goal` from it by inverse kinematics.
    target: cartesianGoalSchema.optional(),
  },
  { error: typeError("an object (a move)") },
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
 * unique. Used for {@link planSchema}; extensions pass their extended arm and move schemas.
 */
export function makePlanSchema<A extends ArmLike, M extends MoveLike>(arm: A, move: M) {
  return z
    .object(
      {
        format: z.literal(planFormat, { error: `must be "${planFormat}"` }),
        version: z.literal(planVersion, { error: `must be ${planVersion} (the only version this checker reads)` }),
        arm,
        start: poseSchema,
        moves: z.array(move, { error: typeError("a list of moves") }),
        // Arm model (issue 4): carried mass at the tool, keep-out boxes, work-surface margin (m), tool speed limit (m/s).
        payload: payloadSchema.optional(),
        keepOut: z.array(keepOutBoxSchema).optional(),
        surfaceMargin: nonNegative().optional(),
        maxToolSpeed: positive().optional(),
      },
      { error: typeError("an object (a plan document)") },
    )
    .superRefine(
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

/** Runs a cross-field refinement whenever the value is an object, even if other fields failed. */
function isObjectPayload(payload: { value: unknown }): boolean {
  return typeof payload.value === "object" && payload.value !== null;
}

/** The value as a list, or `undefined` when it is not one. */
function listOf(value: unknown): unknown[] | undefined {
  return Array.isArray(value) ? value : undefined;
}

/** Adds the joints' cross-field issues (travel order, unique names) to a refinement context. */
function addJointIssues(joints: unknown[], ctx: z.RefinementCtx, base: (string | number)[]): void {
  const seen = new Map<string, number>();
  joints.forEach((raw, j) => {
    const joint = raw as { name?: unknown; min?: unknown; max?: unknown } | null;
    if (!joint || typeof joint !== "object") return;
    if (typeof joint.min === "number" && typeof joint.max === "number" && joint.min > joint.max) {
      ctx.addIssue({ code: "custom", path: [...base, "joints", j, "max"], message: `must not be below min (${joint.min})` });
    }
    if (typeof joint.name !== "string") return;
    const earlier = seen.get(joint.name);
    if (earlier !== undefined) {
      ctx.addIssue({ code: "custom", path: [...base, "joints", j, "name"], message: `repeats the name of joint ${earlier}` });
    } else {
      seen.set(joint.name, j);
    }
  });
}

/**
 * The arm object on its own, with the same cross-field rules as inside a plan (used by the recording
 * scan, whose arm comes from a separate file).
 */
export const armDocumentSchema = armSchema.superRefine(
  (arm, ctx) => {
    const joints = listOf((arm as { joints?: unknown } | null)?.joints);
    if (joints) addJointIssues(joints, ctx, []);
  },
  { when: isObjectPayload },
);

/** The plan document, version 1. */
export const planSchema = makePlanSchema(armSchema, moveSchema);

/** A plan after parsing (defaults applied). */
export type Plan = z.infer<typeof planSchema>;

/** A plan document as written (defaults may be missing). */
export type PlanInput = z.input<typeof planSchema>;

/** One problem with an input document: the field path (`arm.joints[1].maxVelocity`) and what is wrong. */
export interface InputProblem {
  /** Field path in dotted form with list indexes in brackets; `(document)` for the whole document. */
  path: string;
  /** Plain-language description of the problem, e.g. `must be greater than 0`. */
  message: string;
}

/** Formats a zod issue path as `arm.joints[1].maxVelocity`; an empty path is `(document)`. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const key of path) {
    if (typeof key === "number") out += `[${key}]`;
    else out += out === "" ? String(key) : `.${String(key)}`;
  }
  return out === "" ? "(document)" : out;
}

/** Turns zod issues into `{ path, message }` lines, one per problem, in document order. */
export function describeIssues(issues: readonly z.core.$ZodIssue[]): InputProblem[] {
  return issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message }));
}

/** Result of {@link parsePlan}: the parsed plan, or the problems that refused it. */
export type ParseResult<T> = { ok: true; value: T } | { ok: false; problems: InputProblem[] };

/** Validates an unknown value (parsed JSON) as a plan document, version 1. */
export function parsePlan(input: unknown): ParseResult<Plan> {
  // Arm model (issue 4): moves with a Cartesian `target` get their joint `goal` by inverse kinematics first.
  const resolved = resolveCartesianGoals(input);
  const result = planSchema.safeParse(resolved.document);
  if (result.success && resolved.problems.length === 0) return { ok: true, value: result.data };
  return { ok: false, problems: [...(result.success ? [] : describeIssues(result.error.issues)), ...resolved.problems] };
}

/** Validates an unknown value (parsed JSON) as the `arm` object of a plan document. */
export function parseArm(input: unknown): ParseResult<Arm> {
  const result = armDocumentSchema.safeParse(input);
  return result.success ? { ok: true, value: result.data } : { ok: false, problems: describeIssues(result.error.issues) };
}
