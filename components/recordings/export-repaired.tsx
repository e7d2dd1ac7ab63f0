"use client";
import { useMemo, useState } from "react";
import { CautionAcknowledgement, SafetyCaution } from "@/components/ui/safety-caution";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { formatRecordingCsv, type Recording } from "@/kinematics";

/** Export of a repaired recording as CSV, behind the safety caution. */
export function ExportDialogShell({
  recording,
  fileName,
  onClose,
}: {
  recording: Recording;
  fileName: string;
  onClose: () => void;
}) {
  const [ack, setAck] = useState(false);
  const href = useMemo(
    () => (ack ? URL.createObjectURL(new Blob([formatRecordingCsv(recording)], { type: "text/csv" })) : null),
    [ack, recording],
  );
  return (
    <Dialog
      open
      title="Export the repaired recording"
      onClose={onClose}
      actions={<Button onClick={onClose}>Close</Button>}
    >
      <div className="flex flex-col gap-3">
        <SafetyCaution />
        <CautionAcknowledgement checked={ack} onChange={setAck} what="the repaired recording" />
        {href ? (
          <a
            href={href}
            download={fileName}
            className="inline-flex h-9 w-fit items-center rounded-md bg-brand-600 px-3.5 text-sm font-medium text-white hover:bg-brand-700"
          >
            Download {fileName}
          </a>
        ) : (
          <Button variant="primary" disabled className="w-fit">
            Download CSV
          </Button>
        )}
        <p className="text-xs text-ink-soft">
          Check it again from the command line:{" "}
          <code className="font-mono">bin/jointproof scan {fileName} --arm ARM.json</code>
        </p>
      </div>
    </Dialog>
  );
}
