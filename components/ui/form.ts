/**
 * The glue between the API's one error shape and react-hook-form: the API answers a refused
 * body with a problem list (`issues: [{ path: "moves[2].duration", message: "must be 0 or
 * greater" }]`, paths as lib/server/errors.ts formats them); this puts each problem under the
 * field it names, with the API's own words, and returns what names no field of the form.
 */
import type { FieldError, FieldValues, Path, UseFormSetError } from "react-hook-form";
import { ApiError, type FieldIssue } from "@/lib/client/api-client";

/** `moves[2].duration` → `moves.2.duration` (react-hook-form's path syntax). */
export function toFormPath(apiPath: string): string {
  return apiPath.replace(/\[(\d+)\]/g, ".$1").replace(/^\./, "");
}

/** The problem list of an API error; empty for anything else (a network failure, a bug). */
export function apiIssues(error: unknown): FieldIssue[] {
  return error instanceof ApiError ? error.issues : [];
}

export interface ApplyIssuesOptions {
  /** A leading path the API puts before the form's own fields (e.g. `document`). */
  prefix?: string;
}

/**
 * Sets a react-hook-form error on every field an API problem names (the field itself or an
 * ancestor of the path, so `start[3]` lands on a `start` field), first problem per field.
 * Returns the problems that name no field of this form, for a message at the form's foot.
 */
export function applyApiIssues<T extends FieldValues>(
  issues: readonly FieldIssue[],
  setError: UseFormSetError<T>,
  fields: readonly Path<T>[],
  options: ApplyIssuesOptions = {},
): FieldIssue[] {
  const known = new Set<string>(fields);
  const taken = new Set<string>();
  const rest: FieldIssue[] = [];
  for (const issue of issues) {
    let path = toFormPath(issue.path);
    if (options.prefix) {
      const prefix = toFormPath(options.prefix);
      if (path === prefix || !path.startsWith(`${prefix}.`)) {
        rest.push(issue);
        continue;
      }
      path = path.slice(prefix.length + 1);
    }
    const segments = path.split(".");
    let target: string | undefined;
    for (let n = segments.length; n > 0 && !target; n--) {
      const candidate = segments.slice(0, n).join(".");
      if (known.has(candidate)) target = candidate;
    }
    if (!target) {
      rest.push(issue);
      continue;
    }
    if (taken.has(target)) continue;
    taken.add(target);
    setError(target as Path<T>, { type: "server", message: issue.message });
  }
  return rest;
}

/**
 * A field's error as a sentence that starts with the field's name: label "E-mail" and the
 * API's "must be an e-mail address" read "E-mail must be an e-mail address." — the same words
 * the API answers with.
 */
export function fieldMessage(label: string, error: FieldError | undefined): string | undefined {
  if (!error?.message) return undefined;
  const message = error.message.trim();
  const sentence = /^[a-z]/.test(message) ? `${label} ${message}` : message;
  return /[.!?]$/.test(sentence) ? sentence : `${sentence}.`;
}

/** The message for a failed submit that names no field: the API's own message, or the network's. */
export function formFailure(error: unknown, rest: readonly FieldIssue[]): string | undefined {
  if (rest.length > 0)
    return rest.map((i) => (i.path && i.path !== "(body)" ? `${i.path} ${i.message}` : i.message)).join("; ");
  if (error instanceof ApiError) return error.issues.length > 0 ? undefined : error.message;
  if (error instanceof Error)
    return "The request failed before the server answered. Check your connection and try again.";
  return undefined;
}

/**
 * `setValueAs` for a number typed into a text field: empty means "not given" (undefined), anything
 * else is read as typed, so the schema refuses "abc" or 150 under the field instead of dropping it.
 */
export function numberOrEmpty(value: unknown): number | undefined {
  if (value === null || value === undefined) return undefined;
  if (typeof value === "number") return value;
  const text = String(value).trim();
  return text === "" ? undefined : Number(text);
}

/** `setValueAs` for an optional choice: the empty option means "not given". */
export function textOrEmpty(value: unknown): string | undefined {
  return value === null || value === undefined || value === "" ? undefined : String(value);
}
