"use client";
import { useEffect, useRef, useState } from "react";
import { check, type Report } from "@/kinematics";
import { effortAlongPlot, type EffortSeries } from "@/components/plots/effort";
import type { BenchPlan } from "./plan-state";
import { quickFixes, type QuickFixes } from "./quick-fixes";

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
  elapsedMs: number | null;
  error: string | null;
}

interface Result extends Omit<FullCheck, "lastEffort"> {
  plan: BenchPlan | null;
}

const empty: Result = { report: null, fixes: null, elapsedMs: null, error: null, plan: null };

/**
 * Runs the engine's full check in a web worker (a newer edit supersedes the pending one) and its
 * quick fixes in a second worker, so that a report never waits behind the fixes of an earlier edit.
 * The fixes worker first sends the effort plot's series, so that it is drawn while the check runs.
 * Without workers (old browsers) both run on the main thread after the frame.
 */
export function useFullCheck(plan: BenchPlan): FullCheck {
  const worker = useRef<Worker | null>(null);
  const fixesWorker = useRef<Worker | null>(null);
  const latest = useRef(0);
  const early = useRef<{ id: number; fixes: QuickFixes } | null>(null);
  const [result, setResult] = useState<Result>(empty);
  const [lastEffort, setLastEffort] = useState<FullCheck["lastEffort"]>(null);

  useEffect(() => {
    if (typeof Worker === "undefined") return;
    const w = new Worker(new URL("./check.worker.ts", import.meta.url), { type: "module" });
    const f = new Worker(new URL("./fixes.worker.ts", import.meta.url), { type: "module" });
    worker.current = w;
    fixesWorker.current = f;
    return () => {
      w.terminate();
      f.terminate();
      worker.current = null;
      fixesWorker.current = null;
    };
  }, []);

  useEffect(() => {
    const id = ++latest.current;
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
    w.postMessage({ id, plan });
    f.postMessage({ id, plan });
    return () => {
      w.removeEventListener("message", onMessage);
      f.removeEventListener("message", onMessage);
    };
  }, [plan]);

  const current = result.plan === plan;
  return current
    ? { report: result.report, fixes: result.fixes, lastEffort, elapsedMs: result.elapsedMs, error: result.error }
    : { report: null, fixes: null, lastEffort, elapsedMs: null, error: null };
}
