"use client";
/**
 * The review comments of a plan's latest returned submission, for the student's bench: the bench
 * mounts it in its left rail with the plan's id and a jump callback (seek the playhead, select the
 * move), and the instructor's comments appear where the student edits. Shows nothing when the plan
 * has no returned submission.
 */
import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { RailHeading } from "@/components/ui/panel";
import { courseApi, courseKeys, type OwnSubmissionDto, type SubmissionDetailDto } from "@/components/courses/course-client";

/** Where a comment is pinned: a move, a joint and a moment (s from the plan's start), each optional. */
export type CommentPin = { moveIndex: number | null; jointIndex: number | null; timeS: number | null };

/**
 * Where the bench goes for a pin on the plan as it is now (it may have changed since it was submitted):
 * the pinned time, else the pinned move's start, else 0; a move or joint that no longer exists is dropped.
 */
export function pinTarget(pin: CommentPin, moveStartsS: ArrayLike<number>, moveCount: number, jointCount: number): { timeS: number; move: number | null; joint: number | null } {
  const move = pin.moveIndex !== null && pin.moveIndex >= 0 && pin.moveIndex < moveCount ? pin.moveIndex : null;
  const joint = pin.jointIndex !== null && pin.jointIndex >= 0 && pin.jointIndex < jointCount ? pin.jointIndex : null;
  const timeS = pin.timeS !== null && Number.isFinite(pin.timeS) ? pin.timeS : move !== null ? (moveStartsS[move] ?? 0) : 0;
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
export function returnedSubmissionOf(own: readonly OwnSubmissionDto[], planId: string): OwnSubmissionDto | undefined {
  const latest = own.filter((s) => s.planId === planId).sort((a, b) => b.submittedAt.localeCompare(a.submittedAt))[0];
  return latest?.status === "returned" ? latest : undefined;
}

export function PlanReviewComments({ planId, joints, onJump }: PlanReviewCommentsProps) {
  const own = useQuery({ queryKey: courseKeys.ownSubmissions, queryFn: courseApi.ownSubmissions });
  const returned = own.data ? returnedSubmissionOf(own.data, planId) : undefined;
  const detail = useQuery({ queryKey: courseKeys.submission(returned?.id ?? "none"), queryFn: () => courseApi.submission(returned!.id), enabled: Boolean(returned) });
  if (!returned || !detail.data) return null;
  return <ReviewCommentList returned={returned} detail={detail.data} joints={joints} onJump={onJump} />;
}

export interface ReviewCommentListProps {
  returned: OwnSubmissionDto;
  detail: SubmissionDetailDto;
  joints: readonly string[];
  onJump: (pin: CommentPin) => void;
}

/** The rail section itself: the instructor's summary, then one button per comment that jumps to its pin. */
export function ReviewCommentList({ returned, detail, joints, onJump }: ReviewCommentListProps) {
  const { submission, comments } = detail;
  return (
    <section aria-label="Review comments" className="border-b border-line bg-caution-tint/40" data-testid="review-comments">
      <RailHeading action={<Link href={`/reviews/${submission.id}`} className="text-xs text-brand-700 hover:underline">Open review</Link>}>Review comments</RailHeading>
      <div className="px-3 pb-3">
        <p className="text-xs text-ink-soft">
          {returned.assignmentTitle}, attempt {returned.attempt}: returned.{submission.review?.summary ? ` ${submission.review.summary}` : ""}
        </p>
        {comments.length === 0 ? <p className="mt-2 text-xs text-ink-faint">No comments pinned to the plan; the summary above is the whole review.</p> : null}
        <ol className="mt-2 flex flex-col gap-1.5">
          {comments.map((c) => {
            const where = [
              c.moveIndex !== null ? `Move ${c.moveIndex}` : "Whole plan",
              c.jointIndex !== null ? (joints[c.jointIndex] ?? `joint ${c.jointIndex}`) : null,
              c.timeS !== null ? `t = ${c.timeS.toFixed(3)} s` : null,
            ].filter(Boolean).join(" · ");
            return (
              <li key={c.id}>
                <button
                  type="button"
                  className="w-full rounded-md border border-line bg-panel px-2 py-1 text-left text-sm hover:border-brand-500"
                  aria-label={`${c.authorName}: ${c.body} (${where}). Show on the timeline`}
                  onClick={() => onJump({ moveIndex: c.moveIndex, jointIndex: c.jointIndex, timeS: c.timeS })}
                >
                  <span className="tabular block text-[11px] text-ink-faint">{where} · {c.authorName}</span>
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
