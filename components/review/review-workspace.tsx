"use client";
import { submissionStatusWords } from "./status-words";
import dynamic from "next/dynamic";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState, useSyncExternalStore, type FormEvent } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { FindingsPanel, verdictCount, type PanelFinding } from "@/components/findings/findings-panel";
import { findingTimeS, worstFirst } from "@/components/findings/finding-time";
import { JointPlots, type PlotMarker } from "@/components/plots/joint-plots";
import { plotRateHz } from "@/components/plots/downsample";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure, numberOrEmpty } from "@/components/ui/form";
import { DateTime } from "@/components/ui/date-time";
import { ErrorNote, RailHeading } from "@/components/ui/panel";
import { Skeleton } from "@/components/ui/skeleton";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { StageErrorBoundary, webglAvailable } from "@/components/viewer/error-boundary";
import { linkSeverityOf } from "@/components/viewer/link-severity";
import { schematicChain } from "@/components/viewer/schematic-chain";
import type { BenchPlan } from "@/components/editor/plan-state";
import { Playhead, PlayheadContext, usePlayhead, useSyncTotal } from "@/components/editor/playhead";
import { Transport } from "@/components/editor/transport";
import type { RuleProblem } from "@/lib/shared/courses/rules";
import { api } from "@/lib/client/api-client";
import type { SubmissionFault } from "@/lib/shared/courses/faults";
import { commentSchema, decisionSchema, type CommentInput, type DecisionInput } from "@/lib/shared/schemas/reviews";
import { FaultApprovalDialog } from "./fault-approval-dialog";
import { moveLabel, type Report, sampleTimeline, timelineOf, type Timeline } from "@/kinematics";
import type { AngleUnit } from "@/lib/shared/units";

const Stage = dynamic(() => import("@/components/viewer/stage"), {
  ssr: false,
  loading: () => <Skeleton className="h-full w-full rounded-none" />,
});

export type ReviewComment = {
  id: string;
  body: string;
  authorName: string;
  moveIndex: number | null;
  jointIndex: number | null;
  timeS: number | null;
  createdAt: string;
};

export interface ReviewWorkspaceProps {
  plan: BenchPlan;
  /** The server's report against the assignment's limits, stored at submission time. */
  report: Report;
  ruleProblems: RuleProblem[];
  /** The faults of the server's check; approving with any (or with a fault verdict) needs a confirmation and a reason. */
  faults: SubmissionFault[];
  needsFaultConfirmation: boolean;
  canReview: boolean;
  viewerRole: "instructor" | "student";
  meta: {
    id: string;
    studentName: string;
    assignmentTitle: string;
    courseTitle: string;
    submittedAt: string;
    late: boolean;
    attempt: number;
    previousId: string | null;
    status: "submitted" | "returned" | "approved";
    planVersionNumber: number;
    planId: string | null;
    review: { decision: "returned" | "approved"; summary: string; faultApprovalReason: string | null } | null;
  };
  comments: ReviewComment[];
}

const statusWords = submissionStatusWords;
const noSubscribe = () => () => {};

/** The move running at time t (s): the last one that starts at or before it. */
function moveAt(timeline: Timeline, timeS: number): number | null {
  let found: number | null = null;
  for (let i = 0; i < timeline.moveCount; i++) if (timeline.startS[i] <= timeS + 1e-9) found = i;
  return found;
}

