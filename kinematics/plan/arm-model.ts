/**
 * Zod schemas of the arm model: the optional `arm.chain` (joint origins and axes, link
 * masses, inertias and collision shapes, the tool point), a payload, keep-out boxes, the
 * work-surface margin, a tool-speed limit and Cartesian goals. Every field is optional on
 * the plan document, so a version-1 document without them means exactly what it meant.
 *
 * Every object refuses keys it does not know (`unknown-fields.ts`).
 *
 * Frames follow the URDF joint model: joint i's `origin` places its joint frame in link
 * (i−1)'s frame (link 0 is the base), the joint turns or slides about `axis` given in that
 * joint frame, and link i's frame is the joint frame after that motion.
 *
 * @module
 */
import { z } from "zod";
import { strictObject } from "./unknown-fields";

const finite = z.number().refine(Number.isFinite, { message: "must be a finite number" });
const nonNegative = finite.refine((v) => v >= 0, { message: "must be 0 or greater" });
const positive = finite.refine((v) => v > 0, { message: "must be greater than 0" });

/** A 3-vector of finite numbers. */
export const vec3Schema = z.tuple([finite, finite, finite]);

/** A rigid transform: `xyz` in metres, fixed-axis `rpy` in radians, R = Rz(yaw)·Ry(pitch)·Rx(roll). */
export const originSchema = strictObject({
  xyz: vec3Schema.default([0, 0, 0]),
  rpy: vec3Schema.default([0, 0, 0]),
});

/** Rotational inertia about the centre of mass, in the link frame's axes (kg·m²). */
export const inertiaSchema = strictObject({
  ixx: nonNegative,
  ixy: finite.default(0),
  ixz: finite.default(0),
  iyy: nonNegative,
  iyz: finite.default(0),
  izz: nonNegative,
});

/** Mass properties of one link: `mass` in kg, `com` (m) in the link frame, `inertia` about the com. */
export const inertialSchema = strictObject({
  mass: nonNegative,
  com: vec3Schema.default([0, 0, 0]),
  inertia: inertiaSchema.default({ ixx: 0, ixy: 0, ixz: 0, iyy: 0, iyz: 0, izz: 0 }),
});

/** A simple collision shape in its link's frame (metres), used for clearance and for drawing. */
export const collisionShapeSchema = z.discriminatedUnion("kind", [
  strictObject({ kind: z.literal("sphere"), center: vec3Schema, radius: positive }),
  strictObject({ kind: z.literal("capsule"), from: vec3Schema, to: vec3Schema, radius: positive }),
  strictObject({
    kind: z.literal("box"),
    center: vec3Schema,
    /** Full edge lengths along the box's own axes (m). */
    size: z.tuple([positive, positive, positive]),
    rpy: vec3Schema.default([0, 0, 0]),
  }),
]);

/** One link: its name, optional mass properties and collision shapes. */
export const linkSchema = strictObject({
  name: z.string().min(1).optional(),
  inertial: inertialSchema.optional(),
  collision: z.array(collisionShapeSchema).default([]),
});

/** One joint of the chain: where its frame sits in the parent link and the axis it moves about. */
export const chainJointSchema = strictObject({
  origin: originSchema.default({ xyz: [0, 0, 0], rpy: [0, 0, 0] }),
  /** Unit direction in the joint frame (normalised on compile; must not be zero). */
  axis: vec3Schema.refine((a) => Math.hypot(a[0], a[1], a[2]) > 1e-9, { message: "must not be the zero vector" }),
  link: linkSchema.default({ collision: [] }),
});

/**
 * `arm.chain`: the geometry and masses of a serial arm. `joints[i]` describes `arm.joints[i]`;
 * joints after the last chain joint (for example a gripper's finger travel) are outside the
 * chain and their mass belongs in the last link.
 */
export const armChainSchema = strictObject({
  base: linkSchema.default({ collision: [] }),
  joints: z.array(chainJointSchema).min(1),
  /** The tool point in the last link's frame. */
  tool: originSchema.default({ xyz: [0, 0, 0], rpy: [0, 0, 0] }),
  /** Gravity in the base frame (m/s²). */
  gravity: vec3Schema.default([0, 0, -9.81]),
});

