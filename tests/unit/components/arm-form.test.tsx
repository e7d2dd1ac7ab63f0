// @vitest-environment happy-dom
import { act, cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import armH from "@/kinematics/arm/presets/bench-arm-h.json";
import { ArmForm } from "@/components/arms/arm-form";
import { armProblems, customArmName, jointValue, withJointValue } from "@/components/arms/arm-fields";
import { armSchema, formatPath, type Arm } from "@/kinematics";
import { ApiError, type FieldIssue } from "@/lib/client/api-client";
import { createArmRevisionSchema } from "@/lib/shared/schemas/api";

afterEach(cleanup);

const arm: Arm = armSchema.parse(armH);

describe("the arm form", () => {
  it("shows every parameter the check uses: travel, speed, acceleration, effort, friction, link masses, tool point, control rate, caution ratio", () => {
    render(
      <ArmForm
        arm={arm}
        title="Gripper arm"
        canEdit
        saveLabel="Save as a custom arm"
        saved={false}
        onSave={() => {}}
      />,
    );
    const j = arm.joints[1];
    for (const label of [
      "Travel min (°)",
      "Travel max (°)",
      "Max speed (°/s)",
      "Max acceleration (°/s²)",
      "Max effort (N·m)",
      "Coulomb friction (N·m)",
      "Viscous friction (N·m·s/rad)",
    ]) {
      expect(screen.getByLabelText(`${j.name} ${label}`)).toBeTruthy();
    }
    expect((screen.getByLabelText(`${j.name} Max speed (°/s)`) as HTMLInputElement).value).toBe(
      ((j.maxVelocity * 180) / Math.PI).toFixed(1),
    );
    expect((screen.getByLabelText(`${j.name} Coulomb friction (N·m)`) as HTMLInputElement).value).toBe(
      (j.friction?.coulomb ?? 0).toFixed(3),
    );
    expect(screen.getByLabelText("Control rate (Hz)")).toBeTruthy();
    expect(screen.getByLabelText("Caution ratio")).toBeTruthy();
    expect(screen.getAllByLabelText(/mass \(kg\)$/).length).toBe(1 + (arm.chain?.joints.length ?? 0));
    expect((screen.getByLabelText("Tool point z (mm)") as HTMLInputElement).value).toBe(
      ((arm.chain?.tool.xyz[2] ?? 0) * 1000).toFixed(1),
    );
  });

  it("a limit error in the degree form speaks degrees, and nothing is saved", async () => {
    let saved: Arm | null = null;
    render(
      <ArmForm
        arm={arm}
        title="Gripper arm"
        canEdit
        saveLabel="Save as a custom arm"
        saved={false}
        onSave={(a) => {
          saved = a;
        }}
      />,
    );
    const j = arm.joints[1];
    fireEvent.change(screen.getByLabelText(`${j.name} Travel min (°)`), { target: { value: "30" } });
    fireEvent.change(screen.getByLabelText(`${j.name} Travel max (°)`), { target: { value: "10" } });
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "Save as a custom arm" })));
    expect(saved).toBeNull();
    expect(screen.getByText("Travel max must not be below min (30.0°)")).toBeTruthy();
  });

  it("saves what was entered in degrees as radians, and friction as given", async () => {
    let saved: Arm | null = null;
    render(
      <ArmForm
        arm={arm}
        title="Gripper arm"
        canEdit
        saveLabel="Save as a custom arm"
        saved={false}
        onSave={(a) => {
          saved = a;
        }}
      />,
    );
    const j = arm.joints[0];
    fireEvent.change(screen.getByLabelText(`${j.name} Max speed (°/s)`), { target: { value: "90" } });
    fireEvent.change(screen.getByLabelText(`${j.name} Viscous friction (N·m·s/rad)`), { target: { value: "0.25" } });
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "Save as a custom arm" })));
    expect(saved).not.toBeNull();
    const out = saved as unknown as Arm;
    expect(out.joints[0].maxVelocity).toBeCloseTo(Math.PI / 2, 12);
    expect(out.joints[0].friction?.viscous).toBe(0.25);
    expect(out.joints[1]).toEqual(arm.joints[1]);
  });
});

describe("the arm form and the API's answer", () => {
  /** The API's problem list for a refused body, built the way lib/server/route.ts builds it. */
  function apiProblems(body: unknown): FieldIssue[] {
    const parsed = createArmRevisionSchema.safeParse(body);
    if (parsed.success) throw new Error("expected the body to be refused");
    return parsed.error.issues.map((i) => ({ path: formatPath(i.path, "(body)"), message: i.message }));
  }

  it("puts an arm problem the API answers under the field it names, and a note problem under the note", async () => {
    const bad = { ...arm, joints: arm.joints.map((joint, k) => (k === 2 ? { ...joint, maxVelocity: -1 } : joint)) };
    const issues = [
      ...apiProblems({ description: bad }).filter((i) => i.path === "description.joints[2].maxVelocity"),
      ...apiProblems({ description: arm, note: "x".repeat(501) }),
    ];
    expect(issues.map((i) => i.path)).toEqual(["description.joints[2].maxVelocity", "note"]);
    render(
      <ArmForm
        arm={arm}
        title="Gripper arm"
        canEdit
        saveLabel="Save as revision 2"
        saved={false}
        onSave={() =>
          Promise.reject(new ApiError(400, "bad_request:validation", "The request body is not valid.", issues))
        }
      />,
    );
    await act(async () => fireEvent.click(screen.getByRole("button", { name: "Save as revision 2" })));
    const j = arm.joints[2];
    expect(screen.getByLabelText(`${j.name} Max speed (°/s)`).getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByText(`Max speed ${issues[0].message}`)).toBeTruthy();
    const note = screen.getByLabelText("Note for this revision");
    expect(note.getAttribute("aria-invalid")).toBe("true");
    const errorId = note.getAttribute("aria-describedby")!.split(" ").at(-1)!;
    expect(document.getElementById(errorId)?.textContent).toBe(`The note ${issues[1].message}.`);
  });
});

describe("arm fields", () => {
  it("the same arm problem reads in radians in a radian form", () => {
    const bad = { ...arm, joints: arm.joints.map((joint, k) => (k === 1 ? { ...joint, min: 0.5, max: 0.2 } : joint)) };
    const rad = armProblems(bad, "rad");
    expect(rad.problems?.["joints[1].max"]).toBe("must not be below min (0.500 rad)");
    const deg = armProblems(bad, "deg");
    expect(deg.problems?.["joints[1].max"]).toBe("must not be below min (28.6°)");
  });

  it("clearing an optional limit removes it, and friction keeps its other coefficient", () => {
    const joint = { ...arm.joints[0], friction: { coulomb: 0.4, viscous: 0.1 } };
    expect("maxEffort" in withJointValue(joint, "maxEffort", undefined)).toBe(false);
    expect(withJointValue(joint, "coulomb", 0.7).friction).toEqual({ coulomb: 0.7, viscous: 0.1 });
    expect(jointValue(joint, "viscous")).toBe(0.1);
  });

  it("names a custom copy clearly and never reuses a name", () => {
    expect(customArmName("Bench arm · gripper", [])).toBe("Bench arm · gripper (custom copy)");
    expect(customArmName("Bench arm · gripper", ["Bench arm · gripper (custom copy)"])).toBe(
      "Bench arm · gripper (custom copy 2)",
    );
  });
});
