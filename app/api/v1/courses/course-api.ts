/**
 * Glue shared by the course, assignment, submission and review handlers: loading a course or a
 * submission for the actor (404 when it does not exist for them), the mails each event queues, and
 * the CSV writer. Route files stay thin: parse → authenticate → load → authorise → act.
 */
import "server-only";
import {
  getAssignmentForUser,
  getCourseForUser,
  type AssignmentForUser,
  type CourseForUser,
} from "@/db/queries/courses";
import type { OutboxInput } from "@/db/queries/mail";
import { getSubmissionForUser, type SubmissionForUser } from "@/db/queries/reviews";
import type { Actor } from "@/lib/server/permissions";
import { AppError } from "@/lib/server/errors";
import type { MailContent } from "@/lib/server/mail/templates";

export async function loadCourse(actor: Actor, courseId: string): Promise<CourseForUser> {
  const course = await getCourseForUser({ courseId, userId: actor.userId });
  if (!course) throw new AppError("not_found:course", "No such course, or you are not enrolled in it.");
  return course;
}

export async function loadAssignment(actor: Actor, assignmentId: string): Promise<AssignmentForUser> {
  const assignment = await getAssignmentForUser({ assignmentId, userId: actor.userId });
  if (!assignment)
    throw new AppError("not_found:assignment", "No such assignment, or you are not enrolled in its course.");
  return assignment;
}

export async function loadSubmission(actor: Actor, submissionId: string): Promise<SubmissionForUser> {
  const submission = await getSubmissionForUser({ submissionId, userId: actor.userId });
  if (!submission) throw new AppError("not_found:submission", "No such submission, or it is not yours to see.");
  return submission;
}

/** An outbox row for one message of one event. */
export function outbox(kind: string, dedupeKey: string, toAddress: string, content: MailContent): OutboxInput {
  return { kind, dedupeKey, toAddress, ...content };
}

/** One CSV field (RFC 4180 quoting); a leading = + - @ is prefixed with ' so spreadsheets do not run it as a formula. */
export function csvField(value: string | number | boolean | null | undefined): string {
  if (value === null || value === undefined) return "";
  let s = String(value);
  if (typeof value === "string" && /^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function csv(rows: (string | number | boolean | null | undefined)[][]): string {
  return rows.map((r) => r.map(csvField).join(",")).join("\r\n") + "\r\n";
}

/**
 * The one answer for an arm revision a course or assignment may not name: the same words whether it
 * does not exist or belongs to a project the caller cannot read, so the answer reveals neither.
 */
export const UNUSABLE_ARM_REVISION =
  "A course or assignment can require only a built-in arm revision or one from a project you are a member of; choose one from the list of your arms.";

/** The link students follow to join a course. */
export function joinPath(joinCode: string): string {
  return `/courses/join?code=${encodeURIComponent(joinCode)}`;
}
