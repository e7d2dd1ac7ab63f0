/**
 * Problems with an input document. A problem keeps its field path as segments (`["arm", "joints",
 * 1, "maxVelocity"]`) so that callers can prefix it (`document.`, `arm.`) and place it; it is turned
 * into text once, where it is shown, by {@link formatPath}.
 *
 * @module
 */
import type { z } from "zod";
import { unknownFieldProblems } from "./unknown-fields";

/** One segment of a field path: an object key or a 0-based list index. */
export type PathSegment = string | number;

/** One problem with an input document: where it is and what is wrong. */
export interface InputProblem {
  /** Field path as segments; empty for the whole document. */
  path: PathSegment[];
  /** Plain-language description of the problem, e.g. `must be greater than 0`. */
  message: string;
}

/**
 * Formats a field path as `arm.joints[1].maxVelocity` (keys joined by dots, list indexes in
 * brackets). An empty path names the whole input: `whole`, by default `(document)`.
 */
export function formatPath(path: readonly PropertyKey[], whole = "(document)"): string {
  let out = "";
  for (const key of path) {
    if (typeof key === "number") out += `[${key}]`;
    else out += out === "" ? String(key) : `.${String(key)}`;
  }
  return out === "" ? whole : out;
}

/** A problem as one line of text: `arm.joints[1].maxVelocity: must be greater than 0`. */
export function formatProblem(problem: InputProblem, whole = "(document)"): string {
  return `${formatPath(problem.path, whole)}: ${problem.message}`;
}

/**
 * Turns zod issues into problems in document order: one per issue, except that each unknown key is
 * its own problem at its own path (`arm.joints[2].maxAccelaration`).
 */
export function describeIssues(issues: readonly z.core.$ZodIssue[]): InputProblem[] {
  return issues.flatMap((issue) =>
    issue.code === "unrecognized_keys"
      ? unknownFieldProblems(issue)
      : [{ path: issue.path.map((key) => (typeof key === "number" ? key : String(key))), message: issue.message }],
  );
}
