"use client";
/** Choosing the arm and the file (or a stored recording), the reading progress and why a file was refused. */
import { Button } from "@/components/ui/button";
import { SelectField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import type { RecordingSessionApi } from "./use-recording-session";
import type { RecordingArm } from "./recording-session";

export function SourcePanel({ session, arms }: { session: RecordingSessionApi; arms: RecordingArm[] }) {
  const { state, dispatch, chosen, storedList, read, openStored } = session;
  const joints = chosen?.arm.joints ?? [];
  const { progress, problems } = state;
  return (
    <>
      <SelectField
        label="Arm the recording is for"
        value={state.armId}
        onChange={(e) => dispatch({ type: "choose-arm", armId: e.target.value })}
      >
        {arms.map((a) => (
          <option key={a.id} value={a.id}>
            {a.name} (revision {a.revision})
          </option>
        ))}
      </SelectField>
      <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
        Recording CSV: header <code className="font-mono">t,{joints.map((j) => j.name).join(",")}</code>, t in seconds
        <input
          type="file"
          accept=".csv,text/csv"
          disabled={!chosen}
          className="text-sm text-ink"
          aria-label="Recording CSV file"
          onChange={(e) => {
            const f = e.target.files?.[0];
            if (f) void read(f);
          }}
        />
      </label>
      {storedList.length > 0 ? (
        <section aria-label="Stored recordings" className="flex flex-col gap-1">
          <h2 className="text-xs font-medium text-ink-soft">Stored in this project</h2>
          <ul className="flex max-h-40 flex-col gap-1 overflow-auto">
            {storedList.map((r) => (
              <li key={r.id} className="flex items-center gap-2 text-xs">
                <span className="min-w-0 flex-1 truncate" title={r.name}>
                  {r.name}
                </span>
                <span className="tabular text-ink-faint">{r.sampleCount.toLocaleString("en")} samples</span>
                <Button size="sm" variant="ghost" onClick={() => void openStored(r)} disabled={!chosen}>
                  Open
                </Button>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {progress !== null ? (
        <div>
          <div
            role="progressbar"
            aria-label="Reading the file"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={Math.round(progress * 100)}
            className="h-2 overflow-hidden rounded-full bg-line/60"
          >
            <div
              className="h-full bg-brand-500 transition-[width]"
              style={{ width: `${Math.round(progress * 100)}%` }}
            />
          </div>
          <p className="tabular mt-1 text-[11px] text-ink-faint">
            {progress < 1 ? `Reading… ${Math.round(progress * 100)}%` : "Read"}
          </p>
        </div>
      ) : null}
      {problems.length > 0 ? (
        <ErrorNote title="The recording was refused">
          <ul className="mt-1 space-y-0.5 text-xs" data-testid="recording-problems">
            {problems.map((p, i) => (
              <li key={i}>{p}</li>
            ))}
          </ul>
        </ErrorNote>
      ) : null}
    </>
  );
}
