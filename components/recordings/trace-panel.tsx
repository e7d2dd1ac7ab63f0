"use client";
/** The traces of the loaded (and repaired) recording for one joint, with a joint picker counting its findings. */
import { EmptyState } from "@/components/ui/panel";
import type { AngleUnit } from "@/lib/shared/units";
import { RecordingPlot } from "./recording-plot";
import type { RecordingSessionApi } from "./use-recording-session";

export function TracePanel({ session, unit }: { session: RecordingSessionApi; unit: AngleUnit }) {
  const { state, dispatch, chosen } = session;
  const { loaded, repaired, joint } = state;
  const joints = chosen?.arm.joints ?? [];
  if (!loaded)
    return (
      <EmptyState title="No recording loaded">
        Choose the arm and a recording CSV; the traces and the stream check appear here.
      </EmptyState>
    );
  return (
    <>
      <div role="group" aria-label="Joint to plot" className="mb-3 flex flex-wrap gap-1">
        {joints.map((j, i) => {
          const count = loaded.report.findings.filter((f) => f.joint === i).length;
          return (
            <button
              key={j.name}
              type="button"
              aria-pressed={joint === i}
              onClick={() => dispatch({ type: "show-joint", joint: i })}
              className={
                joint === i
                  ? "rounded-full bg-brand-600 px-2 py-0.5 text-xs text-white"
                  : "rounded-full border border-line px-2 py-0.5 text-xs text-ink-soft hover:text-ink"
              }
            >
              {j.name}
              {count ? ` · ${count}` : ""}
            </button>
          );
        })}
      </div>
      <div data-testid="recording-plot">
        <RecordingPlot
          original={loaded.recording}
          repaired={repaired?.recording ?? null}
          joint={joint}
          jointInfo={joints[joint]}
          findings={loaded.report.findings}
          unit={unit}
        />
      </div>
    </>
  );
}
