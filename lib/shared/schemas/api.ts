/**
 * One zod schema per API input (bodies and query strings), shared by the route handlers, the
 * forms and the OpenAPI document (lib/server/openapi.ts).
 */
import { z } from "zod";
import { armDocumentSchema, parsePlan, planSchema, strictObject, type Plan } from "@/kinematics";

/**
 * A plan document read exactly as the command line reads it (the engine's `parsePlan`: the
 * version-1 schema, plus Cartesian move targets resolved to joint goals by inverse kinematics),
 * with each problem reported at its field path.
 */
export const planDocumentInput = z.unknown().transform((value, ctx): Plan => {
  const parsed = parsePlan(value);
  if (parsed.ok) return parsed.value;
  for (const problem of parsed.problems) ctx.addIssue({ code: "custom", message: problem.message, path: problem.path });
  return z.NEVER;
});

const name = (max = 120) =>
  z
    .string({ error: "is required" })
    .trim()
    .min(1, { error: "must not be empty" })
    .max(max, { error: `must be at most ${max} characters` });
const id = z.string({ error: "is required" }).uuid({ error: "must be an id" });
const note = z.string().trim().max(500, { error: "must be at most 500 characters" }).optional();

export const createProjectSchema = z.strictObject({
  name: name(),
  kind: z
    .enum(["course", "research", "personal"], { error: 'must be "course", "research" or "personal"' })
    .default("personal"),
});

export const updateProjectSchema = z
  .strictObject({ name: name().optional(), archived: z.boolean({ error: "must be true or false" }).optional() })
  .refine((v) => v.name !== undefined || v.archived !== undefined, { error: "give name or archived", path: ["name"] });

export const listProjectsQuery = z.strictObject({
  archived: z.enum(["include", "exclude"], { error: 'must be "include" or "exclude"' }).default("exclude"),
});

export const addMemberSchema = z.strictObject({
  email: z.string({ error: "is required" }).trim().toLowerCase().email({ error: "must be an e-mail address" }),
  role: z.enum(["owner", "editor", "viewer"], { error: 'must be "owner", "editor" or "viewer"' }),
});

/** Plan and arm bodies name an unknown key with the field it was probably meant to be, as documents do. */
export const createArmSchema = strictObject({ name: name(), description: armDocumentSchema, note });
export const createArmRevisionSchema = strictObject({ description: armDocumentSchema, note });

export const createPlanSchema = strictObject({ name: name(), armId: id });

export const createVersionSchema = strictObject({
  /** The version the edit started from (0 for a plan's first save); a newer one in between is a 409. */
  baseVersion: z
    .number({ error: "must be a whole number" })
    .int({ error: "must be a whole number" })
    .min(0, { error: "must be 0 or greater" })
    .max(1_000_000, { error: "must be at most 1000000" }),
  /** The arm revision to check against (default: the arm's latest); `document.arm` must equal it. */
  armRevision: z.number().int().positive().max(1_000_000).optional(),
  document: planDocumentInput,
  note,
});

/** Plain decimal digits only: `0x1`, `1e0`, `+1` and `01` are not version numbers (Number() would take them). */
const versionNumber = z
  .string({ error: "must be a version number" })
  .regex(/^[1-9][0-9]{0,6}$/, { error: "must be a version number (1, 2, …)" })
  .transform(Number)
  .pipe(z.number().int().positive().max(1_000_000));

export const diffQuery = z.strictObject({ from: versionNumber, to: versionNumber });

/** Largest sampling rate an export accepts, Hz, and the most values (samples × joints) one export holds. */
export const EXPORT_MAX_RATE_HZ = 10_000;
export const EXPORT_MAX_VALUES = 5_000_000;

export const exportQuery = z.strictObject({
  format: z.enum(["json", "csv"], { error: 'must be "json" or "csv"' }).default("json"),
  /** Sampling rate of the waypoint list, Hz (default: the arm's control rate). */
  rateHz: z.coerce
    .number({ error: "must be a number" })
    .positive({ error: "must be greater than 0" })
    .max(EXPORT_MAX_RATE_HZ)
    .optional(),
});

export const createTokenSchema = z.strictObject({
  name: name(80),
  /** Days until the token stops working; omit for no expiry. */
  expiresInDays: z.number().int().positive().max(366).optional(),
});

export const adminUpdateUserSchema = z
  .strictObject({
    siteRole: z.enum(["student", "researcher", "instructor", "admin"], { error: "must be a site role" }).optional(),
    disabled: z.boolean({ error: "must be true or false" }).optional(),
  })
  .refine((v) => v.siteRole !== undefined || v.disabled !== undefined, {
    error: "give siteRole or disabled",
    path: ["siteRole"],
  });

export { passwordResetConfirmSchema, passwordResetRequestSchema, signUpSchema, verifyEmailSchema } from "./auth";

export { planDocumentInput as checkPlanSchema, planSchema };

/** Query string of a recording upload; the body is the CSV file itself (`t,<joint names…>`). */
export const uploadRecordingQuery = z.strictObject({
  name: name(),
  /** Check the recording as a stream against this arm (built in or one of the project's). */
  armId: id.optional(),
});

/** Query string of a URDF import; the body is the URDF file (XML). */
export const importUrdfQuery = z.strictObject({
  /** The arm's name in the project (default: the URDF robot's name). */
  name: name().optional(),
  /** The controller's control rate, Hz (URDF does not say; default 1000). */
  controlRateHz: z.coerce
    .number({ error: "must be a number" })
    .positive({ error: "must be greater than 0" })
    .max(100_000)
    .default(1000),
});
