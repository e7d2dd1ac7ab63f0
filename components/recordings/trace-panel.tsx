"use client";
/** The traces of the loaded (and repaired) recording for one joint, with a joint picker counting its findings. */
import { JointPicker } from "@/components/plots/joint-picker";
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
      <JointPicker
        joints={joints}
        selected={joint}
        onSelect={(i) => dispatch({ type: "show-joint", joint: i })}
        findingsOf={(i) => loaded.report.findings.filter((f) => f.joint === i).length}
        className="mb-3"
      />
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
