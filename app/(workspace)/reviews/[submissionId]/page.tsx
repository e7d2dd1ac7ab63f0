import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { getSubmissionForUser, listComments } from "@/db/queries/reviews";
import type { BenchPlan } from "@/components/editor/plan-state";
import { ReviewWorkspace } from "@/components/review/review-workspace";
import { hasFaults, reportFaults } from "@/lib/shared/courses/faults";
import { tightenArm, type RuleProblem } from "@/lib/shared/courses/rules";
import { limitsSchema } from "@/lib/shared/schemas/courses";
import { parsePlan, type Report } from "@/kinematics";
import { requirePageActor } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";

export const metadata: Metadata = { title: "Review" };
export const dynamic = "force-dynamic";

/**
 * One submission, read-only, in the same stage, plots and findings as the bench — drawn against
 * the limits it was checked against (the arm's, tightened by the course and the assignment) — with
 * the review's comments pinned to moves, joints and moments; instructors comment and decide here.
 */
export default async function ReviewPage({ params }: { params: Promise<{ submissionId: string }> }) {
  const { submissionId } = await params;
  const actor = await requirePageActor(`/reviews/${submissionId}`);
  if (!/^[0-9a-f-]{36}$/i.test(submissionId)) notFound();
  const submission = await getSubmissionForUser({ submissionId, userId: actor.userId });
  if (!submission) notFound();
  const comments = await listComments({ submissionId, userId: actor.userId });
  const parsed = parsePlan(submission.document);
  if (!parsed.ok) throw new Error(`submission ${submissionId} does not parse as a plan document`);
  const raw = submission.document as { arm?: { chain?: unknown }; keepOut?: unknown };
  const limits = [
    limitsSchema.nullable().catch(null).parse(submission.courseLimits),
    limitsSchema.nullable().catch(null).parse(submission.assignment.limits),
  ];
  const plan = {
    ...parsed.value,
    arm: { ...tightenArm(parsed.value.arm, ...limits), chain: raw.arm?.chain },
    keepOut: raw.keepOut,
  } as BenchPlan;

  return (
    <ReviewWorkspace
      plan={plan}
      report={submission.report as Report}
      ruleProblems={submission.ruleProblems as RuleProblem[]}
      faults={reportFaults(submission.report)}
      needsFaultConfirmation={hasFaults(submission)}
      canReview={
        capabilities(actor, { kind: "submission", viewerRole: submission.viewerRole, status: submission.status })
          .canDecide
      }
      viewerRole={submission.viewerRole}
      meta={{
        id: submission.id,
        studentName: submission.studentName,
        assignmentTitle: submission.assignment.title,
        courseTitle: submission.courseTitle,
        submittedAt: submission.submittedAt.toISOString(),
        late: submission.late,
        attempt: submission.attempt,
        previousId: submission.previousId,
        status: submission.status,
        planVersionNumber: submission.planVersionNumber,
        planId: submission.planId,
        review: submission.review
          ? {
              decision: submission.review.decision,
              summary: submission.review.summary,
              faultApprovalReason: submission.review.faultApprovalReason,
            }
          : null,
      }}
      comments={comments.map((c) => ({
        id: c.id,
        body: c.body,
        authorName: c.authorName,
        moveIndex: c.moveIndex,
        jointIndex: c.jointIndex,
        timeS: c.timeS,
        createdAt: c.createdAt.toISOString(),
      }))}
    />
  );
}
