"use client";
import dynamic from "next/dynamic";
import { useCallback, useDeferredValue, useEffect, useMemo, useReducer, useState, useSyncExternalStore, type ReactNode } from "react";
import { FindingsPanel, type PanelFinding } from "@/components/findings/findings-panel";
import { findingTimeS, worstFirst } from "@/components/findings/finding-time";
import { JointPlots, type PlotMarker } from "@/components/plots/joint-plots";
import { effortSeries } from "@/components/plots/effort";
import { SweepChart } from "@/components/plots/sweep-chart";
import { pinTarget, PlanReviewComments, type CommentPin } from "@/components/review/plan-review-comments";
import { Button } from "@/components/ui/button";
import { RailHeading } from "@/components/ui/panel";
import { Skeleton } from "@/components/ui/skeleton";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { StageErrorBoundary, webglAvailable } from "@/components/viewer/error-boundary";
import { createPoseScratch, poseAt } from "@/components/viewer/pose-at";
import { linkSeverityOf } from "@/components/viewer/link-severity";
import { schematicChain } from "@/components/viewer/schematic-chain";
import { verdictOf, type Report, scaleToPass } from "@/kinematics";
import { ceilToMs, formatJointValue, type AngleUnit } from "@/lib/shared/units";
import { CartesianGoal } from "./cartesian-goal";
import { runLiveCheck } from "./live-check";
import { useFullCheck } from "./use-full-check";
import { MoveList } from "./move-list";
import { homePose, planReducer, poseBefore, poseOf, type BenchPlan, type PoseTarget } from "./plan-state";
import { Playhead, PlayheadContext, usePlayhead, useSyncTotal } from "./playhead";
import { PoseEditor } from "./pose-editor";
import { Transport } from "./transport";

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

export interface BenchProps {
  initialPlan: BenchPlan;
  meta: BenchMeta;
  /** Header actions, given the plan being edited and its live report (save, versions, export). */
  actions?: (state: { plan: BenchPlan; report: Report; replace: (plan: BenchPlan) => void }) => ReactNode;
  /** The saved plan's id: shows the instructor's comments when its latest submission was returned. */
  planId?: string;
  /** Called on every edit (for "unsaved changes" state kept by the page). */
  onPlanChange?: (plan: BenchPlan) => void;
}

/**
 * The bench: the plan outline and pose editor on the left, the 3D stage with the timeline strip of
 * plots in the centre, the findings on the right. Every edit re-runs the engine's check in the browser.
 */
