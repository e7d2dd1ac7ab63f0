"use client";
import { useCallback, useDeferredValue, useEffect, useMemo, useReducer, useState, useSyncExternalStore } from "react";
import { findingTimeS, worstFirst } from "@/components/findings/finding-time";
import type { PanelFinding } from "@/components/findings/findings-panel";
import type { PlotMarker } from "@/components/plots/joint-plots";
import type { EffortPending, EffortSeries } from "@/components/plots/effort";
import { pinTarget, type CommentPin } from "@/components/review/plan-review-comments";
import { webglAvailable } from "@/components/viewer/error-boundary";
import { createPoseScratch, poseAt } from "@/components/viewer/pose-at";
import { linkSeverityOf } from "@/components/viewer/link-severity";
import { schematicChain } from "@/components/viewer/schematic-chain";
import { verdictOf, type Arm, type Report, type Verdict } from "@/kinematics";
import type { AngleUnit } from "@/lib/shared/units";
import { useSameWhileEqual } from "@/lib/client/use-same-while-equal";
import { runLiveCheck } from "./live-check";
import { planReducer, type BenchPlan, type PoseTarget } from "./plan-state";
import { Playhead, useSyncTotal } from "./playhead";
import { fixLabel, type QuickFix, type QuickFixes } from "./quick-fixes";
import { useFullCheck } from "./use-full-check";

/**
 * What the bench may say about the plan as a whole. `empty`: no moves, so no verdict at all;
 * `checking`: the arm-model checks are still running, so no Pass yet (a joint fault is already certain);
 * `unchecked`: the arm-model checks failed, so no Pass; `checked`: the full report's verdict.
 */
export type BenchStatus =
  | { kind: "empty" }
  | { kind: "checking"; faultSoFar: boolean }
  | { kind: "unchecked"; error: string; faultSoFar: boolean }
  | { kind: "checked"; verdict: Verdict };

export interface BenchStateOptions {
  /** Called on every edit (for "unsaved changes" state kept by the page). */
  onPlanChange?: (plan: BenchPlan) => void;
  /**
   * The arm the plan is checked against, from the plan's own arm: an assignment's tightened limits.
   * Must be a stable function (it is a memo dependency).
   */
  checkArm?: (arm: Arm) => Arm;
}

/** The status of a plan from its live (joint checks) and full (arm model too) results. */
export function benchStatus(
  moveCount: number,
  live: Report,
  full: { report: Report | null; error: string | null },
): BenchStatus {
  if (moveCount === 0) return { kind: "empty" };
  const faultSoFar = live.verdict === "fault";
  if (full.error) return { kind: "unchecked", error: full.error, faultSoFar };
  if (!full.report) return { kind: "checking", faultSoFar };
  return { kind: "checked", verdict: full.report.verdict };
}

/**
 * The bench's state: the plan being edited (one reducer), the selection, the unit, the playhead, the
 * live and full checks (against the course's limits when given), and what the rails show from them:
 * findings worst first with their verified fixes, plot markers, link tints, ghosts.
 */
