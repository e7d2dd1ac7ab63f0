/**
 * Number and unit wording for findings' messages: plain language, radians with degrees beside them
 * for revolute joints, millimetres for prismatic joints (the gripper; the plan document stores metres),
 * moves counted from 1 as people count them (the report's `move` stays the 0-based index).
 *
 * @module
 */
import type { Joint } from "../plan/arm";

/** What a number measures, to pick its unit. */
export type Quantity = "position" | "velocity" | "acceleration" | "step";

const revoluteUnits: Record<Quantity, string> = {
  position: "rad",
  velocity: "rad/s",
  acceleration: "rad/s²",
  step: "rad",
};
const prismaticUnits: Record<Quantity, string> = {
  position: "mm",
  velocity: "mm/s",
  acceleration: "mm/s²",
  step: "mm",
};
const degreeUnits: Record<Quantity, string> = { position: "°", velocity: "°/s", acceleration: "°/s²", step: "°" };

/** A number with four significant digits, without trailing zeros (`4.1`, `0.0031`, `235.2`). */
export function formatNumber(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return "0";
  return String(Number(value.toPrecision(4)));
}

/**
 * A value with its unit for the joint's type: revolute values in radians with degrees beside them,
 * `4.1 rad/s (234.9°/s)`; prismatic values (given in metres) in millimetres, `40 mm`.
 */
export function formatQuantity(value: number, joint: Pick<Joint, "type">, quantity: Quantity): string {
  if (joint.type === "prismatic") return `${formatNumber(value * 1000)} ${prismaticUnits[quantity]}`; // metres to millimetres
  const degrees = (value * 180) / Math.PI; // radians to degrees
  return `${formatNumber(value)} ${revoluteUnits[quantity]} (${formatNumber(degrees)}${degreeUnits[quantity]})`;
}

/** A duration rounded up to the next millisecond, so a suggested "at least" duration is never too short. */
export function formatDurationUp(durationS: number): string {
  const ms = Math.ceil(durationS * 1000 - 1e-9); // round up to whole milliseconds
  return `${formatNumber(ms / 1000)} s`;
}

/** How a joint is named in messages: `joint "elbow"`. */
export function jointLabel(joint: Pick<Joint, "name">): string {
  return `joint "${joint.name}"`;
}

/** A ratio as a whole percentage: `90%`. */
export function formatPercent(ratio: number): string {
  return `${formatNumber(ratio * 100)}%`;
}

/** The number people read for the move at 0-based `index`: the first move is move 1. */
export function moveNumber(index: number): number {
  return index + 1;
}

/**
 * How a move is named on screens, in CLI lines and in messages, counted from 1: the move at 0-based
 * `index` 0 is "Move 1", or "Instant move 1" when its duration is 0. JSON fields and paths keep the
 * 0-based index (`move: 0`, `moves[0]`).
 */
export function moveLabel(index: number, instant = false): string {
  return instant ? `Instant move ${moveNumber(index)}` : `Move ${moveNumber(index)}`;
}

/**
 * How far over a limit a value is, in words: "above its limit of 2 rad/s" (fault) or
 * "above 90% of its limit of 2 rad/s" (caution). `owner` names whose limit it is ("its", "the plan's").
 */
export function limitLevel(
  severity: "caution" | "fault",
  cautionRatio: number,
  limitText: string,
  owner = "its",
): string {
  return severity === "fault"
    ? `above ${owner} limit of ${limitText}`
    : `above ${formatPercent(cautionRatio)} of ${owner} limit of ${limitText}`;
}
