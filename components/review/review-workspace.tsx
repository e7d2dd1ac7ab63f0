"use client";
import dynamic from "next/dynamic";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState, useSyncExternalStore } from "react";
import { useMutation } from "@tanstack/react-query";
import { FindingsPanel, type PanelFinding } from "@/components/findings/findings-panel";
import { findingTimeS, worstFirst } from "@/components/findings/finding-time";
import { JointPlots, type PlotMarker } from "@/components/plots/joint-plots";
import { plotRateHz } from "@/components/plots/downsample";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField } from "@/components/ui/field";
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
import { FaultApprovalDialog } from "./fault-approval-dialog";
import { moveLabel, moveNumber, type Report, sampleTimeline, timelineOf, type Timeline } from "@/kinematics";
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

const statusWords = {
  submitted: "Waiting for review",
  returned: "Returned with comments",
  approved: "Approved",
} as const;
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
              {` · submitted ${new Date(meta.submittedAt).toLocaleString("en-GB", { timeZone: "UTC" })} UTC`}
              {meta.late ? " · late" : ""}
            </p>
          </div>
          <VerdictChip
            verdict={report.verdict}
            detail={report.findings.length ? String(report.findings.length) : undefined}
          />
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
                    <span className="block text-[11px] text-ink-faint">{c.authorName}</span>
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
                  This browser offers no WebGL, so the 3D stage is off. The findings, comments and plots still work.
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
  const [body, setBody] = useState("");
  const [joint, setJoint] = useState("");
  const [pinTime, setPinTime] = useState(true);
  const [summary, setSummary] = useState("");
  const move = moveAt(timeline, timeS);
  const comment = useMutation({
    mutationFn: () =>
      api.addComment(submissionId, {
        body,
        ...(pinTime && move !== null ? { moveIndex: move, timeS: Math.round(timeS * 1000) / 1000 } : {}),
        ...(joint !== "" ? { jointIndex: Number(joint) } : {}),
      }),
    onSuccess: () => {
      setBody("");
      router.refresh();
    },
  });
  const [confirming, setConfirming] = useState(false);
  const [reason, setReason] = useState("");
  const decide = useMutation({
    mutationFn: (decision: "returned" | "approved") =>
      api.decide(
        submissionId,
        decision === "approved" && needsFaultConfirmation
          ? { decision, summary, confirmFaults: true, reason }
          : { decision, summary },
      ),
    onSuccess: () => {
      setConfirming(false);
      router.refresh();
    },
  });
  return (
    <div className="mt-auto border-t border-line px-3 py-3">
      <form
        onSubmit={(e) => {
          e.preventDefault();
          comment.mutate();
        }}
        className="flex flex-col gap-2"
      >
        <TextAreaField label="Comment" rows={3} value={body} onChange={(e) => setBody(e.target.value)} />
        <label className="flex items-center gap-2 text-xs text-ink-soft">
          <input type="checkbox" checked={pinTime} onChange={(e) => setPinTime(e.target.checked)} />
          Pin to {move !== null ? `move ${moveNumber(move)} at t = ${timeS.toFixed(3)} s` : "the current moment"} (move
          the playhead to choose)
        </label>
        <SelectField label="Joint" value={joint} onChange={(e) => setJoint(e.target.value)}>
          <option value="">No particular joint</option>
          {joints.map((name, j) => (
            <option key={name} value={j}>
              {name}
            </option>
          ))}
        </SelectField>
        <Button type="submit" size="sm" disabled={comment.isPending || !body.trim()}>
          Add comment
        </Button>
        {comment.error ? <ErrorNote>{comment.error.message}</ErrorNote> : null}
      </form>
      <div className="mt-4 flex flex-col gap-2 border-t border-line pt-3">
        <TextAreaField
          label="Summary for the student"
          rows={2}
          value={summary}
          onChange={(e) => setSummary(e.target.value)}
          hint="Required when returning."
        />
        <div className="flex gap-2">
          <Button
            variant="danger"
            size="sm"
            disabled={decide.isPending || !summary.trim()}
            onClick={() => decide.mutate("returned")}
          >
            Return with comments
          </Button>
          <Button
            variant="primary"
            size="sm"
            disabled={decide.isPending}
            onClick={() => (needsFaultConfirmation ? setConfirming(true) : decide.mutate("approved"))}
          >
            {needsFaultConfirmation ? "Approve despite faults…" : "Approve"}
          </Button>
        </div>
        {decide.error && !confirming ? <ErrorNote>{decide.error.message}</ErrorNote> : null}
      </div>
      <FaultApprovalDialog
        open={confirming}
        faults={faults}
        joints={joints}
        reason={reason}
        onReasonChange={setReason}
        pending={decide.isPending}
        error={decide.error?.message ?? null}
        onCancel={() => setConfirming(false)}
        onApprove={() => decide.mutate("approved")}
      />
    </div>
  );
}
