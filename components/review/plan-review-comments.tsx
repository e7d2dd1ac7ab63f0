"use client";
/**
 * The review comments of a plan's latest returned submission, for the student's bench: mount it in
 * a rail of the editor with the plan's id and a jump callback (seek the playhead, select the move),
 * and the instructor's comments appear where the student edits. Shows nothing when the plan has no
 * returned submission.
 */
import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { RailHeading } from "@/components/ui/panel";
import { courseApi, courseKeys } from "@/components/courses/course-client";

export interface PlanReviewCommentsProps {
  planId: string;
  /** Joint names, to label comments pinned to a joint. */
  joints: readonly string[];
  /** Move the stage and plots to a comment's moment (and select its move). */
  onJump: (timeS: number, move: number | null) => void;
}

export function PlanReviewComments({ planId, joints, onJump }: PlanReviewCommentsProps) {
  const own = useQuery({ queryKey: courseKeys.ownSubmissions, queryFn: courseApi.ownSubmissions });
  const latest = own.data?.filter((s) => s.planId === planId).sort((a, b) => b.submittedAt.localeCompare(a.submittedAt))[0];
  const returned = latest?.status === "returned" ? latest : undefined;
  const detail = useQuery({ queryKey: courseKeys.submission(returned?.id ?? "none"), queryFn: () => courseApi.submission(returned!.id), enabled: Boolean(returned) });
  if (!returned || !detail.data) return null;
  const { submission, comments } = detail.data;
  return (
    <section aria-label="Review comments" className="border-t border-line">
      <RailHeading action={<Link href={`/reviews/${submission.id}`} className="text-xs text-brand-700 hover:underline">Open review</Link>}>Review comments</RailHeading>
      <div className="px-3 pb-3">
        <p className="text-xs text-ink-soft">
          {returned.assignmentTitle}, attempt {returned.attempt}: returned.{submission.review?.summary ? ` ${submission.review.summary}` : ""}
        </p>
        <ol className="mt-2 flex flex-col gap-1.5">
          {comments.map((c) => (
            <li key={c.id}>
              <button
                type="button"
                className="w-full rounded-md border border-line px-2 py-1 text-left text-sm hover:border-brand-500"
                onClick={() => onJump(c.timeS ?? 0, c.moveIndex)}
              >
                <span className="tabular block text-[11px] text-ink-faint">
                  {c.moveIndex !== null ? `Move ${c.moveIndex}` : "Whole plan"}
                  {c.jointIndex !== null ? ` · ${joints[c.jointIndex] ?? `joint ${c.jointIndex}`}` : ""}
                  {c.timeS !== null ? ` · t = ${c.timeS.toFixed(3)} s` : ""}
                </span>
                {c.body}
              </button>
            </li>
          ))}
        </ol>
      </div>
    </section>
  );
}
