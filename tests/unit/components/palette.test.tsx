// @vitest-environment happy-dom
import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import armH from "@/kinematics/arm/presets/bench-arm-h.json";
import { Playhead, PlayheadContext } from "@/components/editor/playhead";
import { JointPlots, quantityTitle } from "@/components/plots/joint-plots";
import { jointColor, jointColors } from "@/components/plots/joint-colors";
import { verdictLook } from "@/components/ui/verdict-chip";
import { ghostColors, keepOutColors, severityColors, toolPathColor } from "@/components/viewer/colors";
import { touchedKeepOut } from "@/components/viewer/keep-out";
import { armSchema, clearanceZones, sampleTimeline, timelineOf, type Finding, type KeepOutBox } from "@/kinematics";
import { demoPlan } from "./helpers";

afterEach(cleanup);

/**
 * CIE 1976 L*a*b* from an sRGB hex colour (D65 white): the sRGB transfer curve and matrix of
 * IEC 61966-2-1, then the CIE L*a*b* formulas (CIE 15:2004, Colorimetry, §8.2.1 — memory).
 */
function lab(hex: string): [number, number, number] {
  const n = parseInt(hex.slice(1), 16);
  const [r, g, b] = [(n >> 16) & 255, (n >> 8) & 255, n & 255].map((v) => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  const x = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
  const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  return [116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))];
}

/** ΔE*ab, the CIE 1976 colour difference: the distance in L*a*b* (CIE 15:2004 — memory). */
function deltaE(a: string, b: string): number {
  const [p, q] = [lab(a), lab(b)];
  return Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]);
}

// Our own threshold (common practice, no published source): a ΔE*ab of 20 or more reads as a different
// colour at a glance; about 2.3 is only just noticeable (memory).
const APART = 20;

describe("the joint palette stays apart from the colours that mean something", () => {
  const meaning: Record<string, string> = {
    "fault (text, plots)": verdictLook.fault.stroke,
    "caution (text, plots)": verdictLook.caution.stroke,
    "pass (text, plots)": verdictLook.pass.stroke,
    "fault (3D view)": severityColors.fault,
    "caution (3D view)": severityColors.caution,
    "start ghost": ghostColors.start,
    "goal ghost": ghostColors.goal,
    "tool path and playhead": toolPathColor,
    "touched keep-out box": keepOutColors.touched.fill,
  };

  it("the CIE 1976 colour difference matches hand-derived values (black to white is 100; a colour to itself 0)", () => {
    // derived: L* of white is 100 and of black 0, with a* = b* = 0 for both under D65
    expect(deltaE("#000000", "#ffffff")).toBeCloseTo(100, 3);
    expect(deltaE("#1f6f86", "#1f6f86")).toBe(0);
    // derived: pure sRGB red is L* 53.24, a* 80.09, b* 67.20 (IEC 61966-2-1 primaries, D65)
    const red = lab("#ff0000");
    expect(red[0]).toBeCloseTo(53.24, 1);
    expect(red[1]).toBeCloseTo(80.09, 1);
    expect(red[2]).toBeCloseTo(67.2, 1);
  });

  it("no joint colour equals, or comes within ΔE 20 of, a verdict, ghost, tool-path or keep-out colour", () => {
    for (const joint of jointColors) {
      for (const [name, colour] of Object.entries(meaning)) {
        expect(joint.toLowerCase(), `${joint} vs ${name}`).not.toBe(colour.toLowerCase());
        expect(deltaE(joint, colour), `${joint} vs ${name} (${colour})`).toBeGreaterThanOrEqual(APART);
      }
    }
  });

  it("the joints of the six-joint demo arms plus gripper all get different colours", () => {
    const n = armH.joints.length;
    expect(new Set(Array.from({ length: n }, (_, j) => jointColor(j))).size).toBe(n);
  });

  it("a keep-out box nothing touches is neutral, not the fault colour", () => {
    for (const colour of [keepOutColors.neutral.fill, keepOutColors.neutral.edge]) {
      for (const verdict of [verdictLook.fault.stroke, verdictLook.caution.stroke, severityColors.caution])
        expect(deltaE(colour, verdict)).toBeGreaterThanOrEqual(APART);
    }
  });
});

describe("keep-out boxes turn to the fault colour only when a clearance finding names them", () => {
  const boxes: KeepOutBox[] = [
    { name: "parts tray", min: [0.2, -0.1, 0], max: [0.3, 0.1, 0.1] },
    { min: [-0.3, -0.1, 0], max: [-0.2, 0.1, 0.1] },
  ];
  const clearance = (zone: string): Finding =>
    ({
      kind: "clearance",
      severity: "fault",
      move: 0,
      joint: null,
      value: 0.01,
      limit: 0,
      message: "",
      link: "forearm",
      zone,
      time: 0.5,
      timeS: 0.5,
    }) as Finding;

  it("marks none without findings, the named box for its finding, and an unnamed box by the engine's fallback name", () => {
    expect(touchedKeepOut(boxes, [])).toEqual([false, false]);
    expect(touchedKeepOut(boxes, [clearance("parts tray")])).toEqual([true, false]);
    expect(touchedKeepOut(boxes, [clearance("work surface")])).toEqual([false, false]);
  });

  it("an unnamed box is marked when the engine's own finding names it", () => {
    const name = clearanceZones(0, boxes).boxNames[1];
    expect(touchedKeepOut(boxes, [clearance(name)])).toEqual([false, true]);
    // and a finding of another kind never marks a box
    const speed = { ...clearance(name), kind: "speed-over" } as Finding;
    expect(touchedKeepOut(boxes, [speed])).toEqual([false, false]);
  });
});

describe("the joint plots", () => {
  const plan = demoPlan([{ goal: [0.6, -0.3, 0.4, 0, 0, 0, 0], duration: 1.5 }]);
  const arm = armSchema.parse(plan.arm);
  const samples = sampleTimeline(timelineOf(plan), 200);

  function renderPlots(selected: number[]) {
    render(
      <PlayheadContext.Provider value={new Playhead()}>
        <JointPlots
          samples={samples}
          joints={arm.joints}
          cautionRatio={0.9}
          unit="deg"
          selectedJoints={selected}
          onSelectedJointsChange={() => {}}
          markers={[]}
        />
      </PlayheadContext.Provider>,
    );
  }

  it("say Speed, never Velocity, and give each chart at least 120 px", () => {
    renderPlots([0, 1]);
    const figures = screen.getAllByRole("figure");
    expect(figures.map((f) => f.getAttribute("aria-label"))).toEqual([
      "Position (°) against time",
      "Speed (°/s) against time",
      "Acceleration (°/s²) against time",
    ]);
    expect(document.body.textContent).not.toMatch(/velocity/i);
    const boxes = screen.getAllByTestId("plot-box");
    expect(boxes).toHaveLength(3);
    for (const box of boxes) expect(parseFloat(box.style.height)).toBeGreaterThanOrEqual(120);
  });

  it("call effort torque for revolute joints and force for prismatic ones", () => {
    expect(quantityTitle("effort", ["revolute", "revolute"])).toBe("Torque");
    expect(quantityTitle("effort", ["prismatic"])).toBe("Force");
    expect(quantityTitle("effort", ["revolute", "prismatic"])).toBe("Torque and force");
    expect(quantityTitle("velocity", ["revolute"])).toBe("Speed");
  });
});
