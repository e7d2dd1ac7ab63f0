"use client";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { TextAreaField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { moveLabel } from "@/kinematics";
import type { SubmissionFault } from "@/lib/shared/courses/faults";
import { FAULT_APPROVAL_REASON_MAX } from "@/lib/shared/schemas/reviews";

export interface FaultApprovalDialogProps {
  open: boolean;
  /** The faults of the server's check, as the decision route counts them. */
  faults: SubmissionFault[];
  /** Joint names, to label faults of one joint. */
  joints: readonly string[];
  reason: string;
  onReasonChange: (reason: string) => void;
  /** The reason's error under its field (the API's schema's words). */
  reasonError?: string;
  pending: boolean;
  error: string | null;
  onCancel: () => void;
  onApprove: () => void;
}

const escapeRegExp = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/**
 * The move and joint to put before a fault's message, only those the message does not name itself:
 * the engine's messages start "Move 1, joint "base": …", and a label in front would say it twice. A
 * message that names neither (a report from an older check) keeps both, so nothing is lost.
 */
export function faultWhere(fault: SubmissionFault, joints: readonly string[]): string {
  let where = "";
  if (fault.move !== null) {
    const label = moveLabel(fault.move);
    // "Move 1", "Instant move 1" or "the goal of move 1", but not "Move 12"
    const named = new RegExp(`\\b${escapeRegExp(label)}(?!\\d)`, "i").test(fault.message);
    if (!named) where += ` · ${label}`;
  }
  if (fault.joint !== null) {
    const name = joints[fault.joint];
    // a joint the arm's list does not hold: the message's own joint "…" is the better name
    if (name === undefined) where += /joint "[^"]+"/.test(fault.message) ? "" : ` · joint ${fault.joint + 1}`;
    else if (!fault.message.includes(`"${name}"`)) where += ` · ${name}`;
  }
  return where;
}

/**
 * Approving a submission whose check found faults: the dialog lists each fault (moves named as every
 * screen names them, "Move 1" for the first) and sends the approval only with a typed reason, which the student will see.
 */
export function FaultApprovalDialog({
  open,
  faults,
  joints,
  reason,
  onReasonChange,
  reasonError,
  pending,
  error,
  onCancel,
  onApprove,
}: FaultApprovalDialogProps) {
  return (
    <Dialog
      open={open}
      title="Approve a plan whose check found faults?"
      onClose={onCancel}
      className="max-w-xl"
      actions={
        <>
          <Button size="sm" onClick={onCancel}>
            Cancel
          </Button>
          <Button variant="danger" size="sm" disabled={pending || !reason.trim()} onClick={onApprove}>
            Approve with this reason
          </Button>
        </>
      }
    >
      <p>
        The server&apos;s check against the assignment&apos;s limits found{" "}
        {faults.length === 1 ? "this fault" : faults.length > 1 ? `these ${faults.length} faults` : "a fault verdict"}.
        On the arm, the controller would stop or refuse the motion there. Approving accepts the work as it is; the
        faults stay in the plan.
      </p>
      {faults.length > 0 ? (
        <ul className="mt-3 flex max-h-56 flex-col gap-1.5 overflow-y-auto" data-testid="approval-faults">
          {faults.map((f, i) => (
            <li key={i} className="rounded-md border border-fault/40 bg-fault-tint/40 px-2 py-1 text-xs">
              <span className="font-semibold text-fault">Fault</span>
              {faultWhere(f, joints)}: {f.message}
            </li>
          ))}
        </ul>
      ) : null}
      <div className="mt-3">
        <TextAreaField
          label="Reason for approving (the student sees it)"
          rows={3}
          maxLength={FAULT_APPROVAL_REASON_MAX}
          value={reason}
          onChange={(e) => onReasonChange(e.target.value)}
          error={reasonError}
          hint={`Required, at most ${FAULT_APPROVAL_REASON_MAX} characters. Approval does not clear the plan to run; the lab's safety rules decide that.`}
        />
      </div>
      {error ? (
        <div className="mt-2">
          <ErrorNote>{error}</ErrorNote>
        </div>
      ) : null}
    </Dialog>
  );
}
