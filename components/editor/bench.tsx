"use client";
import dynamic from "next/dynamic";
import { useCallback, type ReactNode } from "react";
import { FindingsPanel, verdictCount } from "@/components/findings/findings-panel";
import { JointPlots } from "@/components/plots/joint-plots";
import { SweepChart } from "@/components/plots/sweep-chart";
import { PlanReviewComments } from "@/components/review/plan-review-comments";
import { Button } from "@/components/ui/button";
import { RailHeading } from "@/components/ui/panel";
import { Skeleton } from "@/components/ui/skeleton";
import { PendingChip, VerdictChip } from "@/components/ui/verdict-chip";
import { ghostColors } from "@/components/viewer/colors";
import { StageErrorBoundary } from "@/components/viewer/error-boundary";
import { moveLabel, type Arm, type Report } from "@/kinematics";
import type { AngleUnit } from "@/lib/shared/units";
import { CartesianGoal } from "./cartesian-goal";
import { MoveList } from "./move-list";
import { homePose, poseOf, type BenchPlan } from "./plan-state";
import { PlayheadContext, usePlayhead } from "./playhead";
import { PoseEditor } from "./pose-editor";
import { ReconnectingNotice } from "./reconnecting-notice";
import { Transport } from "./transport";
import { useBenchState, type BenchStatus } from "./use-bench-state";

const Stage = dynamic(() => import("@/components/viewer/stage"), {
  ssr: false,
  loading: () => <Skeleton className="h-full w-full rounded-none" />,
});

/** What the header shows about the plan and what the page can plug into it (save, export, …). */
export interface BenchMeta {
  planName: string;
  armName: string;
  /** Arm revision number, when the plan is tied to a saved arm. */
  armRevision?: number;
  /** Saved version number the editor started from (0 or undefined: never saved). */
  version?: number;
}

/** What the page's header actions and banners get: the plan being edited, its report, and a way to replace it. */
export interface BenchActionState {
  plan: BenchPlan;
  report: Report;
  replace: (plan: BenchPlan) => void;
  /** The display unit the bench shows revolute joints in. */
  unit: AngleUnit;
}

export interface BenchProps {
  initialPlan: BenchPlan;
  meta: BenchMeta;
  /** Header actions (save, versions, export). */
  actions?: (state: BenchActionState) => ReactNode;
  /** A strip under the header (e.g. a kept draft offered back). */
  banner?: (state: BenchActionState) => ReactNode;
  /** A section at the top of the outline rail (e.g. an assignment's limits and required poses). */
  aside?: (state: BenchActionState) => ReactNode;
  /** The saved plan's id: shows the instructor's comments when its latest submission was returned. */
  planId?: string;
  /** Called on every edit (for "unsaved changes" state kept by the page). */
  onPlanChange?: (plan: BenchPlan) => void;
  /** The arm the plan is checked against, from its own (an assignment's tightened limits); a stable function. */
  checkArm?: (arm: Arm) => Arm;
}

/**
 * The bench: the plan outline and pose editor on the left, the 3D view with the timeline strip of
 * plots in the centre, the findings on the right. Every edit re-runs the engine's check in the browser
 * (use-bench-state.ts); which fix each finding offers is decided in quick-fixes.ts.
 */
