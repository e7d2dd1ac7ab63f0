"use client";
import { useEffect, useRef, useState } from "react";
import { check, type Report } from "@/kinematics";
import type { BenchPlan } from "./plan-state";

type WorkerReply = { id: number; report: Report; elapsedMs: number } | { id: number; error: string };

export interface FullCheck {
  /** The full report (joint and arm-model checks) of exactly this plan, or null while it runs. */
  report: Report | null;
  elapsedMs: number | null;
  error: string | null;
}

/**
 * Runs the engine's full check in a web worker, one plan at a time (a newer edit supersedes the
 * pending one). Without workers (old browsers) it runs on the main thread after the frame.
 */
export function useFullCheck(plan: BenchPlan): FullCheck {
  const worker = useRef<Worker | null>(null);
  const latest = useRef(0);
  const [result, setResult] = useState<{ id: number; report: Report | null; elapsedMs: number | null; error: string | null; plan: BenchPlan | null }>({
    id: 0, report: null, elapsedMs: null, error: null, plan: null,
  });

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
        if (id === latest.current) setResult({ id, report, elapsedMs: performance.now() - t0, error: null, plan });
      }, 0);
      return () => clearTimeout(timer);
    }
    const onMessage = (event: MessageEvent<WorkerReply>) => {
      if (event.data.id !== id || id !== latest.current) return;
      if ("error" in event.data) setResult({ id, report: null, elapsedMs: null, error: event.data.error, plan });
      else setResult({ id, report: event.data.report, elapsedMs: event.data.elapsedMs, error: null, plan });
    };
    w.addEventListener("message", onMessage);
    w.postMessage({ id, plan });
    return () => w.removeEventListener("message", onMessage);
  }, [plan]);

  const current = result.plan === plan;
  return { report: current ? result.report : null, elapsedMs: current ? result.elapsedMs : null, error: current ? result.error : null };
}
