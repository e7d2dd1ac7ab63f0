/**
 * Unknown fields: every object of the plan, arm and column-mapping documents refuses keys it does
 * not know, because an ignored key can hide a limit (`maxAccelaration` would leave the joint without
 * an acceleration limit, and the plan would pass). Each unknown key is one problem at its own field
 * path, with the known key it was probably meant to be:
 * `arm.joints[2].maxAccelaration: is not a known field; did you mean "maxAcceleration"?`
 *
 * @module
 */
import { z } from "zod";
import type { InputProblem } from "./problems";

/**
 * Levenshtein edit distance (insertions, deletions, substitutions) by the two-row dynamic
 * programme of Wagner & Fischer, "The String-to-String Correction Problem", J. ACM 21 (1974).
 * Written here because the engine imports no package besides zod and fast-xml-parser.
 */
export function editDistance(a: string, b: string): number {
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const current = [i];
    for (let j = 1; j <= b.length; j++) {
      const substitution = previous[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1);
      current[j] = Math.min(previous[j] + 1, current[j - 1] + 1, substitution);
    }
    previous = current;
  }
  return previous[b.length];
}

/** Most edits between an unknown key and a known one for the known one to be suggested. */
export const SUGGESTION_MAX_EDITS = 2;

/**
 * The known name an unknown key was probably meant to be: one that differs only in letter case, or
 * else the nearest within {@link SUGGESTION_MAX_EDITS} edits (letter case not counted); on a tie the
 * first in `known`. `undefined` when none is that close.
 */
export function closestName(key: string, known: readonly string[]): string | undefined {
  const lower = key.toLowerCase();
  let best: string | undefined;
  let bestDistance = SUGGESTION_MAX_EDITS + 1;
  for (const name of known) {
    const distance = editDistance(lower, name.toLowerCase());
    if (distance < bestDistance) {
      best = name;
      bestDistance = distance;
    }
  }
  return best;
}

/** The message for one unknown key, read after its field path. */
export function unknownFieldMessage(key: string, known: readonly string[]): string {
  if (key === "export" && known.includes("moves"))
    return "is not a known field of a plan: it is the block of an export file; check an export with `jointproof check FILE` (it verifies the block), or remove the block to send the plan";
  const close = closestName(key, known);
  return close === undefined
    ? `is not a known field (known here: ${known.join(", ")})`
    : `is not a known field; did you mean "${close}"?`;
}

/** Separates the per-key messages of one `unrecognized_keys` issue (one line per key, in key order). */
const KEY_SEPARATOR = "\n";

/**
 * A zod object that refuses unknown keys, naming each with {@link unknownFieldMessage}. `expected`
 * (e.g. `"an object (a joint)"`) words the message for a value that is missing or not an object;
 * without it zod's own message is used.
 */
export function strictObject<S extends z.core.$ZodLooseShape>(shape: S, expected?: string) {
  const known = Object.keys(shape);
  return z.strictObject(shape, {
    error: (issue) => {
      if (issue.code === "unrecognized_keys") {
        return issue.keys.map((key) => unknownFieldMessage(key, known)).join(KEY_SEPARATOR);
      }
      if (expected === undefined) return undefined;
      return issue.input === undefined ? "is required" : `must be ${expected}`;
    },
  });
}

/**
 * The problems of one `unrecognized_keys` issue: one per key, at the key's own path, with the message
 * {@link strictObject} wrote for it. An issue from another strict object (no per-key messages) gets
 * the plain `is not a known field`.
 */
export function unknownFieldProblems(issue: z.core.$ZodIssueUnrecognizedKeys): InputProblem[] {
  const messages = issue.message.split(KEY_SEPARATOR);
  const ours = messages.length === issue.keys.length && messages.every((m) => m.startsWith("is not a known field"));
  const base = issue.path.map((key) => (typeof key === "number" ? key : String(key)));
  return issue.keys.map((key, i) => ({ path: [...base, key], message: ours ? messages[i] : "is not a known field" }));
}
