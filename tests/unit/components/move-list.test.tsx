// @vitest-environment happy-dom
import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { useEffect, useReducer, useState } from "react";
import { afterEach, describe, expect, it } from "vitest";
import { MoveList } from "@/components/editor/move-list";
import { planReducer, type BenchPlan, type PoseTarget } from "@/components/editor/plan-state";
import { quickFixes } from "@/components/editor/quick-fixes";
import { check } from "@/kinematics";
import { demoPlan, pose } from "./helpers";

afterEach(cleanup);

let current: BenchPlan;
const record = (plan: BenchPlan) => {
  current = plan;
};

/** The move list with the bench's reducer and the engine's real report. */
function Harness({ initial, select = 0 }: { initial: BenchPlan; select?: PoseTarget }) {
  const [plan, dispatch] = useReducer(planReducer, initial);
  const [selected, setSelected] = useState<PoseTarget>(select);
  useEffect(() => record(plan), [plan]);
  const report = check(plan);
  return (
    <MoveList
      joints={plan.arm.joints}
      startPose={plan.start}
      moves={plan.moves}
      reports={report.moves}
      unit="deg"
      selected={selected}
      onSelect={setSelected}
      dispatch={dispatch}
      startVerdict="pass"
      fixes={quickFixes(plan, report).moves}
    />
  );
}

const threeMoves = () =>
  demoPlan([
    { goal: pose(0.5), duration: 2 },
    { goal: pose(0.5, 0.4), duration: 1.5 },
    { goal: pose(0, 0), duration: 2, shape: "cubic" },
  ]);

function rowVerdict(i: number): string | null {
  return screen.getByTestId(`move-row-${i}`).querySelector("[data-verdict]")?.getAttribute("data-verdict") ?? null;
}

