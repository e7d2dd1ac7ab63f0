"use client";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { TextAreaField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { formatPath, parsePlan, type InputProblem } from "@/kinematics";
import { hasExportBlock, planOfExport } from "@/lib/shared/export-format";
import type { BenchPlan } from "./plan-state";

export type ImportResult = { ok: true; plan: BenchPlan; note?: string } | { ok: false; problems: InputProblem[] };

/**
 * Reads a plan document (JSON text) for the bench: validated with the engine's schema, problems named
 * by field path. The plan keeps its own arm: the imported start pose and moves are taken onto it when
 * the joint counts match, since saving checks against the plan's stored arm revision.
 */
export function importPlanText(text: string, current: BenchPlan): ImportResult {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    return {
      ok: false,
      problems: [{ path: [], message: `is not JSON (${err instanceof Error ? err.message : "parse error"})` }],
    };
  }
  // An export is the plan document with an `export` block; the plan is read without the block.
  const parsed = parsePlan(hasExportBlock(raw) ? planOfExport(raw) : raw);
  if (!parsed.ok) return { ok: false, problems: parsed.problems };
  const value = parsed.value;
  const n = current.arm.joints.length;
  if (value.arm.joints.length !== n) {
    return {
      ok: false,
      problems: [
        {
          path: ["arm", "joints"],
          message: `has ${value.arm.joints.length} joints; this plan's arm "${current.arm.name}" has ${n}`,
        },
      ],
    };
  }
  const sameArm = JSON.stringify(value.arm) === JSON.stringify(current.arm);
  return {
    ok: true,
    plan: { ...current, start: value.start, moves: value.moves },
    note: sameArm
      ? undefined
      : `The file is for arm "${value.arm.name}"; its start pose and ${value.moves.length} moves were taken onto this plan's arm "${current.arm.name}", whose limits apply.`,
  };
}

export function ImportDialog({
  current,
  onClose,
  onImport,
}: {
  current: BenchPlan;
  onClose: () => void;
  onImport: (plan: BenchPlan) => void;
}) {
  const [text, setText] = useState("");
  const [result, setResult] = useState<ImportResult | null>(null);
  const read = (t: string) => {
    setText(t);
    setResult(t.trim() ? importPlanText(t, current) : null);
  };
  return (
    <Dialog
      open
      title="Import a plan document"
      onClose={onClose}
      className="max-w-xl"
      actions={
        <>
          <Button onClick={onClose}>Cancel</Button>
          <Button variant="primary" disabled={!result?.ok} onClick={() => result?.ok && onImport(result.plan)}>
            Replace the bench&apos;s plan
          </Button>
        </>
      }
    >
      <div className="flex flex-col gap-3">
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
          JSON file (a plan document or an export)
          <input
            type="file"
            accept="application/json,.json"
            className="text-sm"
            onChange={async (e) => {
              const file = e.target.files?.[0];
              if (file) read(await file.text());
            }}
          />
        </label>
        <TextAreaField
          label="…or paste the JSON"
          value={text}
          onChange={(e) => read(e.target.value)}
          className="min-h-32 font-mono text-xs"
          spellCheck={false}
        />
        {result && !result.ok ? (
          <ErrorNote
            title={`The document was refused (${result.problems.length} problem${result.problems.length === 1 ? "" : "s"})`}
          >
            <ul className="mt-1 space-y-0.5" data-testid="import-problems">
              {result.problems.map((p, i) => (
                <li key={i}>
                  <code className="font-mono">{formatPath(p.path)}</code>: {p.message}
                </li>
              ))}
            </ul>
          </ErrorNote>
        ) : null}
        {result?.ok ? (
          <p role="status" className="rounded-md bg-pass-tint px-3 py-2 text-xs text-pass">
            Valid: {result.plan.moves.length} moves. {result.note ?? ""} Your current edits will be replaced (saved
            versions stay).
          </p>
        ) : null}
      </div>
    </Dialog>
  );
}
