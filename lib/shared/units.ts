/**
 * Display units at the UI edge. The plan document stores radians (revolute joints) and metres
 * (prismatic joints); the bench shows degrees by default with radians one click away, and
 * millimetres for prismatic joints (the gripper).
 */
export type AngleUnit = "deg" | "rad";
export type JointKind = "revolute" | "prismatic";
export type Quantity = "position" | "velocity" | "acceleration" | "effort";

/** Degrees per radian (exact definition). */
export const DEG_PER_RAD = 180 / Math.PI;
/** Millimetres per metre. */
export const MM_PER_M = 1000;

/** Factor from the stored unit (rad, m) to the display unit for this joint type and angle unit. */
export function displayFactor(type: JointKind, unit: AngleUnit): number {
  if (type === "prismatic") return MM_PER_M;
  return unit === "deg" ? DEG_PER_RAD : 1;
}

/** A stored value (rad or m, or per second / per second²) in display units. */
export function toDisplay(value: number, type: JointKind, unit: AngleUnit): number {
  return value * displayFactor(type, unit);
}

/** A display value back to the stored unit (rad or m). */
export function fromDisplay(value: number, type: JointKind, unit: AngleUnit): number {
  return value / displayFactor(type, unit);
}

const suffix: Record<Quantity, string> = { position: "", velocity: "/s", acceleration: "/s²", effort: "" };

/** The unit label for a quantity of a joint: `°`, `rad/s`, `mm/s²`, `N·m`. */
export function unitLabel(type: JointKind, unit: AngleUnit, quantity: Quantity = "position"): string {
  if (quantity === "effort") return type === "prismatic" ? "N" : "N·m";
  const base = type === "prismatic" ? "mm" : unit === "deg" ? "°" : "rad";
  return base + suffix[quantity];
}

/** Decimal places that suit the display unit (degrees to 0.1, radians to 0.001, millimetres to 0.1). */
export function displayDigits(type: JointKind, unit: AngleUnit): number {
  if (type === "prismatic") return 1;
  return unit === "deg" ? 1 : 3;
}

/** A stored value formatted in display units with its unit: `45.0°`, `0.785 rad`, `12.0 mm`. */
export function formatJointValue(
  value: number,
  type: JointKind,
  unit: AngleUnit,
  quantity: Quantity = "position",
): string {
  if (!Number.isFinite(value)) return "—";
  if (quantity === "effort") return `${value.toFixed(2)} ${unitLabel(type, unit, quantity)}`;
  const shown = toDisplay(value, type, unit).toFixed(displayDigits(type, unit));
  const label = unitLabel(type, unit, quantity);
  return label === "°" ? `${shown}°` : `${shown} ${label}`;
}

/** A duration in seconds for tables: `2.000 s`; an instant move reads `instant`. */
export function formatDuration(durationS: number): string {
  if (durationS === 0) return "instant";
  return `${durationS.toFixed(3)} s`;
}

/** Rounds a duration up to whole milliseconds, so a suggested shortest duration is never too short. */
export function ceilToMs(durationS: number): number {
  return Math.ceil(durationS * 1000 - 1e-9) / 1000;
}
