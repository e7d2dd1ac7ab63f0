// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen } from "@testing-library/react";
import { useState } from "react";
import { afterEach, describe, expect, it } from "vitest";
import { PoseEditor } from "@/components/editor/pose-editor";
import type { AngleUnit } from "@/lib/shared/units";
import { demoPlan } from "./helpers";

afterEach(cleanup);

const plan = demoPlan();
const joints = plan.arm.joints;

/** The editor with real state, as the bench holds it (values stored in radians and metres). */
function Harness({ initial, onPose }: { initial: number[]; onPose?: (p: number[]) => void }) {
  const [pose, setPose] = useState(initial);
  const [unit, setUnit] = useState<AngleUnit>("deg");
  return (
    <PoseEditor
      title="Start pose"
      joints={joints}
      pose={pose}
      unit={unit}
      onUnitChange={setUnit}
      onJointChange={(j, v) => {
        const next = pose.slice();
        next[j] = v;
        setPose(next);
        onPose?.(next);
      }}
      onHome={() => setPose(new Array(joints.length).fill(0))}
    />
  );
}

describe("pose editor", () => {
  it("shows revolute joints in degrees by default and stores what is typed in radians", () => {
    let last: number[] = [];
    render(<Harness initial={new Array(joints.length).fill(0)} onPose={(p) => (last = p)} />);
    const elbow = screen.getByLabelText("elbow (°)") as HTMLInputElement;
    expect(elbow.value).toBe("0.0");
    fireEvent.change(elbow, { target: { value: "90" } });
    expect(last[2]).toBeCloseTo(Math.PI / 2, 12);
  });

  it("switches to radians and back without changing the stored pose", () => {
    render(<Harness initial={[0, 0, Math.PI / 4, 0, 0, 0, 0.01]} />);
    expect((screen.getByLabelText("elbow (°)") as HTMLInputElement).value).toBe("45.0");
    fireEvent.click(screen.getByRole("button", { name: "Radians" }));
    expect((screen.getByLabelText("elbow (rad)") as HTMLInputElement).value).toBe("0.785");
    expect(screen.getByRole("button", { name: "Radians" }).getAttribute("aria-pressed")).toBe("true");
    fireEvent.click(screen.getByRole("button", { name: "Degrees" }));
    expect((screen.getByLabelText("elbow (°)") as HTMLInputElement).value).toBe("45.0");
  });

  it("shows the gripper (prismatic) in millimetres", () => {
    render(<Harness initial={[0, 0, 0, 0, 0, 0, 0.012]} />);
    expect((screen.getByLabelText("gripper (mm)") as HTMLInputElement).value).toBe("12.0");
  });

  it("puts each joint's travel on its slider, in display units", () => {
    render(<Harness initial={new Array(joints.length).fill(0)} />);
    const slider = screen.getByRole("slider", { name: "elbow" }) as HTMLInputElement;
    expect(Number(slider.min)).toBeCloseTo((joints[2].min * 180) / Math.PI, 6);
    expect(Number(slider.max)).toBeCloseTo((joints[2].max * 180) / Math.PI, 6);
    fireEvent.change(slider, { target: { value: "30" } });
    expect((screen.getByLabelText("elbow (°)") as HTMLInputElement).value).toBe("30.0");
  });

  it("marks a value outside the joint's travel and names the travel", () => {
    render(<Harness initial={[0, 0, 3.2, 0, 0, 0, 0]} />);
    const elbow = screen.getByLabelText("elbow (°)");
    expect(elbow.getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByText(/Outside the travel -91\.7…166\.2 °/)).toBeTruthy();
    expect(screen.getByLabelText("base (°)").getAttribute("aria-invalid")).toBe("false");
  });

  it("ignores text that is not a number and keeps the last value", () => {
    let calls = 0;
    render(<Harness initial={new Array(joints.length).fill(0)} onPose={() => calls++} />);
    fireEvent.change(screen.getByLabelText("base (°)"), { target: { value: "abc" } });
    expect(calls).toBe(0);
  });

  it("home sets every joint back to zero", () => {
    render(<Harness initial={[0.5, 0.4, 0.3, 0.2, 0.1, 0.1, 0.01]} />);
    fireEvent.click(screen.getByRole("button", { name: /Home/ }));
    expect((screen.getByLabelText("base (°)") as HTMLInputElement).value).toBe("0.0");
    expect((screen.getByLabelText("gripper (mm)") as HTMLInputElement).value).toBe("0.0");
  });
});
