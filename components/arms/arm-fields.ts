/**
 * The arm form's fields and validation: every parameter the check uses, read and written through
 * the engine's arm schema (the one the API validates with), with problems spoken in the form's unit.
 */
import { armDocumentSchema, describeIssues, formatPath, type Arm, type Joint } from "@/kinematics";
import { formatJointValue, type AngleUnit, type Quantity } from "@/lib/shared/units";

/** A joint field of the form, with the quantity that picks its display unit. */
export interface JointField {
  key: "min" | "max" | "maxVelocity" | "maxAcceleration" | "maxEffort" | "coulomb" | "viscous";
  label: string;
  /** `null`: shown in its stored unit (friction coefficients, effort). */
  quantity: Quantity | null;
  optional: boolean;
}

export const jointFields: readonly JointField[] = [
  { key: "min", label: "Travel min", quantity: "position", optional: false },
  { key: "max", label: "Travel max", quantity: "position", optional: false },
  { key: "maxVelocity", label: "Max speed", quantity: "velocity", optional: false },
  { key: "maxAcceleration", label: "Max acceleration", quantity: "acceleration", optional: true },
  { key: "maxEffort", label: "Max effort", quantity: "effort", optional: true },
  { key: "coulomb", label: "Coulomb friction", quantity: "effort", optional: true },
  { key: "viscous", label: "Viscous friction", quantity: null, optional: true },
];

/** The stored value of a joint field (rad, m, N·m, N, …), `undefined` when the arm does not set it. */
export function jointValue(joint: Joint, key: JointField["key"]): number | undefined {
  if (key === "coulomb" || key === "viscous") return joint.friction?.[key];
  return joint[key];
}

/** The joint with one field set (stored unit); `undefined` clears an optional field. */
export function withJointValue(joint: Joint, key: JointField["key"], value: number | undefined): Joint {
  if (key === "coulomb" || key === "viscous") {
    const friction = {
      coulomb: joint.friction?.coulomb ?? 0,
      viscous: joint.friction?.viscous ?? 0,
      [key]: value ?? 0,
    };
    return { ...joint, friction };
  }
  const next = { ...joint, [key]: value };
  if (value === undefined) delete next[key];
  return next;
}

/** The unit a joint field is shown in: `°/s`, `mm`, `N·m`, `N·m·s/rad`. */
export function fieldUnit(joint: Pick<Joint, "type">, field: JointField, unit: AngleUnit): string {
  if (field.key === "viscous") return joint.type === "prismatic" ? "N·s/m" : "N·m·s/rad";
  if (field.quantity === "effort") return joint.type === "prismatic" ? "N" : "N·m";
  const shown = formatJointValue(0, joint.type, unit, field.quantity ?? "position");
  return shown.replace(/^[-\d.]+\s?/, "");
}

/** The field a problem path names, when it is a joint field: `joints[2].max` → joint 2, `max`. */
function jointFieldOf(path: readonly (string | number)[]): { joint: number; field: JointField } | null {
  if (path[0] !== "joints" || typeof path[1] !== "number") return null;
  const key = path[2] === "friction" ? path[3] : path[2];
  const field = jointFields.find((f) => f.key === key);
  return field ? { joint: path[1], field } : null;
}

/**
 * Validates the arm with the engine's arm schema and returns the problems by field path
 * (`joints[1].max`, `controlRateHz`, …). A number in a joint field's message (e.g. "must not be below
 * min (0.5236)") is restated in the form's unit ("must not be below min (30.0°)").
 */
export function armProblems(
  arm: unknown,
  unit: AngleUnit,
): { arm: Arm; problems: null } | { arm: null; problems: Record<string, string> } {
  const parsed = armDocumentSchema.safeParse(arm);
  if (parsed.success) return { arm: parsed.data, problems: null };
  const joints = (arm as { joints?: Joint[] } | null)?.joints ?? [];
  const problems: Record<string, string> = {};
  for (const problem of describeIssues(parsed.error.issues)) {
    const at = jointFieldOf(problem.path);
    const joint = at ? joints[at.joint] : undefined;
    let message = problem.message;
    if (at && joint && at.field.quantity && at.field.quantity !== "effort") {
      const quantity = at.field.quantity;
      message = message.replace(
        /\((-?\d+(?:\.\d+)?(?:e-?\d+)?)\)/g,
        (_, n: string) => `(${formatJointValue(Number(n), joint.type, unit, quantity)})`,
      );
    }
    problems[formatPath(problem.path)] = message;
  }
  return { arm: null, problems };
}

/** A clear, unused name for a custom copy of a built-in arm: "Bench arm · gripper (custom copy)", then "(custom copy 2)". */
export function customArmName(name: string, taken: readonly string[]): string {
  const base = `${name} (custom copy`;
  for (let k = 1; k < 1000; k++) {
    const candidate = `${base}${k === 1 ? "" : ` ${k}`})`.slice(0, 120);
    if (!taken.includes(candidate)) return candidate;
  }
  return `${base} ${Date.now()})`.slice(0, 120);
}
