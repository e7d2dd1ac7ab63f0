/**
 * The course, assignment and submission inputs: one zod schema each, shared by the forms, the route
 * handlers, the OpenAPI document and the tests. Pure (no server imports), so client components can use them too.
 */
import { z } from "zod";

const finite = () => z.number({ error: "must be a number" });
const percent = () =>
  finite()
    .gt(0, { error: "must be greater than 0" })
    .max(100, { error: "must be at most 100 (a course limit only gets stricter)" });

/** Limits stricter than the arm's own. Percentages scale the arm's limits; per-joint caps replace them where lower. */
export const limitsSchema = z
  .object({
    /** e.g. 70 = 70% of each joint's maximum speed. */
    speedPercent: percent().optional(),
    /** e.g. 50 = 50% of each joint's maximum acceleration. */
    accelPercent: percent().optional(),
    joints: z
      .array(
        z
          .object({
            joint: z
              .number({ error: "must be a joint index (0 for the first joint)" })
              .int({ error: "must be a whole number" })
              .min(0, { error: "must be 0 or greater" })
              .max(63, { error: "must be at most 63" }),
            min: finite().optional(),
            max: finite().optional(),
            maxVelocity: finite().positive().optional(),
            maxAcceleration: finite().positive().optional(),
          })
          .strict(),
      )
      .max(64)
      .optional(),
  })
  .strict();
export type Limits = z.infer<typeof limitsSchema>;

const title = z
  .string({ error: "is required" })
  .trim()
  .min(1, { error: "is required" })
  .max(120, { error: "must be at most 120 characters" });
const uuid = z.uuid({ error: "must be an id" });
const pose = z.array(finite(), { error: "must be a list of numbers, one per joint" }).min(1).max(64);

export const createCourseSchema = z
  .object({
    title,
    term: z
      .string({ error: "is required" })
      .trim()
      .min(1, { error: "is required" })
      .max(60, { error: "must be at most 60 characters" }),
    projectId: uuid.optional(),
    requiredArmRevisionId: uuid.optional(),
    limits: limitsSchema.optional(),
  })
  .strict();
export type CreateCourseInput = z.infer<typeof createCourseSchema>;

export const joinCourseSchema = z
  .object({
    code: z
      .string({ error: "is required" })
      .trim()
      .toUpperCase()
      .regex(/^[A-Z0-9]{8}$/, { error: "must be 8 letters and digits" }),
  })
  .strict();

export const inviteSchema = z
  .object({
    emails: z
      .array(z.string().trim().toLowerCase().max(254).email({ error: "must be an e-mail address" }))
      .min(1, { error: "must list at least one address" })
      .max(100, { error: "must list at most 100 addresses" }),
  })
  .strict();

export const createAssignmentSchema = z
  .object({
    title,
    instructions: z.string().max(5000, { error: "must be at most 5000 characters" }).default(""),
    dueAt: z.iso.datetime({ offset: true, error: "must be a date and time (ISO 8601)" }),
    requiredArmRevisionId: uuid,
    requiredStart: pose.optional(),
    requiredGoals: z.array(pose).max(100).optional(),
    poseTolerance: finite().positive().max(1).default(0.001),
    limits: limitsSchema.optional(),
  })
  .strict();
export type CreateAssignmentInput = z.infer<typeof createAssignmentSchema>;

export const submitSchema = z
  .object({
    planId: uuid,
    versionNumber: z.number().int().positive(),
  })
  .strict();

/** Route parameters, named after the resource they identify. */
export const courseParams = z.object({ courseId: uuid });
export const courseMemberParams = z.object({ courseId: uuid, userId: uuid });
export const assignmentParams = z.object({ assignmentId: uuid });
export const submissionParams = z.object({ submissionId: uuid });
