/**
 * Reading documents: a plan document (with its Cartesian targets resolved) and an arm on its own.
 * The one entry the command line, the API and the bench use, so all three refuse the same input
 * with the same problems.
 *
 * @module
 */
import { armDocumentSchema, type Arm } from "./arm";
import { planSchema, type Plan } from "./document";
import { describeIssues, type InputProblem } from "./problems";
import { resolveCartesianGoals } from "./targets";

/** Result of {@link parsePlan} and {@link parseArm}: the parsed value, or the problems that refused it. */
export type ParseResult<T> = { ok: true; value: T } | { ok: false; problems: InputProblem[] };

/**
 * Validates an unknown value (parsed JSON) as a plan document, version 1. Moves with a Cartesian
 * `target` get their joint `goal` by inverse kinematics first.
 */
export function parsePlan(input: unknown): ParseResult<Plan> {
  const resolved = resolveCartesianGoals(input);
  const result = planSchema.safeParse(resolved.document);
  if (result.success && resolved.problems.length === 0) return { ok: true, value: result.data };
  return {
    ok: false,
    problems: [...(result.success ? [] : describeIssues(result.error.issues)), ...resolved.problems],
  };
}

/** Validates an unknown value (parsed JSON) as the `arm` object of a plan document. */
export function parseArm(input: unknown): ParseResult<Arm> {
  const result = armDocumentSchema.safeParse(input);
  return result.success
    ? { ok: true, value: result.data }
    : { ok: false, problems: describeIssues(result.error.issues) };
}
