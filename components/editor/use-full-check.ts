"use client";
import { useEffect, useRef, useState } from "react";
import { check, type Report } from "@/kinematics";
import { effortAlongPlot, type EffortSeries } from "@/components/plots/effort";
import type { BenchPlan } from "./plan-state";
import { quickFixes, type QuickFixes } from "./quick-fixes";
import { sweepOfMove, type MoveSweep } from "@/components/plots/duration-sweep";
import type { CheckRequest, SweepReply } from "./check.worker";

type WorkerReply =
  | { id: number; report: Report; elapsedMs: number }
  | { id: number; effort: EffortSeries }
  | { id: number; fixes: QuickFixes }
  | { id: number; error: string };

export interface FullCheck {
  /** The full report (joint and arm-model checks) of exactly this plan, or null while it runs. */
  report: Report | null;
  /** The verified quick fixes of that report, or null until they are checked. */
  fixes: QuickFixes | null;
  /**
   * The latest effort plot series (arms with a chain) and the plan it belongs to, which may be an
   * earlier plan than this one: the plots, which trail the edits, pick it when it is theirs.
   */
  lastEffort: { plan: BenchPlan; series: EffortSeries } | null;
  /**
   * The latest duration sweep of the selected move (null before the first), which may be of an
   * earlier plan or move: the chart compares its inputs with its own (duration-sweep.ts).
   */
  lastSweep: LastSweep | null;
  elapsedMs: number | null;
  error: string | null;
}

/** A sweep as the check worker answered it: of move `index` of `plan` (null: none selected), or its error. */
export interface LastSweep {
  plan: BenchPlan;
  index: number | null;
  sweep: MoveSweep | null;
  error: string | null;
}

interface Result extends Omit<FullCheck, "lastEffort" | "lastSweep"> {
  plan: BenchPlan | null;
}

const empty: Result = { report: null, fixes: null, elapsedMs: null, error: null, plan: null };

/**
 * Runs the engine's full check in a web worker (a newer edit supersedes the pending one) and its
 * quick fixes in a second worker, so that a report never waits behind the fixes of an earlier edit.
 * The fixes worker first sends the effort plot's series, so that it is drawn while the check runs.
 * The check worker then sweeps the durations of move `sweepIndex` (null: none); a change of the
 * selection alone asks it for that sweep only. Without workers (old browsers) all of it runs on the
 * main thread after the frame.
 */
