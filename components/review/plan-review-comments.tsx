"use client";
/**
 * The review of a plan's latest submission, for the student's bench: the bench mounts it in its left
 * rail with the plan's id and a jump callback (seek the playhead, select the move). A returned
 * submission shows the instructor's comments where the student edits; an approval given although the
 * check found faults shows the reviewer's reason and that the faults remain. Shows nothing otherwise.
 */
import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { RailHeading } from "@/components/ui/panel";
import { moveLabel } from "@/kinematics";
import {
  api,
  type CommentDto,
  type OwnSubmissionDto,
  type ReviewDto,
  type SubmissionDto,
} from "@/lib/client/api-client";
import { queryKeys } from "@/lib/client/query-keys";

/** What the rail needs of one of the student's submissions (from the API's own-submissions list). */
export type SubmissionSummary = Pick<
  OwnSubmissionDto,
  "id" | "planId" | "status" | "attempt" | "assignmentTitle" | "submittedAt"
>;
/** What the rail needs of a submission's detail (from GET /api/v1/submissions/:submissionId). */
export type ReviewDetail = {
  submission: Pick<SubmissionDto, "id" | "status"> & {
    review: Pick<ReviewDto, "decision" | "summary" | "faultApprovalReason"> | null;
  };
  comments: Pick<CommentDto, "id" | "body" | "authorName" | "moveIndex" | "jointIndex" | "timeS">[];
};

/** Where a comment is pinned: a move, a joint and a moment (s from the plan's start), each optional. */
export type CommentPin = { moveIndex: number | null; jointIndex: number | null; timeS: number | null };

/**
 * Where the bench goes for a pin on the plan as it is now (it may have changed since it was submitted):
 * the pinned time, else the pinned move's start, else 0; a move or joint that no longer exists is dropped.
 */
export function pinTarget(
  pin: CommentPin,
  moveStartsS: ArrayLike<number>,
  moveCount: number,
  jointCount: number,
): { timeS: number; move: number | null; joint: number | null } {
  const move = pin.moveIndex !== null && pin.moveIndex >= 0 && pin.moveIndex < moveCount ? pin.moveIndex : null;
  const joint = pin.jointIndex !== null && pin.jointIndex >= 0 && pin.jointIndex < jointCount ? pin.jointIndex : null;
  const timeS =
    pin.timeS !== null && Number.isFinite(pin.timeS) ? pin.timeS : move !== null ? (moveStartsS[move] ?? 0) : 0;
  return { timeS, move, joint };
}

export interface PlanReviewCommentsProps {
  planId: string;
  /** Joint names, to label comments pinned to a joint. */
  joints: readonly string[];
  /** Move the stage and plots to a comment's pin (and select its move and joint). */
  onJump: (pin: CommentPin) => void;
}

/** The plan's latest submission when it was returned (a later resubmission or approval hides the comments). */
export function returnedSubmissionOf<S extends SubmissionSummary>(own: readonly S[], planId: string): S | undefined {
  const latest = latestSubmissionOf(own, planId);
  return latest?.status === "returned" ? latest : undefined;
}

/** The plan's latest submission once decided (returned or approved); undefined while it waits or when there is none. */
export function decidedSubmissionOf<S extends SubmissionSummary>(own: readonly S[], planId: string): S | undefined {
  const latest = latestSubmissionOf(own, planId);
  return latest && latest.status !== "submitted" ? latest : undefined;
}

function latestSubmissionOf<S extends SubmissionSummary>(own: readonly S[], planId: string): S | undefined {
  return own.filter((s) => s.planId === planId).sort((a, b) => b.submittedAt.localeCompare(a.submittedAt))[0];
}