export function Bench({ initialPlan, meta, actions, planId, onPlanChange }: BenchProps) {
  const [plan, dispatch] = useReducer(planReducer, initialPlan);
  const [selected, setSelected] = useState<PoseTarget>(initialPlan.moves.length > 0 ? 0 : "start");
  const [unit, setUnit] = useState<AngleUnit>("deg");
  const playhead = useMemo(() => new Playhead(), []);

  useEffect(() => {
    onPlanChange?.(plan);
  }, [plan, onPlanChange]);

  const live = useMemo(() => runLiveCheck(plan), [plan]);
  const full = useFullCheck(plan);
  // the joint checks answer at once; the full report (arm model included) replaces them when it lands
  const report = full.report ?? live.report;
  const { timeline } = live;
  useSyncTotal(playhead, timeline.totalS);
  // Plots and the stage may trail fast slider drags by a frame; the findings never do.
  const deferred = useDeferredValue(live);
  const deferredPlan = useDeferredValue(plan);
  const effort = useMemo(() => effortSeries(deferredPlan, deferred.samples), [deferredPlan, deferred.samples]);

  const [selectedJoints, setSelectedJoints] = useState<number[]>(() => {
    const worst = worstFirst(runLiveCheck(initialPlan).report.findings)[0];
    return [worst?.joint ?? 0];
  });

  const jointNames = useMemo(() => plan.arm.joints.map((j) => j.name), [plan.arm.joints]);
  const chain = useMemo(() => plan.arm.chain ?? schematicChain(plan.arm.joints), [plan.arm.chain, plan.arm.joints]);
  const schematic = !plan.arm.chain;
  // null during the server render; the stage only mounts in the browser
  const canRender3d = useSyncExternalStore(noSubscribe, webglAvailable, () => null);

  const jump = useCallback(
    (timeS: number, move: number | null) => {
      playhead.pause();
      playhead.seek(timeS);
      setSelected(move === null ? "start" : move);
    },
    [playhead],
  );

  const jumpToComment = useCallback(
    (pin: CommentPin) => {
      const { timeS, move, joint } = pinTarget(pin, timeline.startS, timeline.moveCount, plan.arm.joints.length);
      playhead.pause();
      playhead.seek(timeS);
      if (move !== null) setSelected(move);
      if (joint !== null) setSelectedJoints((s) => (s.includes(joint) ? s : [joint, ...s]));
    },
    [playhead, timeline, plan.arm.joints.length],
  );

  const items: PanelFinding[] = useMemo(
    () =>
      worstFirst(report.findings).map((finding) => {
        const item: PanelFinding = { finding, timeS: findingTimeS(finding, timeline) };
        const m = finding.move;
        if (m !== null && finding.severity === "fault" && (finding.kind === "speed-over" || finding.kind === "accel-over" || finding.kind === "jump")) {
          const safe = ceilToMs(report.moves[m]?.minSafeDuration ?? 0);
          if (safe > 0) item.fix = { label: `Set move ${m} to ${safe.toFixed(3)} s`, apply: () => dispatch({ type: "set-duration", index: m, duration: safe }) };
        }
        if (finding.kind === "range" && finding.joint !== null) {
          const j = finding.joint;
          const joint = plan.arm.joints[j];
          item.fix = {
            label: `Move ${joint.name} to ${formatJointValue(finding.limit, joint.type, unit)}`,
            apply: () => dispatch({ type: "set-joint", target: m === null ? "start" : m, joint: j, value: finding.limit }),
          };
        }
        return item;
      }),
    [report, timeline, plan.arm.joints, unit],
  );

  const markers: PlotMarker[] = useMemo(
    () => items.map((i) => ({ timeS: i.timeS, joint: i.finding.joint, severity: i.finding.severity })),
    [items],
  );

  const linkSeverity = useMemo(() => linkSeverityOf(report.moves, chain), [report, chain]);

  const ghosts = useMemo(() => {
    const g: { pose: readonly number[]; label: "start" | "goal" }[] = [{ pose: plan.start, label: "start" }];
    if (selected !== "start" && plan.moves[selected]) g.push({ pose: plan.moves[selected].goal, label: "goal" });
    return g;
  }, [plan, selected]);

  const copyCurrent = () => {
    const out = new Float64Array(plan.arm.joints.length);
    poseAt(timeline, playhead.get().timeS, out, createPoseScratch(out.length));
    dispatch({ type: "set-pose", target: selected, pose: Array.from(out) });
  };

  const scale = useMemo(() => {
    if (report.verdict !== "fault") return null;
    const r = scaleToPass(plan);
    return r;
  }, [plan, report.verdict]);

  const startVerdict = verdictOf(report.findings.filter((f) => f.move === null));
  const selectedMove = selected === "start" ? null : plan.moves[selected];
  const selectedReport = selected === "start" ? null : report.moves[selected];
  const poseTitle = selected === "start" ? "Start pose" : `Move ${selected} goal`;

  return (
    <PlayheadContext.Provider value={playhead}>
      <div className="flex flex-col xl:h-[calc(100vh-3.5rem)] xl:min-h-[640px]">
        <header className="flex flex-wrap items-center gap-x-4 gap-y-1 border-b border-line bg-panel px-4 py-2">
          <div className="min-w-0">
            <h1 className="truncate text-base font-semibold" data-testid="plan-name">{meta.planName}</h1>
            <p className="tabular truncate text-xs text-ink-soft">
              {meta.armName}
              {meta.armRevision ? ` · arm revision ${meta.armRevision}` : ""}
              {` · ${meta.version ? `version ${meta.version}` : "not saved yet"}`}
              {` · ${plan.arm.controlRateHz} Hz control rate`}
            </p>
          </div>
          <VerdictChip verdict={report.verdict} detail={report.findings.length ? String(report.findings.length) : undefined} />
          <div className="ml-auto flex flex-wrap items-center gap-2">{actions?.({ plan, report, replace: (p) => dispatch({ type: "replace", plan: p }) })}</div>
        </header>

        {/* 1280 px and up: three rails side by side; a tablet (1024 px): a 400 px outline left, stage, plots and findings stacked right */}
        <div className="grid min-h-0 flex-1 grid-cols-1 md:grid-cols-[minmax(340px,40%)_1fr] lg:grid-cols-[400px_1fr] xl:grid-cols-[minmax(330px,370px)_1fr_minmax(260px,310px)]">
          {/* left rail: plan outline and the selected pose */}
          <aside aria-label="Plan outline" className="flex min-h-0 flex-col overflow-y-auto border-r border-line bg-panel md:row-span-2 xl:row-span-1">
            {planId ? <PlanReviewComments planId={planId} joints={jointNames} onJump={jumpToComment} /> : null}
            <RailHeading
              action={
                scale ? (
                  <Button
                    size="sm"
                    variant="secondary"
                    disabled={scale.factor <= 1 + 1e-9 && scale.unscalable.length > 0}
                    title={scale.unscalable.length > 0 ? "Instant-move jumps and travel faults cannot be fixed by timing" : undefined}
                    onClick={() => dispatch({ type: "set-durations", durations: scale.plan.moves.map((m) => m.duration) })}
                  >
                    Scale to pass <span className="tabular font-mono">×{scale.factor.toFixed(3)}</span>
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
                onSelect={(t) => {
                  setSelected(t);
                  if (t !== "start") {
                    playhead.pause();
                    playhead.seek(timeline.startS[t] ?? 0);
                  }
                }}
                dispatch={dispatch}
                startVerdict={startVerdict}
              />
              {scale && scale.unscalable.length > 0 ? (
                <p className="mt-1 px-1 text-[11px] text-fault">
                  {scale.unscalable.length} fault{scale.unscalable.length === 1 ? "" : "s"} cannot be fixed by timing (an instant move or a pose outside the travel); fix those moves first.
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
                onCopyCurrent={copyCurrent}
                onHome={() => dispatch({ type: "set-pose", target: selected, pose: homePose(plan) })}
                currentLabel={<CurrentTime />}
              >
                {plan.arm.chain ? (
                  <CartesianGoal chain={plan.arm.chain} joints={plan.arm.joints} seed={poseOf(plan, selected)} onSolved={(pose) => dispatch({ type: "set-pose", target: selected, pose })} />
                ) : null}
              </PoseEditor>
              {selectedMove && selectedReport && selectedMove.duration > 0 ? (
                <div className="mt-3">
                  <SweepChart
                    shape={selectedMove.shape}
                    delta={selectedMove.goal.map((g, j) => g - poseBefore(plan, selected as number)[j])}
                    joints={plan.arm.joints}
                    cautionRatio={plan.arm.cautionRatio}
                    minSafeS={selectedReport.minSafeDuration}
                    currentS={selectedMove.duration}
                  />
                </div>
              ) : null}
            </div>
          </aside>

          {/* centre: the stage and the timeline strip */}
          <section aria-label="Stage and timeline" className="flex min-h-0 min-w-0 flex-col overflow-y-auto">
            <div className="relative h-[min(380px,48vh)] shrink-0 bg-[#f3f1ea] xl:h-auto xl:min-h-[260px] xl:flex-1 xl:shrink" data-testid="stage">
              {canRender3d === false ? (
                <div role="alert" className="flex h-full items-center justify-center p-6 text-center text-sm text-ink-soft">
                  This browser offers no WebGL, so the 3D stage is off. The moves, findings and plots still work.
                </div>
              ) : canRender3d ? (
                <StageErrorBoundary>
                  <Stage chain={chain} joints={plan.arm.joints} timeline={deferred.timeline} ghosts={ghosts} linkSeverity={linkSeverity} keepOut={plan.keepOut} />
                </StageErrorBoundary>
              ) : (
                <Skeleton className="h-full w-full rounded-none" />
              )}
              <div className="pointer-events-none absolute top-2 left-2 flex flex-col gap-1 text-[11px] text-ink-soft">
                <span className="rounded bg-panel/85 px-1.5 py-0.5">
                  <span className="mr-1 inline-block h-2 w-2 rounded-full bg-brand-500/40 align-middle" />start ghost
                  {selected !== "start" ? <><span className="mr-1 ml-2 inline-block h-2 w-2 rounded-full bg-[#6d4bc3]/40 align-middle" />goal ghost</> : null}
                  <span className="mr-1 ml-2 inline-block h-0.5 w-3 bg-copper-500 align-middle" />tool path
                </span>
                {schematic ? <span className="rounded bg-caution-tint px-1.5 py-0.5 text-caution">Schematic arm: this arm has no geometry, so clearance is not checked.</span> : null}
              </div>
            </div>
            <Transport />
            <div className="shrink-0 border-t border-line bg-panel px-2 py-1.5" data-testid="plots">
              <JointPlots
                samples={deferred.samples}
                joints={plan.arm.joints}
                cautionRatio={plan.arm.cautionRatio}
                unit={unit}
                selectedJoints={selectedJoints}
                onSelectedJointsChange={setSelectedJoints}
                markers={markers}
                effort={effort}
              />
            </div>
          </section>

          {/* right rail: findings */}
          <aside aria-label="Findings" className="flex min-h-0 flex-col border-t border-line bg-paper md:col-start-2 xl:col-start-3 xl:border-t-0 xl:border-l">
            <FindingsPanel verdict={report.verdict} items={items} joints={plan.arm.joints} onJump={jump} className="min-h-0 flex-1" />
            <p suppressHydrationWarning data-testid="check-status" className="tabular border-t border-line px-3 py-1.5 text-[10px] text-ink-faint">
              {full.error
                ? `Arm-model checks failed: ${full.error}`
                : full.report
                  ? `Full check in a worker: ${full.elapsedMs?.toFixed(0)} ms`
                  : "Joint checks done; arm-model checks running…"}
              {` · joint checks and sampling ${live.elapsedMs.toFixed(1)} ms · ${live.samples.count.toLocaleString("en")} samples at ${Math.round(live.samples.rateHz)} Hz`}
            </p>
          </aside>
        </div>
      </div>
    </PlayheadContext.Provider>
  );
}

const noSubscribe = () => () => {};

function CurrentTime() {
  const { timeS } = usePlayhead();
  return <>t = {timeS.toFixed(3)} s</>;
}