export function useFullCheck(plan: BenchPlan, sweepIndex: number | null): FullCheck {
  const worker = useRef<Worker | null>(null);
  const fixesWorker = useRef<Worker | null>(null);
  const latest = useRef(0);
  const early = useRef<{ id: number; fixes: QuickFixes } | null>(null);
  const [result, setResult] = useState<Result>(empty);
  const [lastEffort, setLastEffort] = useState<FullCheck["lastEffort"]>(null);
  const [lastSweep, setLastSweep] = useState<LastSweep | null>(null);
  // the sweep's own request numbers, the move the latest request sweeps, and the plan it was sent with
  const sweepLatest = useRef(0);
  const sweepWanted = useRef(sweepIndex);
  const sweepSent = useRef<{ index: number | null; plan: BenchPlan } | null>(null);

  useEffect(() => {
    if (typeof Worker === "undefined") return;
    const w = new Worker(new URL("./check.worker.ts", import.meta.url), { type: "module" });
    const f = new Worker(new URL("./fixes.worker.ts", import.meta.url), { type: "module" });
    const onSweep = (event: MessageEvent<SweepReply | object>) => {
      const reply = event.data;
      if (!("sweepId" in reply) || reply.sweepId !== sweepLatest.current) return;
      const sent = sweepSent.current;
      if (!sent) return;
      setLastSweep((last) => {
        if ("sweepError" in reply) return { plan: sent.plan, index: sent.index, sweep: null, error: reply.sweepError };
        // the same sweep as before (an edit of another move): kept by identity, so the chart is not drawn again
        const same = last?.sweep && reply.sweep && last.sweep.inputs === reply.sweep.inputs;
        return { plan: sent.plan, index: sent.index, sweep: same ? last.sweep : reply.sweep, error: null };
      });
    };
    w.addEventListener("message", onSweep);
    worker.current = w;
    fixesWorker.current = f;
    return () => {
      w.removeEventListener("message", onSweep);
      w.terminate();
      f.terminate();
      worker.current = null;
      fixesWorker.current = null;
    };
  }, []);

  // the plan's request below reads the selection from here (this effect runs first)
  useEffect(() => {
    sweepWanted.current = sweepIndex;
  }, [sweepIndex]);

  useEffect(() => {
    const id = ++latest.current;
    const sweep = { index: sweepWanted.current, id: ++sweepLatest.current };
    sweepSent.current = { index: sweep.index, plan };
    const w = worker.current;
    const f = fixesWorker.current;
    if (!w || !f) {
      const timer = setTimeout(() => {
        const t0 = performance.now();
        const report = check(plan);
        const elapsedMs = performance.now() - t0;
        if (id === latest.current) {
          setResult({ report, fixes: quickFixes(plan, report), elapsedMs, error: null, plan });
          const series = effortAlongPlot(plan);
          setLastEffort(series ? { plan, series } : null);
        }
        if (sweep.id === sweepLatest.current) setLastSweep(sweepOnMainThread(plan, report, sweep.index));
      }, 0);
      return () => clearTimeout(timer);
    }
    const onMessage = (event: MessageEvent<WorkerReply>) => {
      const reply = event.data;
      if (reply.id !== id || id !== latest.current) return;
      if ("error" in reply) setResult({ ...empty, error: reply.error, plan });
      else if ("report" in reply) {
        // the fixes worker may have answered first: its fixes are kept for this report
        const fixes = early.current?.id === id ? early.current.fixes : null;
        setResult({ report: reply.report, fixes, elapsedMs: reply.elapsedMs, error: null, plan });
      } else if ("effort" in reply) {
        setLastEffort({ plan, series: reply.effort });
      } else {
        early.current = { id, fixes: reply.fixes };
        setResult((r) => (r.plan === plan && r.report ? { ...r, fixes: reply.fixes } : r));
      }
    };
    w.addEventListener("message", onMessage);
    f.addEventListener("message", onMessage);
    w.postMessage({ id, plan, sweep } satisfies CheckRequest);
    f.postMessage({ id, plan } satisfies CheckRequest);
    return () => {
      w.removeEventListener("message", onMessage);
      f.removeEventListener("message", onMessage);
    };
  }, [plan]);

  // a change of the selection alone: the sweep of the newly selected move, on the plan last sent
  useEffect(() => {
    const sent = sweepSent.current;
    if (!sent || sent.index === sweepIndex) return;
    const sweep = { index: sweepIndex, id: ++sweepLatest.current };
    sweepSent.current = { index: sweepIndex, plan: sent.plan };
    const w = worker.current;
    if (w) {
      w.postMessage({ id: 0, plan: sent.plan, sweep, reportWanted: false } satisfies CheckRequest);
      return;
    }
    const timer = setTimeout(() => {
      if (sweep.id === sweepLatest.current) setLastSweep(sweepOnMainThread(sent.plan, check(sent.plan), sweep.index));
    }, 0);
    return () => clearTimeout(timer);
  }, [sweepIndex]);

  const current = result.plan === plan;
  return current
    ? {
        report: result.report,
        fixes: result.fixes,
        lastEffort,
        lastSweep,
        elapsedMs: result.elapsedMs,
        error: result.error,
      }
    : { report: null, fixes: null, lastEffort, lastSweep, elapsedMs: null, error: null };
}

/** The sweep where the browser has no workers. */
function sweepOnMainThread(plan: BenchPlan, report: Report, index: number | null): LastSweep {
  try {
    return { plan, index, sweep: index === null ? null : sweepOfMove(plan, report, index), error: null };
  } catch (err) {
    return { plan, index, sweep: null, error: err instanceof Error ? err.message : String(err) };
  }
}