/** The review page: the submitted plan read-only in the stage, plots and findings, and the pinned comments. */
export function ReviewWorkspace({
  plan,
  report,
  ruleProblems,
  faults,
  needsFaultConfirmation,
  canReview,
  viewerRole,
  meta,
  comments,
}: ReviewWorkspaceProps) {
  const playhead = useMemo(() => new Playhead(), []);
  const timeline = useMemo(() => timelineOf(plan), [plan]);
  const samples = useMemo(
    () => sampleTimeline(timeline, plotRateHz(plan.arm.controlRateHz, timeline.totalS)),
    [timeline, plan.arm.controlRateHz],
  );
  useSyncTotal(playhead, timeline.totalS);
  const [unit] = useState<AngleUnit>("deg");
  const [selectedJoints, setSelectedJoints] = useState<number[]>(() => [worstFirst(report.findings)[0]?.joint ?? 0]);
  const [selectedComment, setSelectedComment] = useState<string | null>(null);
  const canRender3d = useSyncExternalStore(noSubscribe, webglAvailable, () => null);
  const chain = useMemo(() => plan.arm.chain ?? schematicChain(plan.arm.joints), [plan.arm.chain, plan.arm.joints]);

  const items: PanelFinding[] = useMemo(
    () => worstFirst(report.findings).map((finding) => ({ finding, timeS: findingTimeS(finding, timeline) })),
    [report, timeline],
  );
  const markers: PlotMarker[] = useMemo(
    () => items.map((i) => ({ timeS: i.timeS, joint: i.finding.joint, severity: i.finding.severity })),
    [items],
  );
  const linkSeverity = useMemo(() => linkSeverityOf(report.moves, chain), [report, chain]);
  const ghosts = useMemo(() => [{ pose: plan.start, label: "start" as const }], [plan.start]);

  const jumpTo = (timeS: number, joint: number | null) => {
    playhead.pause();
    playhead.seek(timeS);
    if (joint !== null) setSelectedJoints((s) => (s.includes(joint) ? s : [joint, ...s]));
  };

  return (
    <PlayheadContext.Provider value={playhead}>
      <div className="flex h-[calc(100vh-3.5rem)] min-h-[640px] flex-col">
        <header className="flex flex-wrap items-center gap-x-4 gap-y-1 border-b border-line bg-panel px-4 py-2">
          <div className="min-w-0">
            <p className="text-xs">
              <Link href="/reviews" className="text-brand-700 hover:underline">
                Reviews
              </Link>
            </p>
            <h1 className="truncate text-base font-semibold" data-testid="review-title">
              {meta.studentName} · {meta.assignmentTitle}
            </h1>
            <p className="tabular truncate text-xs text-ink-soft">
              {meta.courseTitle} · plan version {meta.planVersionNumber} · attempt {meta.attempt}
              {meta.previousId ? (
                <>
                  {" "}
                  (
                  <Link className="text-brand-700 hover:underline" href={`/reviews/${meta.previousId}`}>
                    previous
                  </Link>
                  )
                </>
              ) : null}
              {" · submitted "}
              <DateTime value={meta.submittedAt} />
              {meta.late ? " · late" : ""}
            </p>
          </div>
          <VerdictChip verdict={report.verdict} detail={verdictCount(report.findings, report.verdict)} />
          <span className="rounded-full border border-line px-2 py-0.5 text-xs" data-testid="review-status">
            {statusWords[meta.status]}
          </span>
          <p className="ml-auto max-w-md text-[11px] text-ink-faint">
            Read-only: checked on the server against the assignment&apos;s limits at submission time. Limits drawn here
            are those stricter limits.
          </p>
        </header>

        <div className="grid min-h-0 flex-1 grid-cols-[minmax(300px,340px)_1fr_minmax(260px,310px)]">
          <aside aria-label="Comments" className="flex min-h-0 flex-col overflow-y-auto border-r border-line bg-panel">
            {ruleProblems.length > 0 ? (
              <div className="border-b border-line px-3 py-2">
                <p className="text-xs font-semibold text-fault">Assignment rules not met</p>
                <ul className="mt-1 list-disc pl-4 text-xs text-ink-soft">
                  {ruleProblems.map((p) => (
                    <li key={p.rule}>{p.message}</li>
                  ))}
                </ul>
              </div>
            ) : null}
            {meta.review ? (
              <div className="border-b border-line px-3 py-2" data-testid="review-summary">
                <p className="text-xs font-semibold">{meta.review.decision === "approved" ? "Approved" : "Returned"}</p>
                {meta.review.summary ? <p className="mt-0.5 text-sm">{meta.review.summary}</p> : null}
                {meta.review.faultApprovalReason ? (
                  <div
                    className="mt-1.5 rounded-md border border-fault/40 bg-fault-tint/40 px-2 py-1.5 text-xs"
                    data-testid="fault-approval-reason"
                  >
                    <p className="font-semibold text-fault">Approved although the server&apos;s check found faults</p>
                    <p className="mt-0.5">Reason given: {meta.review.faultApprovalReason}</p>
                    <p className="mt-0.5 text-ink-soft">
                      The faults are still in the plan. Approval means the work was accepted; what runs on the
                      lab&apos;s arm is decided by the lab&apos;s safety rules.
                    </p>
                  </div>
                ) : null}
                {viewerRole === "student" && meta.review.decision === "returned" ? (
                  <p className="mt-1 text-xs text-ink-soft">
                    Change the plan in your project, save a new version and submit it again from the course page.
                  </p>
                ) : null}
              </div>
            ) : null}
            <RailHeading>Comments</RailHeading>
            <ol className="flex flex-col gap-2 px-3 pb-3" data-testid="comments">
              {comments.length === 0 ? <li className="text-xs text-ink-faint">No comments yet.</li> : null}
              {comments.map((c) => (
                <li key={c.id}>
                  <button
                    type="button"
                    className={`w-full rounded-md border px-2 py-1.5 text-left text-sm hover:border-brand-500 ${selectedComment === c.id ? "border-brand-500 bg-brand-50" : "border-line"}`}
                    onClick={() => {
                      setSelectedComment(c.id);
                      const t = c.timeS ?? (c.moveIndex !== null ? (timeline.startS[c.moveIndex] ?? 0) : 0);
                      jumpTo(t, c.jointIndex);
                    }}
                  >
                    <span className="tabular block text-[11px] text-ink-faint">
                      {c.moveIndex !== null ? moveLabel(c.moveIndex) : "Whole plan"}
                      {c.jointIndex !== null
                        ? ` · ${plan.arm.joints[c.jointIndex]?.name ?? `joint ${c.jointIndex + 1} (no longer in the arm)`}`
                        : ""}
                      {c.timeS !== null ? ` · t = ${c.timeS.toFixed(3)} s` : ""}
                    </span>
                    {c.body}
                    <span className="block text-[11px] text-ink-faint">
                      {c.authorName} · <DateTime value={c.createdAt} />
                    </span>
                  </button>
                </li>
              ))}
            </ol>
            {canReview ? (
              <ReviewActions
                submissionId={meta.id}
                timeline={timeline}
                joints={plan.arm.joints.map((j) => j.name)}
                faults={faults}
                needsFaultConfirmation={needsFaultConfirmation}
              />
            ) : null}
          </aside>

          <section aria-label="Stage and timeline" className="flex min-h-0 min-w-0 flex-col">
            <div className="relative min-h-[240px] flex-1 bg-[#f3f1ea]" data-testid="stage">
              {canRender3d === false ? (
                <div
                  role="alert"
                  className="flex h-full items-center justify-center p-6 text-center text-sm text-ink-soft"
                >
                  This browser offers no WebGL, so the 3D view is off. The findings, comments and plots still work.
                </div>
              ) : canRender3d ? (
                <StageErrorBoundary>
                  <Stage
                    chain={chain}
                    joints={plan.arm.joints}
                    timeline={timeline}
                    ghosts={ghosts}
                    linkSeverity={linkSeverity}
                    keepOut={plan.keepOut}
                    findings={report.findings}
                  />
                </StageErrorBoundary>
              ) : (
                <Skeleton className="h-full w-full rounded-none" />
              )}
            </div>
            <Transport />
            <div className="border-t border-line bg-panel px-2 py-1.5" data-testid="plots">
              <JointPlots
                samples={samples}
                joints={plan.arm.joints}
                cautionRatio={plan.arm.cautionRatio}
                unit={unit}
                selectedJoints={selectedJoints}
                onSelectedJointsChange={setSelectedJoints}
                markers={markers}
              />
            </div>
          </section>

          <aside aria-label="Findings" className="flex min-h-0 flex-col border-l border-line bg-paper">
            <FindingsPanel
              verdict={report.verdict}
              items={items}
              joints={plan.arm.joints}
              onJump={(t) => jumpTo(t, null)}
              className="min-h-0 flex-1"
            />
          </aside>
        </div>
      </div>
    </PlayheadContext.Provider>
  );
}

