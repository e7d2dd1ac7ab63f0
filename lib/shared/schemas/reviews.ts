/**
 * The review inputs: comments, decisions and the review queue's query, one zod schema each, shared
 * by the review page, the route handlers, the OpenAPI document and the tests.
 */
import { z } from "zod";

const finite = () => z.number({ error: "must be a number" });
const uuid = z.uuid({ error: "must be an id" });

export const commentSchema = z
  .object({
    body: z.string({ error: "is required" }).trim().min(1, { error: "is required" }).max(5000),
    moveIndex: z
      .number({ error: "must be a move index (0 for the first move)" })
      .int({ error: "must be a whole number" })
      .min(0, { error: "must be 0 or greater" })
      .optional(),
    jointIndex: z
      .number({ error: "must be a joint index (0 for the first joint)" })
      .int({ error: "must be a whole number" })
      .min(0, { error: "must be 0 or greater" })
      .optional(),
    timeS: finite().min(0, { error: "must be 0 or greater" }).optional(),
  })
  .strict();
export type CommentInput = z.infer<typeof commentSchema>;

/** Longest reason a reviewer may give for approving a submission whose check found faults. */
export const FAULT_APPROVAL_REASON_MAX = 1000;

export const decisionSchema = z
  .object({
    decision: z.enum(["returned", "approved"], { error: 'must be "returned" or "approved"' }),
    summary: z.string().trim().max(5000).default(""),
    /**
     * Approving a submission whose server check found a fault needs this (`true`) and a `reason`:
     * the reviewer has seen the faults and says why the work is accepted anyway.
     */
    confirmFaults: z.literal(true, { error: "must be true when given" }).optional(),
    reason: z
      .string({ error: "must be text" })
      .trim()
      .min(1, { error: "is required: say why the plan is approved despite its faults" })
      .max(FAULT_APPROVAL_REASON_MAX, { error: `must be at most ${FAULT_APPROVAL_REASON_MAX} characters` })
      .optional(),
  })
  .strict()
  .refine((d) => d.decision !== "returned" || d.summary.length > 0, {
    path: ["summary"],
    error: "is required when returning a submission",
  })
  .refine((d) => d.decision === "approved" || (d.confirmFaults === undefined && d.reason === undefined), {
    path: ["confirmFaults"],
    error: "applies to approvals only",
  })
  .refine((d) => !d.confirmFaults || d.reason !== undefined, {
    path: ["reason"],
    error: "is required when confirming faults: say why the plan is approved despite them",
  })
  .refine((d) => d.reason === undefined || d.confirmFaults === true, {
    path: ["confirmFaults"],
    error: "must be true when a reason is given",
  });
export type DecisionInput = z.infer<typeof decisionSchema>;

/** The review queue's filters and sort, from the query string. */
export const queueQuerySchema = z
  .object({
    courseId: uuid.optional(),
    assignmentId: uuid.optional(),
    status: z.enum(["submitted", "returned", "approved"]).optional(),
    verdict: z.enum(["pass", "caution", "fault"]).optional(),
    sort: z.enum(["submittedAt", "student", "assignment", "verdict", "status"]).default("submittedAt"),
    order: z.enum(["asc", "desc"]).default("asc"),
  })
  .strict();
export type QueueQuery = z.infer<typeof queueQuerySchema>;