export function Bench({ initialPlan, meta, actions, banner, planId, onPlanChange, checkArm, aside }: BenchProps) {
  const state = useBenchState(initialPlan, { onPlanChange, checkArm });
  const {
    plan,
    checked,
    dispatch,
    selected,
    selectTarget,
    unit,
    setUnit,
    playhead,
    live,
    full,
    report,
    fixes,
    status,
    deferred,
    effort,
  } = state;
  const replace = useCallback((p: BenchPlan) => dispatch({ type: "replace", plan: p }), [dispatch]);

  const selectedMove = selected === "start" ? null : plan.moves[selected];
  const selectedReport = selected === "start" ? null : report.moves[selected];
  const selectedSafe = selectedReport?.minSafeDuration ?? null;
  const poseTitle = selected === "start" ? "Start pose" : `${moveLabel(selected)} goal`;
  const planFix = fixes?.plan ?? null;
  const actionState: BenchActionState = { plan, report, replace, unit };

  const headerChip = statusChip(status, report.findings);
  const summary = findingsSummary(status, state.schematic);

  return (
    <PlayheadContext.Provider value={playhead}>
      <div className="flex flex-col xl:h-[calc(100vh-3.5rem)] xl:min-h-[640px]">
        <header className="flex flex-wrap items-center gap-x-4 gap-y-1 border-b border-line bg-panel px-4 py-2">
          <div className="min-w-0">
            <h1 className="truncate text-base font-semibold" data-testid="plan-name">
              {meta.planName}
            </h1>
            <p className="tabular truncate text-xs text-ink-soft">
              {meta.armName}
              {meta.armRevision ? ` · arm revision ${meta.armRevision}` : ""}
              {` · ${meta.version ? `version ${meta.version}` : "not saved yet"}`}
              {` · ${plan.arm.controlRateHz} Hz control rate`}
            </p>
          </div>
          <span data-testid="plan-verdict">{headerChip}</span>
          <div className="ml-auto flex flex-wrap items-center gap-2">{actions?.(actionState)}</div>
        </header>
        <ReconnectingNotice />
        {banner ? banner(actionState) : null}

        {/* 1280 px and up: three rails side by side; a tablet (1024 px): a 400 px outline left, stage, plots and findings stacked right */}
        <div className="grid min-h-0 flex-1 grid-cols-1 md:grid-cols-[minmax(340px,40%)_1fr] lg:grid-cols-[400px_1fr] xl:grid-cols-[minmax(330px,370px)_1fr_minmax(260px,310px)]">
          {/* left rail: plan outline and the selected pose */}
          <aside
            aria-label="Plan outline"
            className="flex min-h-0 flex-col overflow-y-auto border-r border-line bg-panel md:row-span-2 xl:row-span-1"
          >
            {planId ? (
              <PlanReviewComments planId={planId} joints={state.jointNames} onJump={state.jumpToComment} />
            ) : null}
            {aside ? aside(actionState) : null}
            <RailHeading
              action={
                planFix ? (
                  <Button
                    size="sm"
                    variant="secondary"
                    title="Every move's duration times one factor; the checked copy of the plan has no fault"
                    onClick={() => state.applyFix(planFix)}
                  >
                    Scale to pass <span className="tabular font-mono">×{(planFix.factor ?? 1).toFixed(3)}</span>
                  </Button>
                ) : null
              }
            >
              Moves
            </RailHeading>
            <div className="px-2">
              <MoveList
                joints={plan.arm.joints}
                startPose={plan.start}
                moves={plan.moves}
                reports={report.moves}
                unit={unit}
                selected={selected}
                onSelect={selectTarget}
                dispatch={dispatch}
                startVerdict={plan.moves.length === 0 && state.startVerdict === "pass" ? null : state.startVerdict}
                fixes={fixes?.moves ?? null}
              />
              {fixes && !fixes.plan && report.verdict === "fault" ? (
                <p className="mt-1 px-1 text-[11px] text-fault" data-testid="no-scale">
                  {fixes.untimed > 0
                    ? `${fixes.untimed} fault${fixes.untimed === 1 ? "" : "s"} no duration fixes (travel, clearance, or effort held against gravity): they need a different pose or path, a lighter payload or the other tool. The findings say which.`
                    : plan.moves.every(
                          (m, k) =>
                            m.duration > 0 || !report.findings.some((f) => f.move === k && f.severity === "fault"),
                        )
                      ? "No single timing factor makes the whole plan pass; use the fixes of each move in the findings."
                      : "An instant move has no duration to scale, so one factor cannot fix it: give it a duration (its fix in the findings) or take a smaller step."}
                </p>
              ) : null}
            </div>
            <div className="mt-3 border-t border-line px-3 py-3">
              <PoseEditor
                title={poseTitle}
                joints={plan.arm.joints}
                pose={poseOf(plan, selected)}
                unit={unit}
                onUnitChange={setUnit}
                onJointChange={(joint, value) => dispatch({ type: "set-joint", target: selected, joint, value })}
                onCopyCurrent={state.copyCurrent}
                onHome={() => dispatch({ type: "set-pose", target: selected, pose: homePose(plan) })}
                currentLabel={<CurrentTime />}
              >
                {plan.arm.chain ? (
                  <CartesianGoal
                    chain={plan.arm.chain}
                    joints={plan.arm.joints}
                    seed={poseOf(plan, selected)}
                    onSolved={(pose) => dispatch({ type: "set-pose", target: selected, pose })}
                  />
                ) : null}
              </PoseEditor>
              {selectedMove && selectedReport && selectedMove.duration > 0 ? (
                <div className="mt-3">
                  <SweepChart
                    plan={checked}
                    index={selected as number}
                    cautionRatio={plan.arm.cautionRatio}
                    minSafeS={selectedSafe}
                    currentS={selectedMove.duration}
                    ready={full.report !== null}
                    sweep={full.lastSweep}
                  />
                </div>
              ) : null}
            </div>
          </aside>

          {/* centre: the stage and the timeline strip */}
          <section aria-label="Stage and timeline" className="flex min-h-0 min-w-0 flex-col overflow-y-auto">
            <div
              className="relative h-[min(380px,48vh)] shrink-0 bg-[#f3f1ea] xl:h-auto xl:min-h-[260px] xl:flex-1 xl:shrink"
              data-testid="stage"
            >
              {state.canRender3d === false ? (
                <div
                  role="alert"
                  className="flex h-full items-center justify-center p-6 text-center text-sm text-ink-soft"
                >
                  This browser offers no WebGL, so the 3D view is off. The moves, findings and plots still work.
                </div>
              ) : state.canRender3d ? (
                <StageErrorBoundary>
                  <Stage
                    chain={state.stage.chain}
                    joints={state.stage.joints}
                    timeline={state.stage.timeline}
                    ghosts={state.stage.ghosts}
                    linkSeverity={state.stage.linkSeverity}
                    keepOut={state.stage.keepOut}
                    findings={state.stage.clearanceFindings}
                    hold={state.stageHold}
                  />
                </StageErrorBoundary>
              ) : (
                <Skeleton className="h-full w-full rounded-none" />
              )}
              <div className="pointer-events-none absolute top-2 left-2 flex flex-col gap-1 text-[11px] text-ink-soft">
                <span className="rounded bg-panel/85 px-1.5 py-0.5">
                  <span
                    className="mr-1 inline-block h-2 w-2 rounded-full align-middle"
                    style={{ background: ghostColors.start }}
                  />
                  start ghost
                  {selected !== "start" ? (
                    <>
                      <span
                        className="mr-1 ml-2 inline-block h-2 w-2 rounded-full align-middle"
                        style={{ background: ghostColors.goal }}
                      />
                      goal ghost
                    </>
                  ) : null}
                  <span className="mr-1 ml-2 inline-block h-0.5 w-3 bg-copper-500 align-middle" />
                  tool path
                </span>
                {state.schematic ? (
                  <span className="rounded bg-caution-tint px-1.5 py-0.5 text-caution">
                    Schematic arm: this arm has no geometry, so clearance is not checked.
                  </span>
                ) : null}
              </div>
            </div>
            <Transport />
            <div className="shrink-0 border-t border-line bg-panel px-2 py-1.5" data-testid="plots">
              <JointPlots
                samples={deferred.samples}
                joints={checked.arm.joints}
                cautionRatio={plan.arm.cautionRatio}
                unit={unit}
                selectedJoints={state.selectedJoints}
                onSelectedJointsChange={state.setSelectedJoints}
                markers={state.markers}
                effort={effort}
                moveCount={plan.moves.length}
              />
            </div>
          </section>

          {/* right rail: findings */}
          <aside
            aria-label="Findings"
            className="flex min-h-0 flex-col border-t border-line bg-paper md:col-start-2 xl:col-start-3 xl:border-t-0 xl:border-l"
          >
            <FindingsPanel
              verdict={
                status.kind === "checked"
                  ? status.verdict
                  : status.kind !== "empty" && status.faultSoFar
                    ? "fault"
                    : null
              }
              summary={summary}
              items={state.items}
              joints={checked.arm.joints}
              onJump={state.jump}
              className="min-h-0 flex-1"
            />
            <p
              suppressHydrationWarning
              data-testid="check-status"
              className="tabular border-t border-line px-3 py-1.5 text-[10px] text-ink-faint"
            >
              {full.error
                ? `Effort, clearance and tool speed were not checked (${full.error}); reload the page to check them again.`
                : full.report
                  ? `Full check in a worker: ${full.elapsedMs?.toFixed(0)} ms${fixes ? "" : "; checking the fixes…"}`
                  : "Joint checks done; effort, clearance and tool speed are being checked…"}
              {` · joint checks and sampling ${live.elapsedMs.toFixed(1)} ms · ${live.samples.count.toLocaleString("en")} samples at ${Math.round(live.samples.rateHz)} Hz`}
            </p>
          </aside>
        </div>
      </div>
    </PlayheadContext.Provider>
  );
}

