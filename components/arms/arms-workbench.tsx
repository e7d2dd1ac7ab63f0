"use client";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { FileDrop } from "@/components/ui/file-drop";
import { ErrorNote, Panel } from "@/components/ui/panel";
import { armFromDescription, armDocumentSchema, type Arm, parseUrdf } from "@/kinematics";
import { api } from "@/lib/client/api-client";
import { customArmName } from "./arm-fields";
import { ArmForm } from "./arm-form";
import { ArmStage } from "./arm-stage";

export interface ArmEntry {
  id: string;
  name: string;
  builtIn: boolean;
  revision: number;
  arm: Arm;
}

/**
 * Arms: pick one to see it in the 3D view and edit every parameter the check uses (arm-form.tsx). A
 * custom arm's edit is a new revision; a built-in arm's edit becomes a clearly named custom copy in
 * this project, which opens, and the built-in arm stays unchanged. A URDF file becomes a custom arm.
 */
export function ArmsWorkbench({
  projectId,
  projectName,
  arms,
  canEdit,
}: {
  projectId: string;
  projectName: string;
  arms: ArmEntry[];
  canEdit: boolean;
}) {
  const router = useRouter();
  const [selectedId, setSelectedId] = useState(arms[0]?.id ?? "");
  const selected = arms.find((a) => a.id === selectedId) ?? arms[0];
  const [urdfProblems, setUrdfProblems] = useState<string[]>([]);
  const [urdfArm, setUrdfArm] = useState<Arm | null>(null);
  const [urdfName, setUrdfName] = useState("");

  const pick = (id: string) => setSelectedId(id);

  const save = useMutation({
    mutationFn: async ({ arm, note, from }: { arm: Arm; note: string; from: string }) => {
      const source = arms.find((a) => a.id === from);
      if (!source) throw new Error("Choose an arm first.");
      if (source.builtIn) {
        const created = await api.createArm(projectId, {
          name: customArmName(
            source.name,
            arms.map((a) => a.name),
          ),
          description: arm,
          note: note || undefined,
        });
        return { openId: created.arm.id };
      }
      await api.createArmRevision(source.id, { description: arm, note: note || undefined });
      return { openId: source.id };
    },
    onSuccess: ({ openId }) => {
      // a custom copy of a built-in arm opens at once; the built-in one stays as it was
      setSelectedId(openId);
      router.refresh();
    },
  });

  const importUrdf = useMutation({
    mutationFn: (arm: Arm) =>
      api.createArm(projectId, { name: urdfName.trim(), description: arm, note: "Imported from URDF" }),
    onSuccess: () => {
      setUrdfArm(null);
      router.refresh();
    },
  });

  return (
    <div className="mx-auto max-w-7xl px-6 py-6">
      <h1 className="text-2xl font-semibold tracking-tight">Arms</h1>
      <p className="text-sm text-ink-soft">
        {projectName}: the built-in demo arms and this project&apos;s custom arms. Plans are checked against an
        arm&apos;s latest revision when saved.
      </p>
      <div className="mt-5 grid gap-5 lg:grid-cols-[280px_1fr]">
        <div className="flex flex-col gap-4">
          <Panel>
            <ul aria-label="Arms" className="divide-y divide-line">
              {arms.map((a) => (
                <li key={a.id}>
                  <button
                    type="button"
                    aria-current={a.id === selectedId}
                    onClick={() => pick(a.id)}
                    className={
                      a.id === selectedId
                        ? "w-full bg-brand-50 px-3 py-2 text-left"
                        : "w-full px-3 py-2 text-left hover:bg-paper"
                    }
                  >
                    <span className="block text-sm font-medium">{a.name}</span>
                    <span className="text-[11px] text-ink-faint">
                      {a.builtIn ? "demo arm" : "custom"} · revision {a.revision} · {a.arm.joints.length} joints
                      {a.arm.chain ? "" : " · no geometry"}
                    </span>
                  </button>
                </li>
              ))}
            </ul>
          </Panel>
          {canEdit ? (
            <Panel className="flex flex-col gap-2 p-3">
              <h2 className="text-sm font-semibold">Import a URDF file</h2>
              <FileDrop
                label="URDF file"
                what="a URDF file"
                accept=".urdf,.xml"
                onFile={async (f) => {
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
                }}
              />
              {urdfProblems.length > 0 ? (
                <ErrorNote title="The URDF file was refused">
                  <ul className="text-xs">
                    {urdfProblems.map((p, i) => (
                      <li key={i}>{p}</li>
                    ))}
                  </ul>
                </ErrorNote>
              ) : null}
              {urdfArm ? (
                <>
                  <p className="text-xs text-ink-soft">
                    {urdfArm.joints.length} moving joints read. Set each joint&apos;s acceleration limit after import if
                    the file has none.
                  </p>
                  <TextField
                    label="Name for the new arm"
                    value={urdfName}
                    onChange={(e) => setUrdfName(e.target.value)}
                    maxLength={120}
                  />
                  <Button
                    variant="primary"
                    disabled={!urdfName.trim() || importUrdf.isPending}
                    onClick={() => importUrdf.mutate(urdfArm)}
                  >
                    Create custom arm
                  </Button>
                  {importUrdf.error ? (
                    <ErrorNote title="The arm was not created">{importUrdf.error.message}</ErrorNote>
                  ) : null}
                </>
              ) : null}
            </Panel>
          ) : null}
        </div>

        {selected ? (
          <Panel className="flex min-w-0 flex-col gap-4 p-4">
            <ArmStage arm={urdfArm ?? selected.arm} />
            <ArmForm
              key={`${selected.id}-${selected.revision}`}
              arm={selected.arm}
              title={`${selected.name} · revision ${selected.revision}${selected.builtIn ? " · built-in" : ""}`}
              canEdit={canEdit}
              saveLabel={selected.builtIn ? "Save as a custom arm" : `Save as revision ${selected.revision + 1}`}
              saved={save.isSuccess && save.variables?.from === selected.id}
              onSave={(arm, note) => save.mutateAsync({ arm, note, from: selected.id })}
            />
            {selected.builtIn && canEdit ? (
              <p className="text-[11px] text-ink-faint">
                Built-in arms are never changed: saving makes a custom copy in this project and opens it.
              </p>
            ) : null}
          </Panel>
        ) : null}
      </div>
    </div>
  );
}
