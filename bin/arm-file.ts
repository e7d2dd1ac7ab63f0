/**
 * Reading the ARM argument of the command-line checker: a URDF file, a plan document (its `arm`),
 * an arm description (joints with origins, the `arm import` output) or an arm object. Shared by
 * `scan`, `fk` and `ik`, so each accepts the same files. Node file I/O here; parsing in kinematics/.
 *
 * @module
 */
import { readFileSync } from "node:fs";
import {
  armDescriptionSchema,
  armFromDescription,
  describeIssues,
  formatProblem,
  parseArm,
  parseUrdf,
  type Arm,
} from "../kinematics";

/** Where the arm came from: a plan-document `arm` carries its own control rate, a URDF does not. */
export type ArmSource = "arm" | "plan" | "description" | "urdf";

/** A problem with the ARM file, one line per problem (`FILE: path: message`). */
export class ArmFileError extends Error {
  constructor(readonly lines: string[]) {
    super(lines.join("\n"));
  }
}

/** Reads a file as UTF-8 text, or stdin for "-". */
export function readArmText(path: string): string {
  try {
    return readFileSync(path === "-" ? 0 : path, "utf8");
  } catch (error) {
    const reason =
      error instanceof Error && "code" in error && error.code === "ENOENT"
        ? "no such file (check the path)"
        : "cannot be read (check that it is a file you may read)";
    throw new ArmFileError([`${path === "-" ? "(stdin)" : path}: ${reason}`]);
  }
}

/** How ARM is read. */
export interface ArmFileOptions {
  /**
   * The controller's rate (Hz) for a URDF or an arm description, which do not carry one; without it
   * such an arm gets the import default, which a caller may only accept where the rate does not
   * matter (fk, ik).
   */
  controlRateHz?: number;
  /**
   * Also hold a URDF or a description to the plan arm's own rules (every limit the checks compare
   * with, e.g. a speed limit greater than 0), as a check of a recording needs; fk and ik need only the
   * geometry.
   */
  forCheck?: boolean;
}

/** Reads ARM (see the module's note for the files it accepts). */
export function readArmFile(path: string, options: ArmFileOptions = {}): { arm: Arm; source: ArmSource } {
  const { controlRateHz, forCheck = false } = options;
  const text = readArmText(path);
  const name = path === "-" ? "(stdin)" : path;
  if (/\.urdf$/i.test(path) || text.trimStart().startsWith("<")) {
    const r = parseUrdf(text);
    if (!r.ok) throw new ArmFileError(r.problems.map((p) => `${name}: ${p.element}: ${p.message}`));
    const arm = armFromDescription(r.value, controlRateHz);
    return { arm: forCheck ? validated(name, arm, []) : arm, source: "urdf" };
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    throw new ArmFileError([`${name}: not valid JSON (${error instanceof Error ? error.message : String(error)})`]);
  }
  const obj = (typeof raw === "object" && raw !== null ? raw : {}) as Record<string, unknown>;
  const isPlan = obj.format === "jointproof.plan";
  const candidate = isPlan ? obj.arm : raw;
  const prefix = isPlan ? ["arm"] : [];
  const c = (typeof candidate === "object" && candidate !== null ? candidate : {}) as Record<string, unknown>;
  const isDescription =
    Array.isArray(c.joints) &&
    c.joints.some((j) => typeof j === "object" && j !== null && "origin" in j) &&
    !("chain" in c);
  if (isDescription) {
    const d = armDescriptionSchema.safeParse(candidate);
    if (!d.success)
      throw new ArmFileError(
        describeIssues(d.error.issues).map((p) => `${name}: ${formatProblem({ ...p, path: [...prefix, ...p.path] })}`),
      );
    const arm = armFromDescription(d.data, controlRateHz);
    return { arm: forCheck ? validated(name, arm, prefix) : arm, source: "description" };
  }
  return { arm: validated(name, candidate, prefix), source: isPlan ? "plan" : "arm" };
}

/** The arm after the engine's own arm schema, or its problems under `prefix`. */
function validated(name: string, candidate: unknown, prefix: string[]): Arm {
  const parsed = parseArm(candidate);
  if (!parsed.ok)
    throw new ArmFileError(
      parsed.problems.map((p) => `${name}: ${formatProblem({ ...p, path: [...prefix, ...p.path] })}`),
    );
  return parsed.value;
}