export function useBenchState(initialPlan: BenchPlan, { onPlanChange, checkArm }: BenchStateOptions = {}) {
  const [plan, dispatch] = useReducer(planReducer, initialPlan);
  const [selected, setSelected] = useState<PoseTarget>(initialPlan.moves.length > 0 ? 0 : "start");
  const [unit, setUnit] = useState<AngleUnit>("deg");
  const playhead = useMemo(() => new Playhead(), []);

  useEffect(() => {
    onPlanChange?.(plan);
  }, [plan, onPlanChange]);

  // The plan as the check sees it: its own arm, or the arm tightened by the course's rules.
  const checked = useMemo(() => (checkArm ? { ...plan, arm: checkArm(plan.arm) } : plan), [plan, checkArm]);
  const live = useMemo(() => runLiveCheck(checked), [checked]);
  const full = useFullCheck(checked, selected === "start" ? null : selected);
  // the joint checks answer at once; the full report (arm model included) replaces them when it lands
  const report = full.report ?? live.report;
  const fixes: QuickFixes | null = full.report ? full.fixes : null;
  const status = benchStatus(plan.moves.length, live.report, full);
  const { timeline } = live;
  useSyncTotal(playhead, timeline.totalS);
  // Plots and the stage may trail fast slider drags by a frame; the findings never do.
  const deferred = useDeferredValue(live);
  const deferredPlan = useDeferredValue(checked);
  // the effort plot's series comes from the fixes worker; until it has the plan the plots draw, the
  // effort chart says it is being computed (never another plan's series on this plan's time axis)
  const lastEffort = full.lastEffort?.plan === deferredPlan ? full.lastEffort.series : null;
  const effort: EffortSeries | EffortPending | null = !deferredPlan.arm.chain
    ? null
    : (lastEffort ?? (full.error ? null : { values: null, stride: deferredPlan.arm.chain.joints.length }));

  const [selectedJoints, setSelectedJoints] = useState<number[]>(() => {
    const worst = worstFirst(
      runLiveCheck(checkArm ? { ...initialPlan, arm: checkArm(initialPlan.arm) } : initialPlan).report.findings,
    )[0];
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

  const selectTarget = useCallback(
    (target: PoseTarget) => {
      setSelected(target);
      if (target !== "start") {
        playhead.pause();
        // a move just added is not in this timeline yet: it starts where this one ends
        playhead.seek(timeline.startS[target] ?? timeline.totalS);
      }
    },
    [playhead, timeline],
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

  const applyFix = useCallback((fix: QuickFix) => dispatch(fix.action), []);

  const items: PanelFinding[] = useMemo(
    () =>
      worstFirst(report.findings).map((finding) => {
        const index = report.findings.indexOf(finding);
        const offered = fixes?.findings[index];
        return {
          finding,
          timeS: findingTimeS(finding, timeline),
          fixes: (offered?.fixes ?? []).map((fix) => ({
            label: fixLabel(fix, plan, unit),
            scope: fix.scope,
            apply: () => applyFix(fix),
          })),
          remedy: offered?.remedy ?? null,
        };
      }),
    [report, fixes, timeline, plan, unit, applyFix],
  );

  // Kept by identity while their content is the same (the full report often marks what the live one
  // did, and a change of duration seldom changes which links are tinted), so that the plots and the
  // 3D view are not drawn again for nothing: without a GPU each frame of the 3D view costs the page
  // tens of milliseconds.
  const markers: PlotMarker[] = useSameWhileEqual(
    useMemo(
      () => items.map((i) => ({ timeS: i.timeS, joint: i.finding.joint, severity: i.finding.severity })),
      [items],
    ),
  );
  const linkSeverity = useSameWhileEqual(useMemo(() => linkSeverityOf(report.moves, chain), [report, chain]));
  // the 3D view marks the keep-out boxes that clearance findings name; the other findings do not change it
  const clearanceFindings = useSameWhileEqual(
    useMemo(() => report.findings.filter((f) => f.kind === "clearance"), [report]),
  );

  const goal = selected === "start" ? undefined : plan.moves[selected]?.goal;
  const ghosts = useMemo(() => {
    const g: { pose: readonly number[]; label: "start" | "goal" }[] = [{ pose: plan.start, label: "start" }];
    if (goal) g.push({ pose: goal, label: "goal" });
    return g;
  }, [plan.start, goal]);

  // The 3D view is drawn for a plan once its full check (and the selected move's sweep) has answered,
  // or failed: without a GPU one frame of it costs the page's thread 30–60 ms, and the findings, plots
  // and sweep come first. Until then it keeps the plan it shows (the first plan: at once).
  const sweepIndex = selected === "start" ? null : selected;
  const figuresIn =
    full.error !== null ||
    (full.report !== null &&
      (sweepIndex === null || (full.lastSweep?.plan === checked && full.lastSweep.index === sweepIndex)));
  const stageNow = {
    chain,
    joints: plan.arm.joints,
    timeline,
    ghosts,
    linkSeverity,
    clearanceFindings,
    keepOut: plan.keepOut,
  };
  const [stage, setStage] = useState(stageNow);
  const stageBehind =
    stage.chain !== chain ||
    stage.joints !== plan.arm.joints ||
    stage.timeline !== timeline ||
    stage.ghosts !== ghosts ||
    stage.linkSeverity !== linkSeverity ||
    stage.clearanceFindings !== clearanceFindings ||
    stage.keepOut !== plan.keepOut;
  // set while rendering (React's pattern for state that follows props): no extra commit
  if (figuresIn && stageBehind) setStage(stageNow);
  const stageHold = stageBehind && !figuresIn;

  const copyCurrent = useCallback(() => {
    const out = new Float64Array(plan.arm.joints.length);
    poseAt(timeline, playhead.get().timeS, out, createPoseScratch(out.length));
    dispatch({ type: "set-pose", target: selected, pose: Array.from(out) });
  }, [plan.arm.joints.length, timeline, playhead, selected]);

  const startVerdict = verdictOf(report.findings.filter((f) => f.move === null));

  return {
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
    applyFix,
    timeline,
    deferred,
    effort,
    selectedJoints,
    setSelectedJoints,
    jointNames,
    chain,
    schematic,
    canRender3d,
    jump,
    jumpToComment,
    items,
    markers,
    linkSeverity,
    clearanceFindings,
    ghosts,
    stage,
    stageHold,
    copyCurrent,
    startVerdict,
  };
}

export type BenchState = ReturnType<typeof useBenchState>;

const noSubscribe = () => () => {};
