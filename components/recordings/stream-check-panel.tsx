"use client";
/** The stream check of the loaded recording: verdict, findings, keeping the original, and Repair. */
import { ProgressBar } from "@/components/ui/progress-bar";
import { kindWords } from "@/components/findings/finding-time";
import { Button } from "@/components/ui/button";
import { ErrorNote } from "@/components/ui/panel";
import { VerdictChip, type VerdictName } from "@/components/ui/verdict-chip";
import type { LoadedRecording } from "./recording-session";
import type { RecordingSessionApi } from "./use-recording-session";

export function StreamCheckPanel({
  session,
  loaded,
  canEdit,
}: {
  session: RecordingSessionApi;
  loaded: LoadedRecording;
  canEdit: boolean;
}) {
  const { state, dispatch, chosen, upload, repair } = session;
  const joints = chosen?.arm.joints ?? [];
  const { recording, report } = loaded;
  return (
    <section aria-label="Stream check" className="flex flex-col gap-2">
      <div className="flex items-center gap-2">
        <h2 className="text-sm font-semibold">Stream check</h2>
        <VerdictChip verdict={report.verdict as VerdictName} />
      </div>
      <p className="tabular text-xs text-ink-soft">
        {loaded.fileName}: {recording.count.toLocaleString("en")} samples over{" "}
        {(recording.timeS[recording.count - 1] - recording.timeS[0]).toFixed(3)} s at {report.rateHz.toFixed(0)} Hz;
        checked in {loaded.checkMs.toFixed(0)} ms.
      </p>
      <ol className="relative flex max-h-64 flex-col gap-1.5 overflow-auto" data-testid="stream-findings">
        {report.findings.map((f, i) => (
          <li key={i}>
            <button
              type="button"
              onClick={() => dispatch({ type: "show-joint", joint: f.joint })}
              className="w-full rounded-md border border-line bg-panel px-2 py-1.5 text-left hover:bg-paper"
            >
              <span className="flex items-center gap-1.5">
                <VerdictChip verdict={f.severity} size="sm" />
                <span className="text-xs font-semibold">{kindWords[f.kind] ?? f.kind}</span>
                <span className="tabular ml-auto font-mono text-[11px] text-ink-soft">
                  {joints[f.joint]?.name} · line {f.line} · t = {f.time.toFixed(3)} s
                </span>
              </span>
              <span className="mt-0.5 block text-xs leading-snug">{f.message}</span>
            </button>
          </li>
        ))}
      </ol>
      {canEdit ? (
        <div className="flex flex-col gap-1 rounded-md border border-line p-2">
          <Button size="sm" onClick={() => upload.mutate()} disabled={upload.isPending || upload.isSuccess}>
            {upload.isSuccess
              ? "Kept in the project"
              : upload.isPending
                ? "Uploading…"
                : "Keep the original in the project"}
          </Button>
          {state.uploadProgress !== null ? (
            <ProgressBar label="Uploading the recording" value={state.uploadProgress} tone="copper" thin />
          ) : null}
          {upload.error ? <ErrorNote title="The recording was not stored">{upload.error.message}</ErrorNote> : null}
        </div>
      ) : null}
      {report.findings.length === 0 ? (
        <p className="text-xs text-pass">No step is a jump or over a speed limit: the log can be streamed as it is.</p>
      ) : null}
      <Button variant="primary" onClick={repair} disabled={report.verdict === "pass" && state.repaired !== null}>
        Repair (rate-limit to the arm&apos;s limits)
      </Button>
    </section>
  );
}
