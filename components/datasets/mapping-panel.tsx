"use client";
/** The arm and column mapping of a dataset, with a preview of its columns, types and first rows. */
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { ApiError } from "@/lib/client/api-client";
import type { ColumnMappingInput } from "@/lib/shared/schemas/datasets";
import { datasetApi, type PreviewDto } from "./dataset-api";
import type { DatasetArm } from "./dataset-workbench";

type TimeMode = "column" | "rate";
type JointMode = "names" | "columns" | "list";

/** The form's fields as one mapping (empty fields left to the defaults). */
function mappingOf(f: {
  episodeColumn: string;
  timeMode: TimeMode;
  timeColumn: string;
  rateHz: string;
  jointMode: JointMode;
  jointColumns: string;
  jointsColumn: string;
}): ColumnMappingInput {
  const m: ColumnMappingInput = {};
  if (f.episodeColumn.trim()) m.episodeColumn = f.episodeColumn.trim();
  if (f.timeMode === "column" && f.timeColumn.trim()) m.timeColumn = f.timeColumn.trim();
  if (f.timeMode === "rate" && f.rateHz.trim()) m.rateHz = Number(f.rateHz);
  if (f.jointMode === "columns" && f.jointColumns.trim())
    m.jointColumns = f.jointColumns
      .split(",")
      .map((s) => s.trim())
      .filter(Boolean);
  if (f.jointMode === "list" && f.jointsColumn.trim()) m.jointsColumn = f.jointsColumn.trim();
  return m;
}

export function MappingPanel({
  datasetId,
  arms,
  initialArmId,
  initialMapping,
  canEdit,
  busy,
  onAudit,
}: {
  datasetId: string;
  arms: DatasetArm[];
  initialArmId: string;
  initialMapping: ColumnMappingInput;
  canEdit: boolean;
  busy: boolean;
  onAudit: (armId: string, mapping: ColumnMappingInput) => Promise<void>;
}) {
  const [armId, setArmId] = useState(initialArmId);
  const [fields, setFields] = useState({
    episodeColumn: initialMapping.episodeColumn ?? "",
    timeMode: (initialMapping.rateHz !== undefined ? "rate" : "column") as TimeMode,
    timeColumn: initialMapping.timeColumn ?? "",
    rateHz: initialMapping.rateHz !== undefined ? String(initialMapping.rateHz) : "",
    jointMode: (initialMapping.jointsColumn ? "list" : initialMapping.jointColumns ? "columns" : "names") as JointMode,
    jointColumns: initialMapping.jointColumns?.join(", ") ?? "",
    jointsColumn: initialMapping.jointsColumn ?? "",
  });
  const [preview, setPreview] = useState<PreviewDto | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [working, setWorking] = useState(false);
  const set = (patch: Partial<typeof fields>) => setFields((f) => ({ ...f, ...patch }));
  const chosen = arms.find((a) => a.id === armId);

  const runPreview = async () => {
    setWorking(true);
    setError(null);
    try {
      setPreview(await datasetApi.preview(datasetId, { armId, mapping: mappingOf(fields) }));
    } catch (err) {
      setError(
        err instanceof ApiError
          ? [err.message, ...err.issues.map((i) => `${i.path}: ${i.message}`)].join(" ")
          : "The preview failed.",
      );
    } finally {
      setWorking(false);
    }
  };

  const audit = async () => {
    setWorking(true);
    setError(null);
    try {
      await onAudit(armId, mappingOf(fields));
    } catch (err) {
      setError(
        err instanceof ApiError
          ? err.issues.map((i) => i.message).join(" ") || err.message
          : "The audit could not start.",
      );
    } finally {
      setWorking(false);
    }
  };

  const file = preview?.files[0];
  return (
    <section aria-label="Arm and column mapping" className="flex flex-col gap-3">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <SelectField label="Arm" value={armId} onChange={(e) => setArmId(e.target.value)}>
          {arms.map((a) => (
            <option key={a.id} value={a.id}>
              {a.name} (revision {a.revision})
            </option>
          ))}
        </SelectField>
        <TextField
          label="Episode column"
          hint="Empty: column “episode”, else one episode per file"
          value={fields.episodeColumn}
          onChange={(e) => set({ episodeColumn: e.target.value })}
        />
        <SelectField
          label="Time from"
          value={fields.timeMode}
          onChange={(e) => set({ timeMode: e.target.value as TimeMode })}
        >
          <option value="column">a time column (s)</option>
          <option value="rate">frame index and a rate</option>
        </SelectField>
        {fields.timeMode === "column" ? (
          <TextField
            label="Time column"
            hint="Empty: column “t”"
            value={fields.timeColumn}
            onChange={(e) => set({ timeColumn: e.target.value })}
          />
        ) : (
          <TextField
            label="Frame rate (Hz)"
            inputMode="decimal"
            value={fields.rateHz}
            onChange={(e) => set({ rateHz: e.target.value })}
          />
        )}
        <SelectField
          label="Joints from"
          value={fields.jointMode}
          onChange={(e) => set({ jointMode: e.target.value as JointMode })}
        >
          <option value="names">columns named like the joints</option>
          <option value="columns">columns I name, in joint order</option>
          <option value="list">one list column</option>
        </SelectField>
        {fields.jointMode === "columns" ? (
          <TextField
            label="Joint columns"
            hint={chosen ? `In this order: ${chosen.arm.joints.map((j) => j.name).join(", ")}` : undefined}
            value={fields.jointColumns}
            onChange={(e) => set({ jointColumns: e.target.value })}
          />
        ) : fields.jointMode === "list" ? (
          <TextField
            label="Joints column (a list)"
            value={fields.jointsColumn}
            onChange={(e) => set({ jointsColumn: e.target.value })}
          />
        ) : null}
      </div>
      <div className="flex flex-wrap gap-2">
        <Button onClick={() => void runPreview()} disabled={working || !armId}>
          Preview
        </Button>
        {canEdit ? (
          <Button variant="primary" onClick={() => void audit()} disabled={working || busy || !armId}>
            Save mapping and audit
          </Button>
        ) : null}
      </div>
      {error ? (
        <ErrorNote title="The dataset cannot be read this way">
          <p className="text-xs" data-testid="mapping-error">
            {error}
          </p>
        </ErrorNote>
      ) : null}
      {preview ? (
        <div className="flex flex-col gap-2" data-testid="mapping-preview">
          <p className="text-xs text-ink-soft">
            {preview.fileCount} file{preview.fileCount === 1 ? "" : "s"}, {preview.episodes.toLocaleString("en")}{" "}
            episodes, {preview.frames.toLocaleString("en")} frames.
            {file ? ` Columns of ${file.name}: ${file.columns.map((c) => `${c.name} (${c.type})`).join(", ")}.` : ""}
          </p>
          {preview.problems.length > 0 ? (
            <ErrorNote title="Refused">
              <ul className="text-xs">
                {preview.problems.map((p, i) => (
                  <li key={i}>{p}</li>
                ))}
              </ul>
            </ErrorNote>
          ) : null}
          {preview.firstEpisode ? (
            <div className="overflow-x-auto">
              <Table aria-label={`First rows of episode ${preview.firstEpisode.episode}`}>
                <thead>
                  <tr>
                    {preview.firstEpisode.columns.map((c) => (
                      <Th key={c} numeric>
                        {c}
                      </Th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {preview.firstEpisode.rows.map((r, i) => (
                    <tr key={i}>
                      {r.map((v, j) => (
                        <Td key={j} numeric>
                          {Number(v.toPrecision(6))}
                        </Td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </Table>
            </div>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}
