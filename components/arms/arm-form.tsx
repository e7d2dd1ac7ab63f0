"use client";
import { useState } from "react";
import {
  get,
  set,
  useForm,
  useWatch,
  type FieldErrors,
  type FieldValues,
  type Resolver,
  type UseFormSetError,
} from "react-hook-form";
import { NumberInput } from "@/components/editor/number-input";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure, toFormPath } from "@/components/ui/form";
import { ErrorNote } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import type { Arm, Joint } from "@/kinematics";
import { hintFor } from "@/lib/shared/glossary";
import { displayDigits, fromDisplay, toDisplay, type AngleUnit } from "@/lib/shared/units";
import { armProblems, fieldUnit, jointFields, jointValue, withJointValue, type JointField } from "./arm-fields";

export interface ArmFormProps {
  /** The arm as saved (the form starts from it and never changes it). */
  arm: Arm;
  title: string;
  canEdit: boolean;
  /** The save button's words: "Save as a custom arm" or "Save as revision 3". */
  saveLabel: string;
  saved: boolean;
  /** Saves the checked arm; a rejected promise carries the API's error, whose problems land under their fields. */
  onSave: (arm: Arm, note: string) => Promise<unknown> | void;
}

export type ArmFormValues = { arm: Arm; note: string };

/**
 * The form's resolver: the engine's arm schema, the one the API validates with, with each problem
 * under the field it names (`joints[1].max` → `arm.joints.1.max`) and spoken in the form's unit.
 */
export const armResolver: Resolver<ArmFormValues, { unit: AngleUnit }> = async (values, context) => {
  const result = armProblems(values.arm, context?.unit ?? "deg");
  if (!result.problems) return { values: { ...values, arm: result.arm }, errors: {} };
  const errors: FieldErrors<ArmFormValues> = {};
  for (const [path, message] of Object.entries(result.problems))
    set(errors, `arm.${toFormPath(path)}`, { type: "schema", message });
  return { values: {}, errors };
};

/** The form paths of every field this form shows, in the API's path syntax below `arm`. */
function shownPaths(arm: Arm): string[] {
  const paths = ["controlRateHz", "cautionRatio"];
  arm.joints.forEach((_, j) => {
    for (const f of jointFields)
      paths.push(f.key === "coulomb" || f.key === "viscous" ? `joints.${j}.friction.${f.key}` : `joints.${j}.${f.key}`);
  });
  if (arm.chain) {
    paths.push("chain.base.inertial.mass", "chain.tool.xyz.0", "chain.tool.xyz.1", "chain.tool.xyz.2");
    arm.chain.joints.forEach((_, i) => paths.push(`chain.joints.${i}.link.inertial.mass`));
  }
  return paths;
}

/** Every error message under `arm`, by its form path, for the fields that show them and the foot's list. */
function flatErrors(errors: unknown, prefix = ""): Record<string, string> {
  const out: Record<string, string> = {};
  if (!errors || typeof errors !== "object") return out;
  const node = errors as { message?: unknown };
  if (typeof node.message === "string" && prefix) out[prefix] = node.message;
  for (const [key, value] of Object.entries(errors))
    if (key !== "message" && key !== "type" && key !== "ref" && value && typeof value === "object")
      Object.assign(out, flatErrors(value, prefix ? `${prefix}.${key}` : key));
  return out;
}

/** Display value of a stored joint value: angles and lengths in the form's unit, efforts and friction as stored. */
function shown(joint: Joint, field: JointField, value: number | undefined, unit: AngleUnit): number {
  if (value === undefined) return NaN;
  return field.quantity === null || field.quantity === "effort" ? value : toDisplay(value, joint.type, unit);
}

function stored(joint: Joint, field: JointField, value: number, unit: AngleUnit): number {
  return field.quantity === null || field.quantity === "effort" ? value : fromDisplay(value, joint.type, unit);
}

/**
 * Every parameter the check uses, editable: control rate, caution ratio, each joint's travel, speed,
 * acceleration and effort limits and its Coulomb and viscous friction, and (arms with geometry) the
 * link masses and the tool point. Validation is the engine's arm schema, as in the API; problems are
 * shown beside their fields in the form's unit.
 */
