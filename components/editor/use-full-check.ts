"use client";
import { useEffect, useRef, useState } from "react";
import { check, type Report } from "@/kinematics";
import type { BenchPlan } from "./plan-state";
import { quickFixes, type QuickFixes } from "./quick-fixes";

type WorkerReply =
  { id: number; report: Report; elapsedMs: number } | { id: number; fixes: QuickFixes } | { id: number; error: string };

export interface FullCheck {
  /** The full report (joint and arm-model checks) of exactly this plan, or null while it runs. */
  report: Report | null;
  /** The verified quick fixes of that report, or null until they are checked. */
  fixes: QuickFixes | null;
  elapsedMs: number | null;
  error: string | null;
}

interface Result extends FullCheck {
  plan: BenchPlan | null;
}

const empty: Result = { report: null, fixes: null, elapsedMs: null, error: null, plan: null };

/**
 * Runs the engine's full check in a web worker, one plan at a time (a newer edit supersedes the
 * pending one), then its quick fixes. Without workers (old browsers) both run on the main thread after the frame.
 */
export function useFullCheck(plan: BenchPlan): FullCheck {
  const worker = useRef<Worker | null>(null);
  const latest = useRef(0);
  const [result, setResult] = useState<Result>(empty);

  useEffect(() => {
    if (typeof Worker === "undefined") return;
    const w = new Worker(new URL("./check.worker.ts", import.meta.url), { type: "module" });
    worker.current = w;
    return () => {
      w.terminate();
      worker.current = null;
    };
  }, []);

  useEffect(() => {
    const id = ++latest.current;
    const w = worker.current;
    if (!w) {
      const timer = setTimeout(() => {
        const t0 = performance.now();
        const report = check(plan);
        const elapsedMs = performance.now() - t0;
        if (id === latest.current) setResult({ report, fixes: quickFixes(plan, report), elapsedMs, error: null, plan });
      }, 0);
      return () => clearTimeout(timer);
    }
    const onMessage = (event: MessageEvent<WorkerReply>) => {
      const reply = event.data;
      if (reply.id !== id || id !== latest.current) return;
      if ("error" in reply) setResult({ ...empty, error: reply.error, plan });
      else if ("report" in reply)
        setResult({ report: reply.report, fixes: null, elapsedMs: reply.elapsedMs, error: null, plan });
      else setResult((r) => (r.plan === plan ? { ...r, fixes: reply.fixes } : r));
    };
    w.addEventListener("message", onMessage);
    w.postMessage({ id, plan });
    return () => w.removeEventListener("message", onMessage);
  }, [plan]);

  const current = result.plan === plan;
  return current
    ? { report: result.report, fixes: result.fixes, elapsedMs: result.elapsedMs, error: result.error }
    : { ...empty };
}