describe("move list", () => {
  it("lists each move with its duration, shape and verdict from the engine", () => {
    render(<Harness initial={threeMoves()} />);
    expect((screen.getByLabelText("Move 2 duration (s)") as HTMLInputElement).value).toBe("1.500");
    expect((screen.getByLabelText("Move 3 shape") as HTMLSelectElement).value).toBe("cubic");
    expect([rowVerdict(0), rowVerdict(1), rowVerdict(2)]).toEqual(["pass", "pass", "pass"]);
  });

  it("a duration too short for the base's speed limit turns the move's verdict to fault", () => {
    render(<Harness initial={threeMoves()} />);
    // 0.5 rad quintic: peak 1.875·0.5/T; base limit 3.2 rad/s → faults below ≈ 0.293 s
    fireEvent.change(screen.getByLabelText("Move 1 duration (s)"), { target: { value: "0.2" } });
    expect(rowVerdict(0)).toBe("fault");
    expect(within(screen.getByTestId("move-row-0")).getByText("Fault")).toBeTruthy();
  });

  it("the shortest-safe action sets the duration that passes without fault", () => {
    render(<Harness initial={threeMoves()} />);
    fireEvent.change(screen.getByLabelText("Move 1 duration (s)"), { target: { value: "0.2" } });
    fireEvent.click(screen.getByRole("button", { name: /Set move 1 to its shortest safe duration/ }));
    const d = current.moves[0].duration;
    expect(d).toBeGreaterThan(0.2);
    expect(check(current).moves[0].findings.filter((f) => f.severity === "fault")).toEqual([]);
    // rounded up to whole milliseconds: 1 ms less would fault
    const shorter = { ...current, moves: current.moves.map((m, i) => (i === 0 ? { ...m, duration: d - 0.001 } : m)) };
    expect(check(shorter).moves[0].findings.some((f) => f.severity === "fault")).toBe(true);
  });

  it("offers no shortest-safe button until the fixes are verified", () => {
    const plan = demoPlan([{ goal: pose(1.5), duration: 0.2 }]);
    const report = check(plan);
    render(
      <MoveList
        joints={plan.arm.joints}
        startPose={plan.start}
        moves={plan.moves}
        reports={report.moves}
        unit="deg"
        selected={0}
        onSelect={() => {}}
        dispatch={() => {}}
        startVerdict="pass"
        fixes={null}
      />,
    );
    expect(screen.queryByRole("button", { name: /shortest safe duration/ })).toBeNull();
  });

  it("shows no start-pose chip when told there is no verdict (an empty plan)", () => {
    const plan = demoPlan([]);
    const { container } = render(
      <MoveList
        joints={plan.arm.joints}
        startPose={plan.start}
        moves={[]}
        reports={[]}
        unit="deg"
        selected="start"
        onSelect={() => {}}
        dispatch={() => {}}
        startVerdict={null}
      />,
    );
    expect(container.querySelector("[data-verdict]")).toBeNull();
    expect(screen.getByText(/No moves yet/)).toBeTruthy();
  });

  it("adds a move that holds the last goal, and duplicates the selected one", () => {
    render(<Harness initial={threeMoves()} />);
    fireEvent.click(screen.getByRole("button", { name: /Add move/ }));
    expect(current.moves).toHaveLength(4);
    expect(current.moves[3].goal).toEqual(current.moves[2].goal);
    fireEvent.click(screen.getByRole("button", { name: "Duplicate move 4" }));
    expect(current.moves).toHaveLength(5);
  });

  it("reorders with Alt+ArrowUp on a focused row and announces it", async () => {
    render(<Harness initial={threeMoves()} select={1} />);
    const row = screen.getByTestId("move-row-1");
    row.focus();
    await act(async () => {
      fireEvent.keyDown(row, { key: "ArrowUp", altKey: true });
    });
    expect(current.moves[0].goal).toEqual(pose(0.5, 0.4));
    expect(current.moves[1].goal).toEqual(pose(0.5));
    expect(screen.getByText("Move 2 is now move 1 of 3.")).toBeTruthy();
  });

  it("reorders with the down button, and cannot move the last row further", () => {
    render(<Harness initial={threeMoves()} select={2} />);
    expect((screen.getByRole("button", { name: "Move 3 down" }) as HTMLButtonElement).disabled).toBe(true);
    fireEvent.click(screen.getByRole("button", { name: "Move 3 up" }));
    expect(current.moves[1].shape).toBe("cubic");
  });

  it("deletes the selected move with its button and with the Delete key", () => {
    render(<Harness initial={threeMoves()} select={0} />);
    fireEvent.click(screen.getByRole("button", { name: "Delete move 1" }));
    expect(current.moves).toHaveLength(2);
    fireEvent.keyDown(screen.getByTestId("move-row-1"), { key: "Delete" });
    expect(current.moves).toHaveLength(1);
  });

  it("changes the shape of a move", () => {
    render(<Harness initial={threeMoves()} />);
    fireEvent.change(screen.getByLabelText("Move 1 shape"), { target: { value: "trapezoid" } });
    expect(current.moves[0].shape).toBe("trapezoid");
  });

  it("the selected move shows the engine's peak effort (closest to its limit) and peak tool speed", () => {
    const plan = demoPlan([
      { goal: pose(0.5, 0.3), duration: 2 },
      { goal: pose(0.5, 0.3, 0.6), duration: 2 },
    ]);
    const report = check(plan).moves[0];
    const shoulder = report.peakEffort![1]!;
    render(<Harness initial={plan} />);
    const figures = screen.getByTestId("move-figures-0");
    // shoulder holds the arm against gravity: the largest share of its maxEffort (14 N·m) on the light arm
    expect(
      within(figures).getByText(
        `shoulder ${shoulder.toFixed(2)} N·m (${Math.round((shoulder / 14) * 100)}% of 14.00 N·m)`,
      ),
    ).toBeTruthy();
    expect(within(figures).getByText(`${report.peakToolSpeed!.toFixed(3)} m/s`)).toBeTruthy();
    expect(screen.queryByTestId("move-figures-1")).toBeNull(); // only the selected move
  });

  it("shows no peak figures when the report comes from the joint checks alone", () => {
    const plan = threeMoves();
    const bare = check(plan).moves.map(({ peakEffort: _e, peakToolSpeed: _t, ...m }) => m);
    render(
      <MoveList
        joints={plan.arm.joints}
        startPose={plan.start}
        moves={plan.moves}
        reports={bare}
        unit="deg"
        selected={0}
        onSelect={() => {}}
        dispatch={() => {}}
        startVerdict="pass"
      />,
    );
    expect(screen.getByTestId("move-row-0")).toBeTruthy();
    expect(screen.queryByTestId("move-figures-0")).toBeNull();
  });
});
