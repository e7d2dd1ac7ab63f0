/**
 * Field helpers shared by the arm and plan document schemas: number fields with plain-language
 * messages, and the guards the cross-field refinements use on values that may be partial.
 *
 * @module
 */
import { z } from "zod";

/** Error-message maker for a field that is missing or of the wrong type. */
export function typeError(expected: string) {
  return (issue: { input?: unknown }): string => (issue.input === undefined ? "is required" : `must be ${expected}`);
}

/** Message for a field that is missing or not a finite number. */
const numberError = typeError("a number");

/** A finite number (JSON has no NaN or Infinity; zod refuses them too). */
export const finite = () => z.number({ error: numberError });

/** A number strictly greater than zero (limits, rates). */
export const positive = () => finite().positive({ error: "must be greater than 0" });

/** A number zero or greater (durations). */
export const nonNegative = () => finite().nonnegative({ error: "must be 0 or greater" });

/** Runs a cross-field refinement whenever the value is an object, even if other fields failed. */
export function isObjectPayload(payload: { value: unknown }): boolean {
  return typeof payload.value === "object" && payload.value !== null;
}

/** The value as a list, or `undefined` when it is not one. */
export function listOf(value: unknown): unknown[] | undefined {
  return Array.isArray(value) ? value : undefined;
}

/** True for a plain JSON object (not null, not a list). */
export function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}
