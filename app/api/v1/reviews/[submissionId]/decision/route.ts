import { recordAudit } from "@/db/queries/audit";
import { decideSubmission, listComments } from "@/db/queries/reviews";
import { getActiveUserById } from "@/db/queries/users";
import { json, readJson, readParams, route } from "@/lib/server/route";
import { requireActor } from "@/lib/server/auth-request";
import { authorizeCourse } from "@/lib/server/permissions";
import { AppError } from "@/lib/server/errors";
import { enqueueMail } from "@/lib/server/mail/queue";
import { submissionDecided } from "@/lib/server/mail/templates";
import { submissionParams } from "@/lib/shared/schemas/courses";
import { decisionSchema } from "@/lib/shared/schemas/reviews";
import { loadSubmission, outbox } from "../../../courses/course-api";

/** POST /api/v1/reviews/:submissionId/decision — approve or return submission :submissionId; the student's e-mail is queued with it. */
export const POST = route(async (request, context) => {
  const { submissionId } = await readParams(context, submissionParams);
  const body = await readJson(request, decisionSchema);
  const actor = await requireActor(request);
  const submission = await loadSubmission(actor, submissionId);
  authorizeCourse(submission.viewerRole, "review:decide");
  const reviewer = await getActiveUserById({ id: actor.userId });
  const comments = await listComments({ submissionId, userId: actor.userId });
  const result = await decideSubmission({ submissionId, reviewerId: actor.userId, decision: body.decision, summary: body.summary }, (review) => [
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
        commentCount: comments.length,
        submissionId,
      }),
    ),
  ]);
  if (!result) throw new AppError("conflict:submission", "This submission was already decided.");
  await recordAudit({ actorId: actor.userId, action: `submission.${body.decision === "approved" ? "approve" : "return"}`, targetType: "submission", targetId: submissionId, detail: { reviewId: result.review.id } });
  await enqueueMail(result.mailIds);
  return json({ review: result.review }, 201);
});
