"use client";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { NumberInput } from "@/components/editor/number-input";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { ErrorNote, Panel } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { armFromDescription, armDocumentSchema, describeIssues, formatPath, type Arm, parseUrdf } from "@/kinematics";
import { api } from "@/lib/client/api-client";
import { displayDigits, fromDisplay, toDisplay, unitLabel } from "@/lib/shared/units";
import { ArmStage } from "./arm-stage";

export interface ArmEntry {
  id: string;
  name: string;
  builtIn: boolean;
  revision: number;
  arm: Arm;
}

type LimitField = "min" | "max" | "maxVelocity" | "maxAcceleration";
const quantityOf = { min: "position", max: "position", maxVelocity: "velocity", maxAcceleration: "acceleration" } as const;

/**
 * Arms: pick one to see it on the stage and edit its limits. The form checks with the engine's arm
 * schema (the one the API uses), showing each problem beside its field; a custom arm's edit is a new
 * revision, a demo arm's edit becomes a custom arm of this project. A URDF file becomes a custom arm.
 */
export function ArmsWorkbench({ projectId, projectName, arms, canEdit }: { projectId: string; projectName: string; arms: ArmEntry[]; canEdit: boolean }) {
  const router = useRouter();
  const [selectedId, setSelectedId] = useState(arms[0]?.id ?? "");
  const selected = arms.find((a) => a.id === selectedId);
  const [draft, setDraft] = useState<Arm | null>(selected?.arm ?? null);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [note, setNote] = useState("");
  const [urdfProblems, setUrdfProblems] = useState<string[]>([]);
  const [urdfArm, setUrdfArm] = useState<Arm | null>(null);
  const [urdfName, setUrdfName] = useState("");

  const pick = (id: string) => {
    setSelectedId(id);
    setDraft(arms.find((a) => a.id === id)?.arm ?? null);
    setErrors({});
  };

  const validate = (): Arm | null => {
    if (!draft) return null;
    const r = armDocumentSchema.safeParse(draft);
    if (r.success) {
      setErrors({});
      return r.data;
    }
    setErrors(Object.fromEntries(describeIssues(r.error.issues).map((p) => [formatPath(p.path), p.message])));
    return null;
  };

  const save = useMutation({
    mutationFn: async (arm: Arm) => {
      if (!selected) throw new Error("no arm chosen");
      if (selected.builtIn) return api.createArm(projectId, { name: `${selected.name} (custom)`.slice(0, 120), description: arm, note: note || undefined });
      return api.createArmRevision(selected.id, { description: arm, note: note || undefined });
    },
    onSuccess: () => router.refresh(),
  });

  const importUrdf = useMutation({
    mutationFn: (arm: Arm) => api.createArm(projectId, { name: urdfName.trim(), description: arm, note: "Imported from URDF" }),
    onSuccess: () => {
      setUrdfArm(null);
      router.refresh();
    },
  });

  const setField = (j: number, field: LimitField, value: number | undefined) => {
    if (!draft) return;
    const joints = draft.joints.map((joint, i) => (i === j ? { ...joint, [field]: value } : joint));
    setDraft({ ...draft, joints });
  };

  return (
    <div className="mx-auto max-w-7xl px-6 py-6">
      <h1 className="text-2xl font-semibold tracking-tight">Arms</h1>
      <p className="text-sm text-ink-soft">{projectName}: the built-in demo arms and this project&apos;s custom arms. Plans are checked against an arm&apos;s latest revision when saved.</p>
      <div className="mt-5 grid gap-5 lg:grid-cols-[280px_1fr]">
        <div className="flex flex-col gap-4">
          <Panel>
            <ul aria-label="Arms" className="divide-y divide-line">
              {arms.map((a) => (
                <li key={a.id}>
                  <button type="button" aria-current={a.id === selectedId} onClick={() => pick(a.id)}
                    className={a.id === selectedId ? "w-full bg-brand-50 px-3 py-2 text-left" : "w-full px-3 py-2 text-left hover:bg-paper"}>
                    <span className="block text-sm font-medium">{a.name}</span>
                    <span className="text-[11px] text-ink-faint">{a.builtIn ? "demo arm" : "custom"} · revision {a.revision} · {a.arm.joints.length} joints{a.arm.chain ? "" : " · no geometry"}</span>
                  </button>
                </li>
              ))}
            </ul>
          </Panel>
          {canEdit ? (
            <Panel className="flex flex-col gap-2 p-3">
              <h2 className="text-sm font-semibold">Import a URDF file</h2>
              <input type="file" accept=".urdf,.xml" aria-label="URDF file" className="text-sm"
                onChange={async (e) => {
                  const f = e.target.files?.[0];
                  if (!f) return;
                  const r = parseUrdf(await f.text());
                  if (!r.ok) {
                    setUrdfProblems(r.problems.map((p) => `${p.element}: ${p.message}`));
                    setUrdfArm(null);
                    return;
                  }
                  setUrdfProblems([]);
                  const arm = armDocumentSchema.parse(armFromDescription(r.value));
                  setUrdfArm(arm);
                  setUrdfName(r.value.name);
                }} />
              {urdfProblems.length > 0 ? (
                <ErrorNote title="The URDF file was refused"><ul className="text-xs">{urdfProblems.map((p, i) => <li key={i}>{p}</li>)}</ul></ErrorNote>
              ) : null}
              {urdfArm ? (
                <>
                  <p className="text-xs text-ink-soft">{urdfArm.joints.length} moving joints read. Set each joint&apos;s acceleration limit after import if the file has none.</p>
                  <TextField label="Name for the new arm" value={urdfName} onChange={(e) => setUrdfName(e.target.value)} maxLength={120} />
                  <Button variant="primary" disabled={!urdfName.trim() || importUrdf.isPending} onClick={() => importUrdf.mutate(urdfArm)}>Create custom arm</Button>
                  {importUrdf.error ? <ErrorNote title="The arm was not created">{importUrdf.error.message}</ErrorNote> : null}
                </>
              ) : null}
            </Panel>
          ) : null}
        </div>

        {selected && draft ? (
          <Panel className="flex min-w-0 flex-col gap-4 p-4">
            <ArmStage arm={urdfArm ?? selected.arm} />
            <form aria-label={`Limits of ${selected.name}`} onSubmit={(e) => { e.preventDefault(); const a = validate(); if (a) save.mutate(a); }}>
              <div className="flex flex-wrap items-end gap-3">
                <h2 className="mr-auto text-sm font-semibold">Limits · revision {selected.revision}</h2>
                <label className="flex flex-col text-xs text-ink-soft">Control rate (Hz)
                  <NumberInput value={draft.controlRateHz} digits={0} onValue={(v) => setDraft({ ...draft, controlRateHz: v })} aria-label="Control rate (Hz)" className="w-24" aria-invalid={Boolean(errors.controlRateHz)} />
                </label>
                <label className="flex flex-col text-xs text-ink-soft">Caution ratio
                  <NumberInput value={draft.cautionRatio} digits={2} onValue={(v) => setDraft({ ...draft, cautionRatio: v })} aria-label="Caution ratio" className="w-20" aria-invalid={Boolean(errors.cautionRatio)} />
                </label>
              </div>
              {errors.controlRateHz || errors.cautionRatio ? <p className="mt-1 text-xs text-fault">{errors.controlRateHz ? `Control rate ${errors.controlRateHz}. ` : ""}{errors.cautionRatio ? `Caution ratio ${errors.cautionRatio}.` : ""}</p> : null}
              <Table aria-label="Joint limits" className="mt-3">
                <thead><tr><Th>Joint</Th><Th numeric>Min (° · mm)</Th><Th numeric>Max (° · mm)</Th><Th numeric>Max speed (/s)</Th><Th numeric>Max accel. (/s²)</Th></tr></thead>
                <tbody>
                  {draft.joints.map((joint, j) => (
                    <tr key={joint.name}>
                      <Td className="text-xs font-medium">{joint.name}<span className="block text-[10px] text-ink-faint">{joint.type}</span></Td>
                      {(["min", "max", "maxVelocity", "maxAcceleration"] as const).map((field) => {
                        const path = `joints[${j}].${field}`;
                        const v = joint[field];
                        const label = unitLabel(joint.type, "deg", quantityOf[field]);
                        return (
                          <Td key={field} numeric>
                            <NumberInput value={v === undefined ? NaN : toDisplay(v, joint.type, "deg")} digits={displayDigits(joint.type, "deg")}
                              aria-label={`${joint.name} ${field} (${label})`} aria-invalid={Boolean(errors[path])}
                              onValue={(x) => setField(j, field, fromDisplay(x, joint.type, "deg"))} className="w-24" />
                            {errors[path] ? <span className="block text-left text-[11px] text-fault">{errors[path]}</span> : null}
                          </Td>
                        );
                      })}
                    </tr>
                  ))}
                </tbody>
              </Table>
              <p className="mt-1 text-[11px] text-ink-faint">Revolute joints in degrees (°, °/s, °/s²), prismatic in millimetres; stored in radians and metres.</p>
              {canEdit ? (
                <div className="mt-3 flex flex-wrap items-end gap-2">
                  <TextField label="Note for this revision" value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} fieldClassName="flex-1" />
                  <Button type="submit" variant="primary" disabled={save.isPending}>
                    {selected.builtIn ? "Save as a custom arm" : `Save as revision ${selected.revision + 1}`}
                  </Button>
                </div>
              ) : null}
              {Object.keys(errors).length > 0 ? <p role="alert" className="mt-2 text-xs text-fault">Fix the marked fields; nothing was saved.</p> : null}
              {save.error ? <div className="mt-2"><ErrorNote title="Not saved">{save.error.message}</ErrorNote></div> : null}
              {save.isSuccess ? <p role="status" className="mt-2 text-xs text-pass">Saved.</p> : null}
            </form>
          </Panel>
        ) : null}
      </div>
    </div>
  );
}