/** The header's verdict: none without moves, no Pass before the arm-model checks have answered. */
function statusChip(status: BenchStatus, findings: Report["findings"]): ReactNode {
  switch (status.kind) {
    case "empty":
      return <span className="text-xs text-ink-soft">No moves yet</span>;
    case "checking":
      return status.faultSoFar ? <VerdictChip verdict="fault" /> : <PendingChip>Checking…</PendingChip>;
    case "unchecked":
      return status.faultSoFar ? <VerdictChip verdict="fault" /> : <PendingChip>Not fully checked</PendingChip>;
    case "checked":
      return <VerdictChip verdict={status.verdict} detail={verdictCount(findings, status.verdict)} />;
  }
}

/** The findings rail's line under its heading, when the count of findings would not be the whole truth. */
function findingsSummary(status: BenchStatus, schematic: boolean): string | undefined {
  if (status.kind === "empty") return "No moves yet: the arm holds its start pose. Add a move to check a motion.";
  if (status.kind === "checking" && !status.faultSoFar)
    return "Joint checks found no fault; effort, clearance and tool speed are still being checked.";
  if (status.kind === "unchecked")
    return `Effort, clearance and tool speed were not checked (${status.error}), so this plan is not fully checked and shows no Pass. Reload the page to check them again.`;
  if (status.kind === "checked" && status.verdict === "pass" && schematic) {
    return "No findings in the joint checks. This arm has no geometry, so effort, clearance and tool speed are not checked.";
  }
  return undefined;
}

function CurrentTime() {
  const { timeS } = usePlayhead();
  return <>t = {timeS.toFixed(3)} s</>;
}
