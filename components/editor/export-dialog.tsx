"use client";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { SelectField } from "@/components/ui/field";
import { CautionAcknowledgement, SafetyCaution } from "@/components/ui/safety-caution";
import { api } from "@/lib/client/api-client";

/** The file name the export route gives a download (kept in step with its Content-Disposition). */
export function exportFileName(planName: string, version: number, format: "json" | "csv"): string {
  const base = planName.replace(/[^A-Za-z0-9._-]+/g, "-").slice(0, 60) || "plan";
  return `${base}-v${version}.${format}`;
}

/**
 * Export of a saved version: the safety caution first (acknowledged before any link works), then JSON
 * or CSV of the checked, sampled waypoint list at a chosen rate, and the command that verifies it.
 */
export function ExportDialog({
  planId,
  planName,
  version,
  dirty,
  controlRateHz,
  onClose,
}: {
  planId: string;
  planName: string;
  version: number;
  dirty: boolean;
  controlRateHz: number;
  onClose: () => void;
}) {
  const [ack, setAck] = useState(false);
  const [rateHz, setRateHz] = useState(controlRateHz);
  const [copied, setCopied] = useState(false);
  const command = `bin/jointproof check ${exportFileName(planName, version, "json")}`;
  const rates = [...new Set([controlRateHz, 500, 250, 100, 50])]
    .filter((r) => r <= controlRateHz)
    .sort((a, b) => b - a);
  return (
    <Dialog
      open
      title={`Export version ${version}`}
      onClose={onClose}
      actions={<Button onClick={onClose}>Close</Button>}
      className="max-w-xl"
    >
      <div className="flex flex-col gap-3">
        <SafetyCaution />
        <CautionAcknowledgement checked={ack} onChange={setAck} what="this export" />
        {dirty ? (
          <p className="rounded-md bg-brand-50 px-3 py-2 text-xs text-brand-700">
            You have unsaved edits. The export is version {version} as saved; save a new version to export your edits.
          </p>
        ) : null}
        <SelectField
          label="Waypoint rate"
          value={rateHz}
          onChange={(e) => setRateHz(Number(e.target.value))}
          hint="The control rate gives one waypoint per controller cycle."
        >
          {rates.map((r) => (
            <option key={r} value={r}>
              {r} Hz{r === controlRateHz ? " (control rate)" : ""}
            </option>
          ))}
        </SelectField>
        <div className="flex flex-wrap gap-2" aria-disabled={!ack}>
          {(["json", "csv"] as const).map((format) =>
            ack ? (
              <a
                key={format}
                href={api.exportUrl(planId, version, format, rateHz)}
                download={exportFileName(planName, version, format)}
                className="inline-flex h-9 items-center rounded-md bg-brand-600 px-3.5 text-sm font-medium text-white hover:bg-brand-700"
              >
                Download {format.toUpperCase()}
              </a>
            ) : (
              <Button key={format} variant="primary" disabled>
                Download {format.toUpperCase()}
              </Button>
            ),
          )}
        </div>
        <div>
          <p className="text-xs font-medium text-ink-soft">Verify the download with the command-line checker</p>
          <div className="mt-1 flex items-center gap-2">
            <code
              className="flex-1 truncate rounded-md border border-line bg-paper px-2 py-1.5 font-mono text-xs"
              data-testid="check-command"
            >
              {command}
            </code>
            <Button
              size="sm"
              disabled={!ack}
              onClick={async () => {
                try {
                  await navigator.clipboard.writeText(command);
                  setCopied(true);
                } catch {
                  setCopied(false);
                }
              }}
            >
              {copied ? "Copied" : "Copy command"}
            </Button>
          </div>
        </div>
      </div>
    </Dialog>
  );
}