export function PlanReviewComments({ planId, joints, onJump }: PlanReviewCommentsProps) {
  const own = useQuery({ queryKey: queryKeys.ownSubmissions(), queryFn: api.listOwnSubmissions });
  const decided = own.data ? decidedSubmissionOf(own.data, planId) : undefined;
  const detail = useQuery({
    queryKey: queryKeys.submission(decided?.id ?? "none"),
    queryFn: () => api.getSubmission(decided!.id),
    enabled: Boolean(decided),
  });
  if (!decided || !detail.data) return null;
  if (decided.status === "approved") return <FaultApprovalNotice detail={detail.data} />;
  return <ReviewCommentList returned={decided} detail={detail.data} joints={joints} onJump={onJump} />;
}

/** An approval given although the server's check found faults: the reviewer's reason, and that the faults remain. Nothing for a clean approval. */
export function FaultApprovalNotice({ detail }: { detail: ReviewDetail }) {
  const reason = detail.submission.review?.faultApprovalReason;
  if (!reason) return null;
  return (
    <section
      aria-label="Approved with faults"
      className="border-b border-line bg-fault-tint/40"
      data-testid="fault-approval"
    >
      <RailHeading
        action={
          <Link href={`/reviews/${detail.submission.id}`} className="text-xs text-brand-700 hover:underline">
            Open review
          </Link>
        }
      >
        Approved with faults
      </RailHeading>
      <div className="px-3 pb-3 text-xs">
        <p>
          Your instructor approved this submission although the server&apos;s check found faults. Reason given: {reason}
        </p>
        <p className="mt-1 text-ink-soft">
          The faults are still in the plan. Approval means the work was accepted; what runs on the lab&apos;s arm is
          decided by the lab&apos;s safety rules.
        </p>
      </div>
    </section>
  );
}

export interface ReviewCommentListProps {
  returned: SubmissionSummary;
  detail: ReviewDetail;
  joints: readonly string[];
  onJump: (pin: CommentPin) => void;
}

/** The rail section itself: the instructor's summary, then one button per comment that jumps to its pin. */
export function ReviewCommentList({ returned, detail, joints, onJump }: ReviewCommentListProps) {
  const { submission, comments } = detail;
  return (
    <section
      aria-label="Review comments"
      className="border-b border-line bg-caution-tint/40"
      data-testid="review-comments"
    >
      <RailHeading
        action={
          <Link href={`/reviews/${submission.id}`} className="text-xs text-brand-700 hover:underline">
            Open review
          </Link>
        }
      >
        Review comments
      </RailHeading>
      <div className="px-3 pb-3">
        <p className="text-xs text-ink-soft">
          {returned.assignmentTitle}, attempt {returned.attempt}: returned.
          {submission.review?.summary ? ` ${submission.review.summary}` : ""}
        </p>
        {comments.length === 0 ? (
          <p className="mt-2 text-xs text-ink-faint">
            No comments pinned to the plan; the summary above is the whole review.
          </p>
        ) : null}
        <ol className="mt-2 flex flex-col gap-1.5">
          {comments.map((c) => {
            const where = [
              c.moveIndex !== null ? moveLabel(c.moveIndex) : "Whole plan",
              c.jointIndex !== null
                ? (joints[c.jointIndex] ?? `joint ${c.jointIndex + 1} (no longer in the arm)`)
                : null,
              c.timeS !== null ? `t = ${c.timeS.toFixed(3)} s` : null,
            ]
              .filter(Boolean)
              .join(" · ");
            return (
              <li key={c.id}>
                <button
                  type="button"
                  className="w-full rounded-md border border-line bg-panel px-2 py-1 text-left text-sm hover:border-brand-500"
                  aria-label={`${c.authorName}: ${c.body} (${where}). Show on the timeline`}
                  onClick={() => onJump({ moveIndex: c.moveIndex, jointIndex: c.jointIndex, timeS: c.timeS })}
                >
                  <span className="tabular block text-[11px] text-ink-faint">
                    {where} · {c.authorName}
                  </span>
                  {c.body}
                </button>
              </li>
            );
          })}
        </ol>
      </div>
    </section>
  );
}
