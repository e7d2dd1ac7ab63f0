/**
 * The e-mail messages: each has a subject, a plain-text part and an HTML part, and a link back into
 * the app at APP_URL. Wording is calm and exact: what happened, what to do next.
 */
import { env } from "@/lib/server/env";

export type MailContent = { subject: string; text: string; html: string };

/** Escapes text for HTML element content and attribute values. */
export function escapeHtml(value: string): string {
  return value.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] ?? c,
  );
}

/** An absolute link into the app. */
export function appLink(path: string): string {
  return new URL(path, env().APP_URL).toString();
}

/** Paragraphs and one call to action, as text and as HTML. */
function compose(
  subject: string,
  paragraphs: string[],
  action: { label: string; url: string },
  footer?: string,
): MailContent {
  const foot = footer ?? "You receive this because of your account on Jointproof.";
  const text = [...paragraphs, `${action.label}: ${action.url}`, "", "--", foot].join("\n\n");
  const html = [
    "<!doctype html>",
    '<html lang="en"><body style="font-family: system-ui, sans-serif; color: #1d2430; line-height: 1.5">',
    ...paragraphs.map((p) => `<p>${escapeHtml(p).replace(/\n/g, "<br>")}</p>`),
    `<p><a href="${escapeHtml(action.url)}" style="color: #185b6e">${escapeHtml(action.label)}</a></p>`,
    `<p style="color: #4a5261; font-size: 0.875em">${escapeHtml(foot)}</p>`,
    "</body></html>",
  ].join("\n");
  return { subject, text, html };
}

export function courseInvitation(input: {
  courseTitle: string;
  term: string;
  instructorName: string;
  joinCode: string;
}): MailContent {
  const url = appLink(`/courses/join?code=${encodeURIComponent(input.joinCode)}`);
  return compose(
    `Invitation to ${input.courseTitle} (${input.term})`,
    [
      `${input.instructorName} invites you to the course ${input.courseTitle} (${input.term}) on Jointproof.`,
      `Sign in or create an account, then follow the link below or enter the join code ${input.joinCode} on the courses page.`,
    ],
    { label: "Join the course", url },
  );
}

export function submissionReceived(input: {
  instructorName: string;
  studentName: string;
  assignmentTitle: string;
  courseTitle: string;
  attempt: number;
  verdict: string;
  late: boolean;
  ruleProblemCount: number;
  submissionId: string;
}): MailContent {
  const facts = [
    `Verdict against the assignment's limits: ${input.verdict}.`,
    input.ruleProblemCount > 0
      ? `Assignment rules not met: ${input.ruleProblemCount}.`
      : "All assignment rules are met.",
    input.late ? "Submitted after the due date." : "Submitted on time.",
  ].join(" ");
  return compose(
    `Submission: ${input.studentName}, ${input.assignmentTitle}${input.attempt > 1 ? ` (attempt ${input.attempt})` : ""}`,
    [`${input.studentName} submitted a plan for ${input.assignmentTitle} in ${input.courseTitle}.`, facts],
    { label: "Open the review", url: appLink(`/reviews/${input.submissionId}`) },
  );
}

export function submissionDecided(input: {
  studentName: string;
  assignmentTitle: string;
  courseTitle: string;
  decision: "returned" | "approved";
  reviewerName: string;
  summary: string;
  /** Set when the reviewer approved although the server's check found faults. */
  faultApprovalReason?: string | null;
  commentCount: number;
  submissionId: string;
}): MailContent {
  const approved = input.decision === "approved";
  const paragraphs = approved
    ? [
        `${input.reviewerName} approved your plan for ${input.assignmentTitle} in ${input.courseTitle}: your instructor accepted the work for this assignment.`,
        ...(input.faultApprovalReason
          ? [
              `The server's check found faults in this plan; they are still there. ${input.reviewerName} approved it anyway, for this reason: ${input.faultApprovalReason}`,
            ]
          : []),
        "Approval is not a clearance to run the plan. Whether and how anything runs on the lab's arm is decided by your lab's safety rules and the people responsible for the arm; Jointproof's check is a prediction from a model, not a guarantee.",
      ]
    : [
        `${input.reviewerName} returned your plan for ${input.assignmentTitle} in ${input.courseTitle} with ${input.commentCount} comment${input.commentCount === 1 ? "" : "s"}.`,
        "Read the comments in the review, change the plan, save a new version and submit it again.",
      ];
  if (input.summary) paragraphs.push(`Summary: ${input.summary}`);
  return compose(
    approved ? `Approved: ${input.assignmentTitle}` : `Returned with comments: ${input.assignmentTitle}`,
    paragraphs,
    { label: "Open the review", url: appLink(`/reviews/${input.submissionId}`) },
  );
}

export function passwordReset(input: { name: string; token: string; validMinutes: number }): MailContent {
  return compose(
    "Reset your Jointproof password",
    [
      `Hello ${input.name},`,
      `Someone asked to reset the password of this account. The link below works once, for ${input.validMinutes} minutes.`,
      "If it was not you, ignore this message: your password stays as it is.",
    ],
    { label: "Choose a new password", url: appLink(`/reset-password?token=${encodeURIComponent(input.token)}`) },
  );
}

export function emailVerification(input: { name: string; token: string; validMinutes: number }): MailContent {
  return compose(
    "Confirm your e-mail address",
    [
      `Hello ${input.name},`,
      `Confirm that this address is yours. The link works once, for ${input.validMinutes} minutes.`,
    ],
    { label: "Confirm the address", url: appLink(`/verify-email?token=${encodeURIComponent(input.token)}`) },
  );
}