export function ArmForm({ arm, title, canEdit, saveLabel, saved, onSave }: ArmFormProps) {
  const [unit, setUnit] = useState<AngleUnit>("deg");
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm<ArmFormValues, { unit: AngleUnit }>({
    resolver: armResolver,
    context: { unit },
    defaultValues: { arm, note: "" },
  });
  const draft = useWatch({ control: form.control, name: "arm" });
  const { isSubmitting } = form.formState;
  const errors = flatErrors(get(form.formState.errors, "arm"));
  const noteError = fieldMessage("The note", form.formState.errors.note);
  const chain = draft.chain;
  const setDraft = (next: Arm) => form.setValue("arm", next, { shouldDirty: true });

  const setJoint = (j: number, field: JointField, value: number | undefined) =>
    setDraft({
      ...draft,
      joints: draft.joints.map((joint, i) => (i === j ? withJointValue(joint, field.key, value) : joint)),
    });

  const setMass = (link: number, mass: number) => {
    if (!chain) return;
    // link 0 is the base; link i + 1 follows chain joint i
    const withMass = <T extends { inertial?: { mass: number } }>(l: T): T => ({
      ...l,
      inertial: { ...(l.inertial ?? defaultInertial()), mass },
    });
    const next =
      link === 0
        ? { ...chain, base: withMass(chain.base) }
        : { ...chain, joints: chain.joints.map((cj, i) => (i === link - 1 ? { ...cj, link: withMass(cj.link) } : cj)) };
    setDraft({ ...draft, chain: next });
  };

  const setTool = (axis: 0 | 1 | 2, mm: number) => {
    if (!chain) return;
    const xyz = chain.tool.xyz.slice() as [number, number, number];
    xyz[axis] = mm / 1000;
    setDraft({ ...draft, chain: { ...chain, tool: { ...chain.tool, xyz } } });
  };

  const submit = form.handleSubmit(async ({ arm: checked, note }) => {
    setFailure(undefined);
    try {
      await onSave(checked, note);
    } catch (error) {
      const known = shownPaths(checked);
      const setArmError: UseFormSetError<FieldValues> = (path, err, options) =>
        form.setError(`arm.${path}` as "arm", err, options);
      const rest = applyApiIssues(apiIssues(error), setArmError, known, { prefix: "description" });
      setFailure(formFailure(error, applyApiIssues(rest, form.setError, ["note"])));
    }
  });
  const placed = new Set(shownPaths(draft));
  const massPath = (link: number) =>
    link === 0 ? "chain.base.inertial.mass" : `chain.joints.${link - 1}.link.inertial.mass`;
  const unplaced = Object.entries(errors).filter(([path]) => !placed.has(path));

  const links = chain
    ? [
        { name: chain.base.name ?? "base", mass: chain.base.inertial?.mass },
        ...chain.joints.map((cj, i) => ({ name: cj.link.name ?? `link ${i + 1}`, mass: cj.link.inertial?.mass })),
      ]
    : [];

  return (
    <form aria-label={`Parameters of ${title}`} onSubmit={submit} noValidate className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <h2 className="mr-auto text-sm font-semibold">{title}</h2>
        <label className="flex flex-col text-xs text-ink-soft">
          Angles in
          <select
            aria-label="Angle unit"
            value={unit}
            onChange={(e) => setUnit(e.target.value as AngleUnit)}
            className="h-8 rounded border border-line bg-panel px-1 text-xs"
          >
            <option value="deg">degrees</option>
            <option value="rad">radians</option>
          </select>
        </label>
        <label className="flex flex-col text-xs text-ink-soft">
          Control rate (Hz)
          <NumberInput
            value={draft.controlRateHz}
            digits={0}
            onValue={(v) => setDraft({ ...draft, controlRateHz: v })}
            aria-label="Control rate (Hz)"
            className="w-24"
            aria-invalid={Boolean(errors.controlRateHz)}
          />
        </label>
        <label className="flex flex-col text-xs text-ink-soft">
          Caution ratio
          <NumberInput
            value={draft.cautionRatio}
            digits={2}
            onValue={(v) => setDraft({ ...draft, cautionRatio: v })}
            aria-label="Caution ratio"
            className="w-20"
            aria-invalid={Boolean(errors.cautionRatio)}
          />
        </label>
      </div>
      <p className="text-[11px] text-ink-faint">
        <span className="font-medium">Caution ratio</span> — {hintFor("cautionRatio")}{" "}
        <span className="font-medium">Control period</span> — {hintFor("controlPeriod")}
      </p>
      {errors.controlRateHz || errors.cautionRatio ? (
        <p className="text-xs text-fault">
          {errors.controlRateHz ? `Control rate ${errors.controlRateHz}. ` : ""}
          {errors.cautionRatio ? `Caution ratio ${errors.cautionRatio}.` : ""}
        </p>
      ) : null}

      <div className="overflow-x-auto">
        {/* Wide enough that every value shows whole (−174.8°, 1375.1°/s², N·m·s/rad); narrower screens scroll. */}
        <Table aria-label="Joint limits and friction" className="min-w-[1180px]">
          <thead>
            <tr>
              <Th>Joint</Th>
              {jointFields.map((f) => (
                <Th key={f.key} numeric>
                  {f.label}
                </Th>
              ))}
            </tr>
          </thead>
          <tbody>
            {draft.joints.map((joint, j) => (
              <tr key={joint.name}>
                <Td className="text-xs font-medium">
                  {joint.name}
                  <span className="block text-[10px] text-ink-faint">{joint.type}</span>
                </Td>
                {jointFields.map((field) => {
                  const path =
                    field.key === "coulomb" || field.key === "viscous"
                      ? `joints.${j}.friction.${field.key}`
                      : `joints.${j}.${field.key}`;
                  const unitText = fieldUnit(joint, field, unit);
                  const digits =
                    field.quantity === null || field.quantity === "effort" ? 3 : displayDigits(joint.type, unit);
                  return (
                    <Td key={field.key} numeric>
                      <span className="flex items-center justify-end gap-1">
                        <NumberInput
                          key={`${field.key}-${unit}`}
                          value={shown(joint, field, jointValue(joint, field.key), unit)}
                          digits={digits}
                          placeholder={field.optional ? "none" : undefined}
                          aria-label={`${joint.name} ${field.label} (${unitText})`}
                          aria-invalid={Boolean(errors[path])}
                          onValue={(x) => setJoint(j, field, stored(joint, field, x, unit))}
                          className="w-24"
                        />
                        <span className="min-w-8 text-left text-[10px] whitespace-nowrap text-ink-faint">
                          {unitText}
                        </span>
                      </span>
                      {errors[path] ? (
                        <span role="alert" className="block text-left text-[11px] text-fault">
                          {field.label} {errors[path]}
                        </span>
                      ) : null}
                    </Td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </Table>
      </div>
      <p className="text-[11px] text-ink-faint">
        Revolute joints in {unit === "deg" ? "degrees (°, °/s, °/s²)" : "radians (rad, rad/s, rad/s²)"}, prismatic
        joints in millimetres; stored in radians and metres. An empty optional field is not checked (no acceleration
        limit, no effort limit, no friction).
      </p>

      {chain ? (
        <div className="grid gap-3 md:grid-cols-2">
          <Table aria-label="Link masses">
            <thead>
              <tr>
                <Th>Link</Th>
                <Th numeric>Mass (kg)</Th>
              </tr>
            </thead>
            <tbody>
              {links.map((l, k) => (
                <tr key={`${l.name}-${k}`}>
                  <Td className="text-xs">{l.name}</Td>
                  <Td numeric>
                    <NumberInput
                      value={l.mass ?? NaN}
                      digits={3}
                      aria-label={`${l.name} mass (kg)`}
                      aria-invalid={Boolean(errors[massPath(k)])}
                      onValue={(v) => setMass(k, v)}
                      className="w-24"
                    />
                    {errors[massPath(k)] ? (
                      <span className="block text-left text-[11px] text-fault">Mass {errors[massPath(k)]}</span>
                    ) : null}
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <div className="flex flex-col gap-2 text-xs">
            <p className="font-medium">Tool point, in the last link&apos;s frame (mm)</p>
            <div className="flex gap-2">
              {(["x", "y", "z"] as const).map((axis, k) => (
                <label key={axis} className="flex flex-col text-ink-soft">
                  {axis}
                  <NumberInput
                    value={chain.tool.xyz[k] * 1000}
                    digits={1}
                    aria-label={`Tool point ${axis} (mm)`}
                    aria-invalid={Boolean(errors[`chain.tool.xyz.${k}`])}
                    onValue={(v) => setTool(k as 0 | 1 | 2, v)}
                    className="w-20"
                  />
                </label>
              ))}
            </div>
            <p className="text-ink-soft">
              The payload (carried mass) and the tool-speed limit belong to each plan (its <code>payload</code> and{" "}
              <code>maxToolSpeed</code> fields), so that one arm can carry different loads; effort and tool speed are
              checked with the plan&apos;s values.
            </p>
          </div>
        </div>
      ) : (
        <p className="text-xs text-ink-soft">
          This arm has no geometry (no chain): effort, clearance and tool speed are not checked for it.
        </p>
      )}

      {canEdit ? (
        <div className="flex flex-wrap items-end gap-2">
          <TextField
            label="Note for this revision"
            maxLength={500}
            fieldClassName="flex-1"
            error={noteError}
            {...form.register("note")}
          />
          <Button type="submit" variant="primary" disabled={isSubmitting}>
            {isSubmitting ? "Saving…" : saveLabel}
          </Button>
        </div>
      ) : null}
      {Object.keys(errors).length > 0 ? (
        <div role="alert" className="text-xs text-fault">
          <p>Fix the marked fields; nothing was saved.</p>
          {unplaced.length > 0 ? (
            <ul className="mt-1 list-disc pl-4" data-testid="arm-problems">
              {unplaced.map(([path, message]) => (
                <li key={path}>
                  <code className="font-mono">{path}</code> {message}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      {failure ? <ErrorNote title="Not saved">{failure}</ErrorNote> : null}
      {saved ? (
        <p role="status" className="text-xs text-pass">
          Saved.
        </p>
      ) : null}
    </form>
  );
}

function defaultInertial() {
  return {
    mass: 0,
    com: [0, 0, 0] as [number, number, number],
    inertia: { ixx: 0, ixy: 0, ixz: 0, iyy: 0, iyz: 0, izz: 0 },
  };
}
