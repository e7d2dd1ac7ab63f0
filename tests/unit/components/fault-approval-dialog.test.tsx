// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { useState } from "react";
import { afterEach, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { FaultApprovalDialog, faultWhere } from "@/components/review/fault-approval-dialog";
import { check, planSchema } from "@/kinematics";
import { reportFaults, type SubmissionFault } from "@/lib/shared/courses/faults";

afterEach(cleanup);

/** A report as an older check stored it: its messages name neither the move nor the joint. */
const storedReport = {
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
function Harness({
  faults,
  approvals,
  joints = ["base", "shoulder"],
}: {
  faults: SubmissionFault[];
  approvals: string[];
  joints?: string[];
}) {
  const [reason, setReason] = useState("");
  return (
    <FaultApprovalDialog
      open
      faults={faults}
      joints={joints}
      reason={reason}
      onReasonChange={setReason}
      pending={false}
      error={null}
      onCancel={() => {}}
      onApprove={() => approvals.push(reason)}
    />
  );
}

/** The bench arm of tests/fixtures/plans/instant-jump.json, three moves: too fast, gentle, an instant jump. */
function engineReport() {
  const fixture = JSON.parse(readFileSync("tests/fixtures/plans/instant-jump.json", "utf8"));
  const rest = [0, 0, 0, 0, 0, 0, 0.02];
  const plan = planSchema.parse({
    ...fixture,
    start: rest,
    moves: [
      // 2 rad in 0.5 s, quintic: peak 1.875 × 2 / 0.5 = 7.5 rad/s, over the base's 3.1 rad/s (derived: the quintic's peak rate is 15/8 of the mean)
      { goal: [2, 0, 0, 0, 0, 0, 0.02], duration: 0.5, shape: "quintic" },
      { goal: [2, 0, 0.1, 0, 0, 0, 0.02], duration: 3, shape: "quintic" },
      { goal: [2, 0, 1.3, 0, 0, 0, 0.02], duration: 0 },
    ],
  });
  return check(plan);
}

const jointNames = (): string[] =>
  JSON.parse(readFileSync("tests/fixtures/plans/instant-jump.json", "utf8")).arm.joints.map(
    (j: { name: string }) => j.name,
  );

describe("approval dialog for a submission whose check faults", () => {
  it("lists only the faults, each once with its severity and the engine's message, which already names the move and the joint", () => {
    const report = engineReport();
    const faults = reportFaults(report);
    expect(faults.map((f) => [f.move, f.joint])).toEqual(
      expect.arrayContaining([
        [0, 0],
        [2, 2],
      ]),
    );
    render(<Harness faults={faults} approvals={[]} joints={jointNames()} />);
    const items = within(screen.getByTestId("approval-faults"))
      .getAllByRole("listitem")
      .map((li) => li.textContent);
    expect(items).toEqual(faults.map((f) => `Fault: ${f.message}`));
    const speed = items.find((t) => t!.includes("peak speed"))!;
    expect(speed).toMatch(/^Fault: Move 1, joint "base": peak speed/);
    expect(items.find((t) => t!.includes("control period"))).toMatch(/^Fault: Instant move 3, joint "elbow": /);
    // no item names its move or joint twice
    for (const item of items) {
      expect(item!.match(/\bmove \d+/gi)?.length ?? 0).toBeLessThanOrEqual(1);
      expect(item).not.toContain(" · ");
    }
  });

  it("keeps the move and the joint in front of a message that names neither (a report stored by an older check)", () => {
    render(<Harness faults={reportFaults(storedReport)} approvals={[]} />);
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

  it("names a move once when the message calls it differently cased, and tells Move 1 from Move 12", () => {
    const base = { kind: "range", joint: null };
    expect(faultWhere({ ...base, move: 0, message: "The goal of move 1 puts the base beyond its travel." }, [])).toBe(
      "",
    );
    expect(faultWhere({ ...base, move: 0, message: 'Move 12, joint "base": too fast.' }, ["base"])).toBe(" · Move 1");
    expect(
      faultWhere({ kind: "x", move: null, joint: 1, message: 'joint "shoulder" is over.' }, ["base", "shoulder"]),
    ).toBe("");
    expect(
      faultWhere({ kind: "x", move: null, joint: 1, message: "the second joint is over." }, ["base", "shoulder"]),
    ).toBe(" · shoulder");
    expect(faultWhere({ kind: "x", move: null, joint: 4, message: "over." }, ["base"])).toBe(" · joint 5");
    expect(faultWhere({ kind: "x", move: null, joint: 4, message: 'joint "wrist-roll" is over.' }, ["base"])).toBe("");
  });

  it("sends the approval only once a reason other than blanks is typed", () => {
    const approvals: string[] = [];
    render(<Harness faults={reportFaults(storedReport)} approvals={approvals} />);
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
