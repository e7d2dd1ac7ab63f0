import { inTransaction } from "@/lib/server/transaction";
import { recordAudit } from "@/db/queries/audit";
import { decideSubmission, listComments } from "@/db/queries/reviews";
import { getActiveUserById } from "@/db/queries/users";
import { json, readJson, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { AppError } from "@/lib/server/errors";
import { enqueueMail } from "@/lib/server/mail/queue";
import { submissionDecided } from "@/lib/server/mail/templates";
import { hasFaults, reportFaults } from "@/lib/shared/courses/faults";
import { submissionParams } from "@/lib/shared/schemas/courses";
import { decisionSchema } from "@/lib/shared/schemas/reviews";
import { loadSubmission, outbox } from "../../../courses/course-api";

/**
 * POST /api/v1/reviews/:submissionId/decision — approve or return submission :submissionId; the
 * student's e-mail is queued with it. Approving a submission whose server check found a fault is
 * refused (422) unless the body confirms the faults (`confirmFaults: true`) and gives a `reason`,
 * which is stored with the review and shown to the student.
 */
export const POST = route(async (request, context) => {
  const { submissionId } = await readParams(context, submissionParams);
  const body = await readJson(request, decisionSchema);
  const actor = await requireActor(request);
  const submission = await loadSubmission(actor, submissionId);
  authorizeCourse(submission.viewerRole, "review:decide");
  const faulted = hasFaults(submission);
  if (body.decision === "approved" && faulted && !body.confirmFaults) {
    const faults = reportFaults(submission.report);
    throw new AppError(
      "unprocessable:unconfirmed-faults",
      `${faults.length === 0 ? "The server's check of this submission ended in a fault." : `The server's check found ${faults.length === 1 ? "a fault" : `${faults.length} faults`} in this submission.`} To approve it anyway, confirm that you have seen the faults and give a reason; the student will see the reason.`,
      {
        issues: [{ path: "confirmFaults", message: "is required to approve a submission whose check has faults" }],
        details: { faults },
      },
    );
  }
  const faultApprovalReason = body.decision === "approved" && faulted ? (body.reason ?? null) : null;
  const reviewer = await getActiveUserById({ id: actor.userId });
  const comments = await listComments({ submissionId, userId: actor.userId });
  const result = await inTransaction(async () => {
    const result = await decideSubmission(
      { submissionId, reviewerId: actor.userId, decision: body.decision, summary: body.summary, faultApprovalReason },
      (review) => [
        outbox(
          `submission-${review.decision}`,
          `submission-decided:${review.id}`,
          submission.studentEmail,
          submissionDecided({
            studentName: submission.studentName,
            assignmentTitle: submission.assignment.title,
            courseTitle: submission.courseTitle,
            decision: review.decision,
            reviewerName: reviewer?.name ?? "Your instructor",
            summary: review.summary,
            faultApprovalReason: review.faultApprovalReason,
            commentCount: comments.length,
            submissionId,
          }),
        ),
      ],
    );
    if (!result) throw new AppError("conflict:submission", "This submission was already decided.");
    await recordAudit({
      actorId: actor.userId,
      action: `submission.${body.decision === "approved" ? "approve" : "return"}`,
      targetType: "submission",
      targetId: submissionId,
      detail: { reviewId: result.review.id, faultsConfirmed: faultApprovalReason !== null },
    });
    return result;
  });
  await enqueueMail(result.mailIds);
  return json({ review: result.review }, 201);
});
