"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ExportDialogShell } from "@/components/recordings/export-repaired";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { VerdictChip, type VerdictName } from "@/components/ui/verdict-chip";
import { check, describeRecordingProblem, type Arm, planFromPoses, shortestSafeDurations, repairStream, scanRecording, streamCheck, type Recording, type StreamReport } from "@/kinematics";
import { api, uploadRecording, type RecordingDto } from "@/lib/client/api-client";
import { queryKeys } from "@/lib/client/query-keys";
import { formatJointValue, type AngleUnit } from "@/lib/shared/units";
import { readWithProgress, waypointIndices } from "./read-file";
import { RecordingPlot } from "./recording-plot";

export interface RecordingArm {
  id: string;
  name: string;
  revision: number;
  arm: Arm;
}

interface Loaded {
  fileName: string;
  sizeBytes: number;
  recording: Recording;
  report: StreamReport;
  checkMs: number;
}

interface Repaired {
  recording: Recording;
  report: StreamReport;
  maxDeviation: number[];
}

const kindWords: Record<string, string> = { range: "Outside travel", jump: "Jump too far", "speed-over": "Speed over limit" };

/**
 * A plan from a (repaired) recording: waypoints every `spacingS`, each move lasting as long as the
 * recording took, lengthened to its shortest safe duration where rest-to-rest needs more time.
 */
function planFromRecording(arm: Arm, rec: Recording, spacingS: number) {
  const n = rec.jointCount;
  const idx = waypointIndices(rec.timeS, spacingS);
  const poseAt = (k: number) => Array.from(rec.position.subarray(k * n, k * n + n));
  const goals = idx.slice(1).map(poseAt);
  const durations = idx.slice(1).map((k, i) => rec.timeS[k] - rec.timeS[idx[i]]);
  const draft = planFromPoses(arm, poseAt(idx[0]), goals, durations, "quintic");
  // null: no duration fixes the move; it keeps its duration and the plan's check shows the fault
  const safe = shortestSafeDurations(draft);
  const longer = (i: number, duration: number): number | null => {
    const d = safe[i];
    return d !== null && d > duration ? Math.ceil(d * 1000) / 1000 : null;
  };
  const lengthened = draft.moves.filter((m, i) => longer(i, m.duration) !== null).length;
  const plan = { ...draft, moves: draft.moves.map((m, i) => { const d = longer(i, m.duration); return d === null ? m : { ...m, duration: d }; }) };
  return { plan, lengthened, report: check(plan) };
}

/** The engine's recording scan, timed for the page. */
function analyseRecording(arm: Arm, bytes: Uint8Array): { problems: string[] } | { recording: Recording; report: StreamReport; checkMs: number } {
  const t0 = performance.now();
  const scanned = scanRecording(arm, bytes);
  if ("problems" in scanned) return { problems: scanned.problems.map(describeRecordingProblem) };
  return { ...scanned, checkMs: performance.now() - t0 };
}

/**
 * A recording on the bench's terms: read a CSV log (with a progress bar), stream-check it against the
 * chosen arm in the browser, repair it by rate-limiting, compare both traces, and keep the result as a
 * plan (waypoints with durations lengthened where needed) or as a CSV file.
 */