/** Comment pinned to the playhead's moment (and its move) and a chosen joint; approve or return. */
function ReviewActions({
  submissionId,
  timeline,
  joints,
  faults,
  needsFaultConfirmation,
}: {
  submissionId: string;
  timeline: Timeline;
  joints: string[];
  faults: SubmissionFault[];
  needsFaultConfirmation: boolean;
}) {
  const router = useRouter();
  const { timeS } = usePlayhead();
  const [pinTime, setPinTime] = useState(true);
  const move = moveAt(timeline, timeS);

  // the comment: the API's own schema (commentSchema); the pin comes from the playhead when sent
  const commentForm = useForm<CommentValues, unknown, CommentInput>({
    resolver: zodResolver(commentSchema),
    defaultValues: { body: "" },
  });
  const [commentFailure, setCommentFailure] = useState<string | undefined>();
  const body = useWatch({ control: commentForm.control, name: "body" });
  const sendComment = commentForm.handleSubmit(async (input) => {
    setCommentFailure(undefined);
    try {
      await api.addComment(submissionId, input);
      commentForm.reset({ body: "", jointIndex: input.jointIndex });
      router.refresh();
    } catch (error) {
      setCommentFailure(formFailure(error, applyApiIssues(apiIssues(error), commentForm.setError, commentFields)));
    }
  });
  const onComment = (e: FormEvent<HTMLFormElement>) => {
    const pinned = pinTime && move !== null;
    commentForm.setValue("moveIndex", pinned ? move : undefined);
    commentForm.setValue("timeS", pinned ? Math.round(timeS * 1000) / 1000 : undefined);
    return sendComment(e);
  };

  // the decision: the API's own schema (decisionSchema), the reason typed in the fault dialog
  const decisionForm = useForm<DecisionValues, unknown, DecisionInput>({
    resolver: zodResolver(decisionSchema),
    defaultValues: { decision: "returned", summary: "" },
  });
  const [confirming, setConfirming] = useState(false);
  const [decideFailure, setDecideFailure] = useState<string | undefined>();
  const reason = useWatch({ control: decisionForm.control, name: "reason" }) ?? "";
  const errors = decisionForm.formState.errors;
  const sendDecision = decisionForm.handleSubmit(async (input) => {
    setDecideFailure(undefined);
    try {
      await api.decide(submissionId, input);
      setConfirming(false);
      router.refresh();
    } catch (error) {
      setDecideFailure(formFailure(error, applyApiIssues(apiIssues(error), decisionForm.setError, decisionFields)));
    }
  });
  const decide = (decision: "returned" | "approved") => {
    const confirmFaults = decision === "approved" && needsFaultConfirmation;
    decisionForm.setValue("decision", decision);
    decisionForm.setValue("confirmFaults", confirmFaults ? true : undefined);
    if (!confirmFaults) decisionForm.setValue("reason", undefined);
    void sendDecision();
  };
  const pending = decisionForm.formState.isSubmitting;

  return (
    <div className="mt-auto border-t border-line px-3 py-3">
      <form onSubmit={onComment} className="flex flex-col gap-2" noValidate>
        <TextAreaField
          label="Comment"
          rows={3}
          error={fieldMessage("The comment", commentForm.formState.errors.body)}
          {...commentForm.register("body")}
        />
        <label className="flex items-center gap-2 text-xs text-ink-soft">
          <input type="checkbox" checked={pinTime} onChange={(e) => setPinTime(e.target.checked)} />
          Pin to {move !== null ? `${moveLabel(move)} at t = ${timeS.toFixed(3)} s` : "the current moment"} (move the
          playhead to choose)
        </label>
        <SelectField
          label="Joint"
          error={fieldMessage("The joint", commentForm.formState.errors.jointIndex)}
          {...commentForm.register("jointIndex", { setValueAs: numberOrEmpty })}
        >
          <option value="">No particular joint</option>
          {joints.map((name, j) => (
            <option key={name} value={j}>
              {name}
            </option>
          ))}
        </SelectField>
        <Button type="submit" size="sm" disabled={commentForm.formState.isSubmitting || !body?.trim()}>
          Add comment
        </Button>
        {commentFailure ? <ErrorNote>{commentFailure}</ErrorNote> : null}
      </form>
      <div className="mt-4 flex flex-col gap-2 border-t border-line pt-3">
        <TextAreaField
          label="Summary for the student"
          rows={2}
          error={fieldMessage("The summary", errors.summary)}
          hint="Required when returning."
          {...decisionForm.register("summary")}
        />
        <div className="flex gap-2">
          <Button variant="danger" size="sm" disabled={pending} onClick={() => decide("returned")}>
            Return with comments
          </Button>
          <Button
            variant="primary"
            size="sm"
            disabled={pending}
            onClick={() => (needsFaultConfirmation ? setConfirming(true) : decide("approved"))}
          >
            {needsFaultConfirmation ? "Approve despite faults…" : "Approve"}
          </Button>
        </div>
        {decideFailure && !confirming ? <ErrorNote>{decideFailure}</ErrorNote> : null}
      </div>
      <FaultApprovalDialog
        open={confirming}
        faults={faults}
        joints={joints}
        reason={reason}
        onReasonChange={(text) =>
          decisionForm.setValue("reason", text, { shouldValidate: errors.reason !== undefined })
        }
        reasonError={fieldMessage("The reason", errors.reason)}
        pending={pending}
        error={decideFailure ?? null}
        onCancel={() => setConfirming(false)}
        onApprove={() => decide("approved")}
      />
    </div>
  );
}

/** The fields of the review's two forms as react-hook-form names them, for the API's problem list. */
const commentFields = ["body", "jointIndex", "moveIndex", "timeS"] as const;
const decisionFields = ["summary", "reason"] as const;
type CommentValues = z.input<typeof commentSchema>;
type DecisionValues = z.input<typeof decisionSchema>;
