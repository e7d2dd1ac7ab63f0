"use client";
/** Choosing the arm and the file (or a stored recording), the reading progress and why a file was refused. */
import { ProgressBar } from "@/components/ui/progress-bar";
import { useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { FileDrop } from "@/components/ui/file-drop";
import { SelectField, TextField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import type { RecordingDto } from "@/lib/client/api-client";
import type { RecordingSessionApi } from "./use-recording-session";
import type { RecordingArm } from "./recording-session";

const col = columnsFor<RecordingDto>();

export function SourcePanel({ session, arms }: { session: RecordingSessionApi; arms: RecordingArm[] }) {
  const { state, dispatch, chosen, storedList, read, openStored } = session;
  const joints = chosen?.arm.joints ?? [];
  const { progress, problems } = state;
  const [filter, setFilter] = useState("");
  const columns = useMemo(
    () =>
      col.columns([
        col.accessor("name", {
          header: "Recording",
          sortFn: "text",
          meta: { cellClassName: "max-w-36 truncate text-xs" },
          cell: (c) => <span title={c.getValue()}>{c.getValue()}</span>,
        }),
        col.accessor("sampleCount", {
          header: "Frames",
          sortFn: "basic",
          enableGlobalFilter: false,
          meta: { numeric: true, cellClassName: "text-xs" },
          cell: (c) => c.getValue().toLocaleString("en"),
        }),
        col.accessor("createdAt", {
          header: "Stored",
          sortFn: "basic",
          enableGlobalFilter: false,
          meta: { cellClassName: "tabular text-[11px] text-ink-soft whitespace-nowrap" },
          cell: (c) => <DateTime value={c.getValue()} day />,
        }),
        col.display({
          id: "open",
          header: () => <span className="sr-only">Open</span>,
          cell: (c) => (
            <Button size="sm" variant="ghost" onClick={() => void openStored(c.row.original)} disabled={!chosen}>
              Open
            </Button>
          ),
        }),
      ]),
    [openStored, chosen],
  );
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
      <div className="flex flex-col gap-1">
        <p className="text-xs font-medium text-ink-soft">Recording CSV</p>
        <FileDrop
          label="Recording CSV file"
          what="a recording CSV"
          accept=".csv,text/csv"
          disabled={!chosen}
          onFile={(f) => void read(f)}
          hint={
            <>
              Header <code className="font-mono break-all">t,{joints.map((j) => j.name).join(",")}</code>; t in seconds,
              one frame per line.
            </>
          }
        />
      </div>
      {storedList.length > 0 ? (
        <section aria-label="Stored recordings" className="flex flex-col gap-2">
          <h2 className="text-xs font-medium text-ink-soft">Stored in this project</h2>
          {storedList.length > 5 ? (
            <TextField
              label="Filter stored recordings"
              type="search"
              placeholder="File name"
              value={filter}
              onChange={(e) => setFilter(e.target.value)}
            />
          ) : null}
          <DataTable
            label="Stored recordings"
            data={storedList}
            columns={columns}
            getRowId={(r) => r.id}
            filter={filter}
            initialSorting={[{ id: "createdAt", desc: true }]}
            maxHeightPx={320}
            className="relative -mx-1 max-h-80 overflow-y-auto"
            testId="stored-recordings"
          />
        </section>
      ) : null}
      {progress !== null ? (
        <div>
          <ProgressBar label="Reading the file" value={progress} />
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