export function RecordingsWorkbench({ projectId, projectName, arms, canEdit, stored }: {
  projectId: string;
  projectName: string;
  arms: RecordingArm[];
  canEdit: boolean;
  /** The project's stored recordings, loaded on the server for the first render. */
  stored: RecordingDto[];
}) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const storedList = useQuery({ queryKey: queryKeys.recordings(projectId), queryFn: () => api.listRecordings(projectId), initialData: stored });
  const [file, setFile] = useState<File | null>(null);
  const [uploadProgress, setUploadProgress] = useState<number | null>(null);
  const upload = useMutation({
    mutationFn: () => {
      if (!file || !chosen) throw new Error("choose a file first");
      setUploadProgress(0);
      return uploadRecording(projectId, file, { name: file.name.slice(0, 120), armId: chosen.id }, setUploadProgress);
    },
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: queryKeys.recordings(projectId) }),
  });

  const [armId, setArmId] = useState(arms[0]?.id ?? "");
  const chosen = arms.find((a) => a.id === armId);
  const [progress, setProgress] = useState<number | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [loaded, setLoaded] = useState<Loaded | null>(null);
  const [repaired, setRepaired] = useState<Repaired | null>(null);
  const [joint, setJoint] = useState(0);
  const [unit] = useState<AngleUnit>("deg");
  const [planName, setPlanName] = useState("");
  const [spacingS, setSpacingS] = useState(0.5);
  const [exporting, setExporting] = useState(false);

  const read = async (file: File) => {
    if (!chosen) return;
    setProblems([]);
    setLoaded(null);
    setRepaired(null);
    setPlanPreview(null);
    setProgress(0);
    setFile(file);
    upload.reset();
    setUploadProgress(null);
    const bytes = await readWithProgress(file, setProgress);
    const result = analyseRecording(chosen.arm, bytes);
    if ("problems" in result) {
      setProblems(result.problems);
      return;
    }
    const { report } = result;
    setLoaded({ fileName: file.name, sizeBytes: file.size, recording: result.recording, report, checkMs: result.checkMs });
    const worst = report.findings.find((f) => f.severity === "fault") ?? report.findings[0];
    setJoint(worst?.joint ?? 0);
    setPlanName(file.name.replace(/\.csv$/i, "").slice(0, 100) + " (repaired)");
  };

  const openStored = async (r: RecordingDto) => {
    const res = await fetch(api.recordingFileUrl(r.id));
    if (!res.ok) {
      setProblems([`The stored file could not be fetched (HTTP ${res.status}).`]);
      return;
    }
    const blob = await res.blob();
    await read(new File([blob], r.name.endsWith(".csv") ? r.name : `${r.name}.csv`, { type: "text/csv" }));
  };
  const repair = () => {
    if (!loaded || !chosen) return;
    const r = repairStream(chosen.arm, loaded.recording);
    setRepaired({ recording: r.recording, report: streamCheck(chosen.arm, r.recording), maxDeviation: r.maxDeviation });
    setPlanPreview(planFromRecording(chosen.arm, r.recording, spacingS));
  };

  const [planPreview, setPlanPreview] = useState<ReturnType<typeof planFromRecording> | null>(null);

  const save = useMutation({
    mutationFn: async () => {
      if (!planPreview || !chosen) throw new Error("repair the recording first");
      const created = await api.createPlan(projectId, { name: planName.trim(), armId: chosen.id });
      await api.saveVersion(created.id, {
        baseVersion: 0,
        armRevision: chosen.revision,
        document: planPreview.plan,
        note: `From recording ${loaded?.fileName ?? ""}, repaired (rate-limited), waypoints every ${spacingS} s`,
      });
      return created.id;
    },
    onSuccess: (planId) => router.push(`/projects/${projectId}/plans/${planId}`),
  });

  const joints = chosen?.arm.joints ?? [];

  return (
    <div className="mx-auto max-w-7xl px-6 py-6">
      <h1 className="text-2xl font-semibold tracking-tight">Recordings</h1>
      <p className="text-sm text-ink-soft">{projectName}: check a recorded joint log as if streamed to the controller sample by sample, repair it, and keep it as a plan.</p>

      <div className="mt-5 grid gap-5 lg:grid-cols-[360px_1fr]">
        <Panel className="flex flex-col gap-4 p-4">
          <SelectField label="Arm the recording is for" value={armId} onChange={(e) => { setArmId(e.target.value); setLoaded(null); setRepaired(null); setPlanPreview(null); }}>
            {arms.map((a) => <option key={a.id} value={a.id}>{a.name} (revision {a.revision})</option>)}
          </SelectField>
          <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
            Recording CSV: header <code className="font-mono">t,{joints.map((j) => j.name).join(",")}</code>, t in seconds
            <input type="file" accept=".csv,text/csv" disabled={!chosen} className="text-sm text-ink" aria-label="Recording CSV file"
              onChange={(e) => { const f = e.target.files?.[0]; if (f) void read(f); }} />
          </label>
          {storedList.data.length > 0 ? (
            <section aria-label="Stored recordings" className="flex flex-col gap-1">
              <h2 className="text-xs font-medium text-ink-soft">Stored in this project</h2>
              <ul className="flex max-h-40 flex-col gap-1 overflow-auto">
                {storedList.data.map((r) => (
                  <li key={r.id} className="flex items-center gap-2 text-xs">
                    <span className="min-w-0 flex-1 truncate" title={r.name}>{r.name}</span>
                    <span className="tabular text-ink-faint">{r.sampleCount.toLocaleString("en")} samples</span>
                    <Button size="sm" variant="ghost" onClick={() => void openStored(r)} disabled={!chosen}>Open</Button>
                  </li>
                ))}
              </ul>
            </section>
          ) : null}
          {progress !== null ? (
            <div>
              <div role="progressbar" aria-label="Reading the file" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(progress * 100)}
                className="h-2 overflow-hidden rounded-full bg-line/60">
                <div className="h-full bg-brand-500 transition-[width]" style={{ width: `${Math.round(progress * 100)}%` }} />
              </div>
              <p className="tabular mt-1 text-[11px] text-ink-faint">{progress < 1 ? `Reading… ${Math.round(progress * 100)}%` : "Read"}</p>
            </div>
          ) : null}
          {problems.length > 0 ? (
            <ErrorNote title="The recording was refused">
              <ul className="mt-1 space-y-0.5 text-xs" data-testid="recording-problems">{problems.map((p, i) => <li key={i}>{p}</li>)}</ul>
            </ErrorNote>
          ) : null}
          {loaded ? (
            <section aria-label="Stream check" className="flex flex-col gap-2">
              <div className="flex items-center gap-2">
                <h2 className="text-sm font-semibold">Stream check</h2>
                <VerdictChip verdict={loaded.report.verdict as VerdictName} />
              </div>
              <p className="tabular text-xs text-ink-soft">
                {loaded.fileName}: {loaded.recording.count.toLocaleString("en")} samples over {(loaded.recording.timeS[loaded.recording.count - 1] - loaded.recording.timeS[0]).toFixed(3)} s at {loaded.report.rateHz.toFixed(0)} Hz; checked in {loaded.checkMs.toFixed(0)} ms.
              </p>
              <ol className="flex max-h-64 flex-col gap-1.5 overflow-auto" data-testid="stream-findings">
                {loaded.report.findings.map((f, i) => (
                  <li key={i}>
                    <button type="button" onClick={() => setJoint(f.joint)} className="w-full rounded-md border border-line bg-panel px-2 py-1.5 text-left hover:bg-paper">
                      <span className="flex items-center gap-1.5">
                        <VerdictChip verdict={f.severity} size="sm" />
                        <span className="text-xs font-semibold">{kindWords[f.kind] ?? f.kind}</span>
                        <span className="tabular ml-auto font-mono text-[11px] text-ink-soft">{joints[f.joint]?.name} · t = {f.time.toFixed(3)} s</span>
                      </span>
                      <span className="mt-0.5 block text-xs leading-snug">{f.message}</span>
                    </button>
                  </li>
                ))}
              </ol>
              {canEdit ? (
                <div className="flex flex-col gap-1 rounded-md border border-line p-2">
                  <Button size="sm" onClick={() => upload.mutate()} disabled={upload.isPending || upload.isSuccess}>
                    {upload.isSuccess ? "Kept in the project" : upload.isPending ? "Uploading…" : "Keep the original in the project"}
                  </Button>
                  {uploadProgress !== null ? (
                    <div role="progressbar" aria-label="Uploading the recording" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(uploadProgress * 100)}
                      className="h-1.5 overflow-hidden rounded-full bg-line/60">
                      <div className="h-full bg-copper-500 transition-[width]" style={{ width: `${Math.round(uploadProgress * 100)}%` }} />
                    </div>
                  ) : null}
                  {upload.error ? <ErrorNote title="The recording was not stored">{upload.error.message}</ErrorNote> : null}
                </div>
              ) : null}
              {loaded.report.findings.length === 0 ? <p className="text-xs text-pass">No step is a jump or over a speed limit: the log can be streamed as it is.</p> : null}
              <Button variant="primary" onClick={repair} disabled={loaded.report.verdict === "pass" && repaired !== null}>Repair (rate-limit to the arm&apos;s limits)</Button>
            </section>
          ) : null}
          {repaired ? (
            <section aria-label="Repaired recording" className="flex flex-col gap-2 border-t border-line pt-3">
              <div className="flex items-center gap-2">
                <h2 className="text-sm font-semibold">Repaired</h2>
                <VerdictChip verdict={repaired.report.verdict as VerdictName} />
              </div>
              <Table aria-label="Largest departure from the original, per joint">
                <thead><tr><Th>Joint</Th><Th numeric>Largest departure</Th></tr></thead>
                <tbody>
                  {joints.map((j, i) => (
                    <tr key={j.name}><Td className="text-xs">{j.name}</Td><Td numeric>{formatJointValue(repaired.maxDeviation[i], j.type, unit)}</Td></tr>
                  ))}
                </tbody>
              </Table>
              <p className="text-[11px] text-ink-soft">The repaired path lags the original where the hand moved faster than the joint may; the table says by how much.</p>
              {canEdit && planPreview ? (
                <div className="flex flex-col gap-2 rounded-md border border-line p-2">
                  <TextField label="Plan name" value={planName} onChange={(e) => setPlanName(e.target.value)} maxLength={120} />
                  <SelectField label="Waypoint spacing" value={spacingS} onChange={(e) => {
                    const next = Number(e.target.value);
                    setSpacingS(next);
                    if (chosen) setPlanPreview(planFromRecording(chosen.arm, repaired.recording, next));
                  }}>
                    {[0.25, 0.5, 1, 2].map((s) => <option key={s} value={s}>every {s} s</option>)}
                  </SelectField>
                  <p className="flex flex-wrap items-center gap-1 text-[11px] text-ink-soft">
                    {planPreview.plan.moves.length} moves; {planPreview.lengthened} lengthened to their shortest safe duration. Plan verdict:
                    <VerdictChip verdict={planPreview.report.verdict} size="sm" />
                  </p>
                  <Button variant="primary" disabled={!planName.trim() || save.isPending} onClick={() => save.mutate()}>
                    {save.isPending ? "Saving…" : "Save as plan"}
                  </Button>
                  {save.error ? <ErrorNote title="The plan was not saved">{save.error.message}</ErrorNote> : null}
                </div>
              ) : null}
              <Button onClick={() => setExporting(true)}>Export repaired CSV</Button>
            </section>
          ) : null}
        </Panel>

        <Panel className="min-w-0 p-4">
          {!loaded ? (
            <EmptyState title="No recording loaded">Choose the arm and a CSV log; the traces and the stream check appear here.</EmptyState>
          ) : (
            <>
              <div role="group" aria-label="Joint to plot" className="mb-3 flex flex-wrap gap-1">
                {joints.map((j, i) => {
                  const count = loaded.report.findings.filter((f) => f.joint === i).length;
                  return (
                    <button key={j.name} type="button" aria-pressed={joint === i} onClick={() => setJoint(i)}
                      className={joint === i ? "rounded-full bg-brand-600 px-2 py-0.5 text-xs text-white" : "rounded-full border border-line px-2 py-0.5 text-xs text-ink-soft hover:text-ink"}>
                      {j.name}{count ? ` · ${count}` : ""}
                    </button>
                  );
                })}
              </div>
              <div data-testid="recording-plot">
                <RecordingPlot original={loaded.recording} repaired={repaired?.recording ?? null} joint={joint} jointInfo={joints[joint]} findings={loaded.report.findings} unit={unit} />
              </div>
            </>
          )}
        </Panel>
      </div>
      {exporting && repaired ? (
        <ExportDialogShell recording={repaired.recording} fileName={(loaded?.fileName ?? "recording.csv").replace(/\.csv$/i, "") + "-repaired.csv"} onClose={() => setExporting(false)} />
      ) : null}
    </div>
  );
}
