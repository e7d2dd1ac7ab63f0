// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { useState } from "react";
import { afterEach, describe, expect, it } from "vitest";
import { FaultApprovalDialog } from "@/components/review/fault-approval-dialog";
import { reportFaults, type SubmissionFault } from "@/lib/shared/courses/faults";

afterEach(cleanup);

const report = {
  verdict: "fault",
  findings: [
    {
      kind: "speed-over",
      severity: "fault",
      move: 0,
      joint: 0,
      value: 2.57,
      limit: 2.1,
      message: "base reaches 2.57 rad/s, above its 2.10 rad/s limit.",
    },
    {
      kind: "accel-over",
      severity: "caution",
      move: 0,
      joint: 1,
      value: 1,
      limit: 1.1,
      message: "shoulder is near its acceleration limit.",
    },
    {
      kind: "jump",
      severity: "fault",
      move: 2,
      joint: null,
      value: 1,
      limit: 0.01,
      message: "the instant move steps too far in one control period.",
    },
  ],
};

/** The dialog with its reason held in state, as the review page holds it; approvals are recorded. */
function Harness({ faults, approvals }: { faults: SubmissionFault[]; approvals: string[] }) {
  const [reason, setReason] = useState("");
  return (
    <FaultApprovalDialog
      open
      faults={faults}
      joints={["base", "shoulder"]}
      reason={reason}
      onReasonChange={setReason}
      pending={false}
      error={null}
      onCancel={() => {}}
      onApprove={() => approvals.push(reason)}
    />
  );
}

describe("approval dialog for a submission whose check faults", () => {
  it("lists only the faults (not cautions), moves named Move 1, Move 3 as on every screen, with the joint's name", () => {
    render(<Harness faults={reportFaults(report)} approvals={[]} />);
    const list = screen.getByTestId("approval-faults");
    const items = within(list)
      .getAllByRole("listitem")
      .map((li) => li.textContent);
    expect(items).toEqual([
      "Fault · Move 1 · base: base reaches 2.57 rad/s, above its 2.10 rad/s limit.",
      "Fault · Move 3: the instant move steps too far in one control period.",
    ]);
    expect(screen.getByText(/found these 2 faults/)).toBeTruthy();
  });

  it("sends the approval only once a reason other than blanks is typed", () => {
    const approvals: string[] = [];
    render(<Harness faults={reportFaults(report)} approvals={approvals} />);
    const approve = screen.getByRole("button", { name: "Approve with this reason" }) as HTMLButtonElement;
    expect(approve.disabled).toBe(true);
    const reason = screen.getByRole("textbox", { name: "Reason for approving (the student sees it)" });
    fireEvent.change(reason, { target: { value: "   " } });
    expect(approve.disabled).toBe(true);
    fireEvent.change(reason, { target: { value: "Discussed in class." } });
    expect(approve.disabled).toBe(false);
    fireEvent.click(approve);
    expect(approvals).toEqual(["Discussed in class."]);
  });

  it("still asks for confirmation when the stored report cannot be read, saying the verdict was a fault", () => {
    render(<Harness faults={reportFaults({ nonsense: true })} approvals={[]} />);
    expect(screen.queryByTestId("approval-faults")).toBeNull();
    expect(screen.getByText(/found a fault verdict/)).toBeTruthy();
  });
});
