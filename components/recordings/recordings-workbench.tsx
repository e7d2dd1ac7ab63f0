"use client";
/**
 * A recording on the bench's terms: read a recording CSV (with a progress bar), scan it against the chosen
 * arm in the browser (the engine's recording scan, as the API and the command line run it), repair it
 * by rate-limiting, compare both traces, and keep the result as a plan (waypoints with durations
 * lengthened where needed) or as a CSV file. State lives in one reducer (use-recording-session.ts).
 */
import { ExportDialogShell } from "@/components/recordings/export-repaired";
import { Panel } from "@/components/ui/panel";
import type { RecordingDto } from "@/lib/client/api-client";
import type { AngleUnit } from "@/lib/shared/units";
import type { RecordingArm } from "./recording-session";
import { RepairedPanel } from "./repaired-panel";
import { SourcePanel } from "./source-panel";
import { StreamCheckPanel } from "./stream-check-panel";
import { TracePanel } from "./trace-panel";
import { useRecordingSession } from "./use-recording-session";
import { TimedReplayPanel } from "@/components/datasets/timed-replay-panel";

export type { RecordingArm } from "./recording-session";

/** Revolute joints are shown in degrees on this page. */
const unit: AngleUnit = "deg";

export function RecordingsWorkbench({
  projectId,
  projectName,
  arms,
  canEdit,
  stored,
}: {
  projectId: string;
  projectName: string;
  arms: RecordingArm[];
  canEdit: boolean;
  /** The project's stored recordings, loaded on the server for the first render. */
  stored: RecordingDto[];
}) {
  const session = useRecordingSession({ projectId, arms, stored });
  const { state, dispatch } = session;
  const { loaded, repaired } = state;
  return (
    <div className="mx-auto max-w-7xl px-6 py-6">
      <h1 className="text-2xl font-semibold tracking-tight">Recordings</h1>
      <p className="text-sm text-ink-soft">
        {projectName}: check a recording as if streamed to the controller frame by frame, repair it, and keep it as a
        plan.
      </p>

      <div className="mt-5 grid gap-5 lg:grid-cols-[360px_1fr]">
        <Panel className="flex flex-col gap-4 p-4">
          <SourcePanel session={session} arms={arms} />
          {loaded ? <StreamCheckPanel session={session} loaded={loaded} canEdit={canEdit} /> : null}
          {loaded && session.chosen ? (
            <TimedReplayPanel arm={session.chosen.arm} recording={loaded.recording} name={loaded.fileName} />
          ) : null}
          {repaired ? <RepairedPanel session={session} repaired={repaired} canEdit={canEdit} unit={unit} /> : null}
        </Panel>
        <Panel className="min-w-0 p-4">
          <TracePanel session={session} unit={unit} />
        </Panel>
      </div>
      {state.exporting && repaired ? (
        <ExportDialogShell
          recording={repaired.recording}
          fileName={(loaded?.fileName ?? "recording.csv").replace(/\.csv$/i, "") + "-repaired.csv"}
          onClose={() => dispatch({ type: "exporting", open: false })}
        />
      ) : null}
    </div>
  );
}
