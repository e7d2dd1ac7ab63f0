"use client";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useEffect, useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { TextAreaField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { VerdictChip } from "@/components/ui/verdict-chip";
import type { Report } from "@/kinematics";
import { api, ApiError } from "@/lib/client/api-client";
import { queryKeys } from "@/lib/client/query-keys";
import { ExportDialog } from "./export-dialog";
import { ImportDialog } from "./import-dialog";
import type { BenchPlan } from "./plan-state";
import { VersionsDialog } from "./versions-dialog";

export interface PlanActionsProps {
  plan: BenchPlan;
  report: Report;
  replace: (plan: BenchPlan) => void;
  initialPlan: BenchPlan;
  planId: string;
  planName: string;
  armRevision: number;
  version: number;
  onSaved: (version: number) => void;
  canEdit: boolean;
  /** Told whether the plan differs from the last saved or loaded version (for the leave warning and the draft). */
  onDirtyChange?: (dirty: boolean) => void;
}

type Open = null | "save" | "versions" | "import" | "export";

/** Save (a new version with a note, 409 handled), versions and compare, import and export. */
export function PlanActions(props: PlanActionsProps) {
  const { plan, replace, planId, armRevision, version, onSaved, canEdit } = props;
  const queryClient = useQueryClient();
  const [open, setOpen] = useState<Open>(null);
  const [savedPlan, setSavedPlan] = useState<BenchPlan>(props.initialPlan);
  const [note, setNote] = useState("");
  const [conflict, setConflict] = useState<{ latest: number; base: number } | null>(null);
  const [lastSaved, setLastSaved] = useState<{ number: number; verdict: Report["verdict"] } | null>(null);
  const dirty = plan !== savedPlan;
  const { onDirtyChange } = props;
  useEffect(() => {
    onDirtyChange?.(dirty);
  }, [dirty, onDirtyChange]);

  const save = useMutation({
    mutationFn: (input: { baseVersion: number; document: BenchPlan; note: string }) =>
      api.saveVersion(planId, {
        baseVersion: input.baseVersion,
        document: input.document,
        note: input.note || undefined,
        armRevision,
      }),
    onSuccess: (res, input) => {
      setSavedPlan(input.document);
      onSaved(res.version.number);
      setLastSaved({ number: res.version.number, verdict: res.report.verdict });
      setOpen(null);
      setConflict(null);
      setNote("");
      void queryClient.invalidateQueries({ queryKey: queryKeys.versions(planId) });
    },
    onError: (err, input) => {
      if (err instanceof ApiError && err.status === 409) {
        const latest = Number(err.details.latestVersion ?? 0);
        setConflict({ latest, base: input.baseVersion });
        setOpen(null);
      }
    },
  });

  const loadVersion = async (number: number) => {
    const v = await api.getVersion(planId, number);
    const doc = v.document as BenchPlan;
    replace(doc);
    setSavedPlan(doc);
    return doc;
  };

  return (
    <>
      <span className="text-xs text-ink-soft" aria-live="polite" data-testid="save-state">
        {dirty ? (
          "Unsaved changes"
        ) : lastSaved ? (
          <>
            Saved as version {lastSaved.number} <VerdictChip verdict={lastSaved.verdict} size="sm" />
          </>
        ) : version > 0 ? (
          `Version ${version}`
        ) : (
          "Not saved yet"
        )}
      </span>
      <Button size="sm" onClick={() => setOpen("versions")} disabled={version === 0}>
        Versions
      </Button>
      <Button size="sm" onClick={() => setOpen("import")} disabled={!canEdit}>
        Import
      </Button>
      <Button
        size="sm"
        onClick={() => setOpen("export")}
        disabled={version === 0}
        title={version === 0 ? "Save a version first: exports come from saved versions" : undefined}
      >
        Export
      </Button>
      <Button
        size="sm"
        variant="primary"
        onClick={() => setOpen("save")}
        disabled={!canEdit || (!dirty && version > 0)}
      >
        Save version
      </Button>

      <Dialog
        open={open === "save"}
        title={`Save version ${version + 1}`}
        onClose={() => setOpen(null)}
        actions={
          <>
            <Button onClick={() => setOpen(null)}>Cancel</Button>
            <Button
              variant="primary"
              disabled={save.isPending}
              onClick={() => save.mutate({ baseVersion: version, document: plan, note })}
            >
              {save.isPending ? "Saving…" : "Save"}
            </Button>
          </>
        }
      >
        <p className="mb-3 text-ink-soft">
          The server checks the plan again against arm revision {armRevision} and stores its verdict with the version.
          Versions are never edited; a save adds one.
        </p>
        <TextAreaField
          label="Note (what changed and why)"
          value={note}
          onChange={(e) => setNote(e.target.value)}
          maxLength={500}
          placeholder="e.g. Move 2 lengthened to its shortest safe duration"
        />
        {save.error && !(save.error instanceof ApiError && save.error.status === 409) ? (
          <div className="mt-3">
            <ErrorNote title="The version was not saved">
              {save.error.message}
              {save.error instanceof ApiError && save.error.issues.length > 0 ? (
                <ul className="mt-1 list-disc pl-4">
                  {save.error.issues.map((i) => (
                    <li key={i.path}>
                      <code>{i.path}</code>: {i.message}
                    </li>
                  ))}
                </ul>
              ) : null}
            </ErrorNote>
          </div>
        ) : null}
      </Dialog>

      <Dialog
        open={conflict !== null}
        title="Someone saved this plan in the meantime"
        onClose={() => setConflict(null)}
        actions={<Button onClick={() => setConflict(null)}>Decide later</Button>}
      >
        {conflict ? (
          <div className="flex flex-col gap-3">
            <p>
              You started from version {conflict.base}; version {conflict.latest} has been saved since. Nothing was
              overwritten. Choose what happens to your edits:
            </p>
            <div className="flex flex-col gap-2">
              <Button
                variant="primary"
                className="justify-start"
                onClick={() => {
                  onSaved(conflict.latest);
                  save.mutate({
                    baseVersion: conflict.latest,
                    document: plan,
                    note: note || `Saved over version ${conflict.latest} after a conflict`,
                  });
                }}
              >
                Save my edits as version {conflict.latest + 1} (they replace version {conflict.latest}&apos;s content)
              </Button>
              <Button className="justify-start" onClick={() => setOpen("versions")}>
                Compare versions first
              </Button>
              <Button
                variant="danger"
                className="justify-start"
                onClick={async () => {
                  await loadVersion(conflict.latest);
                  onSaved(conflict.latest);
                  setConflict(null);
                }}
              >
                Discard my edits and load version {conflict.latest}
              </Button>
            </div>
          </div>
        ) : null}
      </Dialog>

      {open === "versions" ? (
        <VersionsDialog
          planId={planId}
          onClose={() => setOpen(null)}
          onLoad={async (n) => {
            await loadVersion(n);
            setOpen(null);
          }}
        />
      ) : null}
      {open === "import" ? (
        <ImportDialog
          current={plan}
          onClose={() => setOpen(null)}
          onImport={(p) => {
            replace(p);
            setOpen(null);
          }}
        />
      ) : null}
      {open === "export" ? (
        <ExportDialog
          planId={planId}
          planName={props.planName}
          version={version}
          dirty={dirty}
          controlRateHz={plan.arm.controlRateHz}
          onClose={() => setOpen(null)}
        />
      ) : null}
    </>
  );
}