/** Coulomb and viscous friction of one joint: τ_f = viscous·q̇ + coulomb·sgn(q̇). */
export const jointFrictionSchema = strictObject({
  /** Coulomb friction (N·m, or N for a prismatic joint). */
  coulomb: nonNegative.default(0),
  /** Viscous friction (N·m·s/rad, or N·s/m). */
  viscous: nonNegative.default(0),
});

/** A carried mass fixed to the tool: `mass` in kg, `com` (m) in the tool-point frame. */
export const payloadSchema = strictObject({
  mass: nonNegative,
  com: vec3Schema.default([0, 0, 0]),
  inertia: inertiaSchema.optional(),
});

/** An axis-aligned keep-out box in the base frame (m); the arm's collision shapes must stay outside. */
export const keepOutBoxSchema = strictObject({
  name: z.string().min(1).optional(),
  min: vec3Schema,
  max: vec3Schema,
}).refine((b) => b.min[0] < b.max[0] && b.min[1] < b.max[1] && b.min[2] < b.max[2], {
  message: "min must be below max on every axis",
});

/** A Cartesian goal for the tool point in the base frame: position (m), optional orientation rpy (rad). */
export const cartesianGoalSchema = strictObject({
  position: vec3Schema,
  rpy: vec3Schema.optional(),
});

/** Optional plan-level fields of the arm model (merged into the plan schema). */
export const armPlanFieldsSchema = strictObject({
  payload: payloadSchema.optional(),
  keepOut: z.array(keepOutBoxSchema).optional(),
  /** Clearance the collision shapes keep above the work surface z = 0 (m). */
  surfaceMargin: nonNegative.optional(),
  /** Tool-point speed limit (m/s); 0.25 is the reduced-speed figure of ISO 10218-1 §5.5.3. */
  maxToolSpeed: positive.optional(),
});

/** The arm-model description printed by `arm import` and accepted by `fk`/`ik`. */
export const armDescriptionJointSchema = strictObject({
  name: z.string().min(1),
  type: z.enum(["revolute", "continuous", "prismatic"]),
  min: finite.nullable(),
  max: finite.nullable(),
  maxVelocity: positive,
  maxEffort: nonNegative.optional(),
  maxAcceleration: positive.optional(),
  friction: jointFrictionSchema.optional(),
  origin: originSchema,
  axis: vec3Schema,
});

/** A whole arm description (URDF import result). `links[0]` is the base; `links[i]` follows joint i. */
export const armDescriptionSchema = strictObject({
  name: z.string().min(1),
  joints: z.array(armDescriptionJointSchema).min(1),
  links: z.array(linkSchema),
  tool: originSchema,
  gravity: vec3Schema.default([0, 0, -9.81]),
});

/** Input type of one origin (defaults optional). */
export type OriginInput = z.input<typeof originSchema>;
/** A parsed rigid transform. */
export type Origin = z.infer<typeof originSchema>;
/** A parsed inertia tensor about the centre of mass. */
export type Inertia = z.infer<typeof inertiaSchema>;
/** Parsed link mass properties. */
export type Inertial = z.infer<typeof inertialSchema>;
/** A parsed collision shape. */
export type CollisionShape = z.infer<typeof collisionShapeSchema>;
/** A parsed link. */
export type Link = z.infer<typeof linkSchema>;
/** A parsed chain joint. */
export type ChainJoint = z.infer<typeof chainJointSchema>;
/** A parsed `arm.chain`. */
export type ArmChain = z.infer<typeof armChainSchema>;
/** `arm.chain` as written in a document (defaults still optional). */
export type ArmChainInput = z.input<typeof armChainSchema>;
/** Parsed joint friction coefficients. */
export type JointFriction = z.infer<typeof jointFrictionSchema>;
/** A parsed payload. */
export type Payload = z.infer<typeof payloadSchema>;
/** A parsed keep-out box. */
export type KeepOutBox = z.infer<typeof keepOutBoxSchema>;
/** A parsed Cartesian goal. */
export type CartesianGoal = z.infer<typeof cartesianGoalSchema>;
/** A parsed arm description (URDF import result). */
export type ArmDescription = z.infer<typeof armDescriptionSchema>;
/** One joint of a parsed arm description. */
export type ArmDescriptionJoint = z.infer<typeof armDescriptionJointSchema>;
