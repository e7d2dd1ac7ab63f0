import { describe, expect, it } from "vitest";
import { check, defaultMoveCheckers, type MoveChecker } from "@/kinematics";
import { parsePlan, type Plan } from "@/kinematics";

/** |actual − expected| within abs + rel·|expected|. */
function expectClose(actual: number | null, expected: number, rel = 1e-12, abs = 1e-12): void {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(abs + rel * Math.abs(expected));
}

interface JointInput {
  name?: string;
  type?: string;
  min?: number;
  max?: number;
  maxVelocity?: number;
  maxAcceleration?: number;
}

function planOf(
  joints: JointInput[],
  start: number[],
  moves: { goal: number[]; duration: number; shape?: string }[],
  arm: { controlRateHz?: number; cautionRatio?: number } = {},
): Plan {
  const result = parsePlan({
    format: "jointproof.plan",
    version: 1,
    arm: {
      name: "Test arm",
      controlRateHz: arm.controlRateHz ?? 1000,
      ...(arm.cautionRatio === undefined ? {} : { cautionRatio: arm.cautionRatio }),
      joints: joints.map((j, i) => ({ name: `j${i}`, min: -3, max: 3, maxVelocity: 3.1, ...j })),
    },
    start,
    moves,
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

describe("check: peaks", () => {
  it("peakVelocity is the largest |q̇| over the move (quintic 1.875·D/T, cubic 1.5·D/T)", () => {
    const report = check(
      planOf(
        [{ maxAcceleration: 20 }, {}],
        [0, 0],
        [
          { goal: [1.2, -0.4], duration: 2, shape: "quintic" },
          { goal: [0, 0.4], duration: 4, shape: "cubic" },
        ],
      ),
    );
    expectClose(report.moves[0].peakVelocity[0], (1.875 * 1.2) / 2);
    expectClose(report.moves[0].peakVelocity[1], (1.875 * 0.4) / 2);
    expectClose(report.moves[1].peakVelocity[0], (1.5 * 1.2) / 4);
    expectClose(report.moves[1].peakAcceleration[1], (6 * 0.8) / 16);
  });

  it("an instant move's peak velocity is |Δq| × control rate and its peak acceleration is null", () => {
    const report = check(planOf([{}, {}], [0.1, 0], [{ goal: [0.102, -0.001], duration: 0 }], { controlRateHz: 500 }));
    expectClose(report.moves[0].peakVelocity[0], 0.002 * 500, 1e-9);
    expectClose(report.moves[0].peakVelocity[1], 0.001 * 500, 1e-9);
    expect(report.moves[0].peakAcceleration).toEqual([null, null]);
  });

  it("a zero-length move has zero peaks, zero shortest safe duration and passes", () => {
    const report = check(
      planOf(
        [{ maxAcceleration: 1 }],
        [0.5],
        [
          { goal: [0.5], duration: 1 },
          { goal: [0.5], duration: 0 },
        ],
      ),
    );
    expect(report.moves[0].peakVelocity).toEqual([0]);
    expect(report.moves[0].peakAcceleration).toEqual([0]);
    expect(report.moves[0].minSafeDuration).toBe(0);
    expect(report.moves[1].peakVelocity).toEqual([0]);
    expect(report.verdict).toBe("pass");
  });

  it("each move starts where the previous one ended", () => {
    const report = check(
      planOf(
        [{}],
        [0],
        [
          { goal: [1], duration: 2 },
          { goal: [1.5], duration: 2 },
        ],
      ),
    );
    expectClose(report.moves[1].peakVelocity[0], (1.875 * 0.5) / 2);
  });
});

describe("check: findings", () => {
  it("a start value outside travel is a range fault with move null", () => {
    const report = check(planOf([{ min: -1, max: 1 }], [1.5], [{ goal: [0.5], duration: 5 }]));
    expect(report.findings).toHaveLength(1);
    expect(report.findings[0]).toMatchObject({
      kind: "range",
      severity: "fault",
      move: null,
      joint: 0,
      value: 1.5,
      limit: 1,
    });
    expect(report.verdict).toBe("fault");
  });

  it("a goal outside travel is a range fault on that move", () => {
    const report = check(
      planOf(
        [{}, { min: 0, max: 0.04, type: "prismatic", maxVelocity: 0.1 }],
        [0, 0.02],
        [
          { goal: [0, 0.02], duration: 1 },
          { goal: [0, -0.01], duration: 2 },
        ],
      ),
    );
    expect(report.findings.map((f) => [f.kind, f.move, f.joint, f.limit])).toEqual([["range", 1, 1, 0]]);
    expect(report.moves[1].findings).toHaveLength(1);
    expect(report.moves[0].findings).toHaveLength(0);
  });

  it("a goal exactly at the end of travel passes", () => {
    const report = check(planOf([{ min: -1, max: 1 }], [-1], [{ goal: [1], duration: 10 }]));
    expect(report.verdict).toBe("pass");
  });

  it("peak speed equal to the limit passes (cubic D = 2, T = 1, limit 3)", () => {
    const report = check(
      planOf([{ maxVelocity: 3 }], [0], [{ goal: [2], duration: 1, shape: "cubic" }], { cautionRatio: 1 }),
    );
    expectClose(report.moves[0].peakVelocity[0], 3);
    expect(report.findings).toEqual([]);
    expect(report.verdict).toBe("pass");
  });

  it("peak speed above the limit is a speed-over fault with the fix duration in the message", () => {
    const report = check(
      planOf([{ name: "elbow", maxVelocity: 2.9 }], [0], [{ goal: [2], duration: 1, shape: "cubic" }]),
    );
    const finding = report.findings[0];
    expect(finding).toMatchObject({ kind: "speed-over", severity: "fault", move: 0, joint: 0, limit: 2.9 });
    expectClose(finding.value, 3);
    const minSafe = report.moves[0].minSafeDuration!;
    expectClose(minSafe, (1.5 * 2) / 2.9);
    expect(finding.message).toContain('joint "elbow"');
    expect(finding.message).toContain("3 rad/s");
    expect(finding.message).toContain("2.9 rad/s");
    expect(finding.message).toContain(`${Math.ceil(minSafe * 1000) / 1000} s`);
  });

  it("peak speed above cautionRatio × limit and not above the limit is a caution", () => {
    const report = check(planOf([{ maxVelocity: 3.2 }], [0], [{ goal: [2], duration: 1, shape: "cubic" }]));
    expect(report.findings.map((f) => [f.kind, f.severity])).toEqual([["speed-over", "caution"]]);
    expect(report.verdict).toBe("caution");
  });

  it("peak speed equal to cautionRatio × limit is no caution", () => {
    // cubic peak 1.5·D/T = 2.7 = 0.9 × 3
    const report = check(planOf([{ maxVelocity: 3 }], [0], [{ goal: [1.8], duration: 1, shape: "cubic" }]));
    expect(report.verdict).toBe("pass");
  });

  it("an instant move larger than one control period's travel is a jump fault", () => {
    const report = check(planOf([{ name: "base" }], [0], [{ goal: [0.5], duration: 0 }]));
    expect(report.findings).toHaveLength(1);
    expect(report.findings[0]).toMatchObject({ kind: "jump", severity: "fault", move: 0, joint: 0, limit: 3.1 });
    expectClose(report.findings[0].value, 500, 1e-9);
    expect(report.findings[0].message).toContain("jump-too-far");
  });

  // common practice: a small step within one control period is accepted by the controller
  it("an instant step within one control period passes, and one at exactly the period's travel is a caution, not a fault", () => {
    const small = check(planOf([{ maxVelocity: 3 }], [0], [{ goal: [0.001], duration: 0 }]));
    expect(small.verdict).toBe("pass");
    const atLimit = check(planOf([{ maxVelocity: 4 }], [0], [{ goal: [0.004], duration: 0 }]));
    expect(atLimit.findings.map((f) => [f.kind, f.severity])).toEqual([["jump", "caution"]]);
  });

  it("peak acceleration above maxAcceleration is an accel-over fault; without maxAcceleration nothing is checked", () => {
    const withLimit = check(
      planOf([{ maxVelocity: 100, maxAcceleration: 5 }], [0], [{ goal: [1], duration: 1, shape: "cubic" }]),
    );
    expect(withLimit.findings.map((f) => [f.kind, f.severity, f.value, f.limit])).toEqual([
      ["accel-over", "fault", 6, 5],
    ]);
    const withoutLimit = check(planOf([{ maxVelocity: 100 }], [0], [{ goal: [1], duration: 1, shape: "cubic" }]));
    expect(withoutLimit.verdict).toBe("pass");
  });

  it("peak acceleration equal to maxAcceleration passes", () => {
    const report = check(
      planOf([{ maxVelocity: 100, maxAcceleration: 6 }], [0], [{ goal: [1], duration: 1, shape: "cubic" }], {
        cautionRatio: 1,
      }),
    );
    expect(report.verdict).toBe("pass");
  });

  it("an instant move gets no accel-over finding", () => {
    const report = check(planOf([{ maxVelocity: 1000, maxAcceleration: 0.001 }], [0], [{ goal: [0.5], duration: 0 }]));
    expect(report.findings.filter((f) => f.kind === "accel-over")).toEqual([]);
  });

  it("the verdict is fault if any finding is a fault, else caution if any is a caution", () => {
    const plan = planOf(
      [{ maxVelocity: 3.2 }],
      [0],
      [
        { goal: [2], duration: 1, shape: "cubic" },
        { goal: [0], duration: 0 },
      ],
    );
    const report = check(plan);
    expect(report.findings.map((f) => f.severity)).toEqual(["caution", "fault"]);
    expect(report.verdict).toBe("fault");
  });
});

describe("check: shortest safe duration", () => {
  it("is the larger of the speed and acceleration bounds over the joints", () => {
    // quintic D = 1.2: speed bound 1.875·1.2/3.1, acceleration bound √((10/√3)·1.2/20)
    const report = check(
      planOf(
        [{ maxAcceleration: 20 }, { maxVelocity: 1, maxAcceleration: 0.5 }],
        [0, 0],
        [{ goal: [1.2, 0.1], duration: 3 }],
      ),
    );
    const speedBound = (1.875 * 1.2) / 3.1;
    const accelBound = Math.sqrt(((10 / Math.sqrt(3)) * 0.1) / 0.5);
    expectClose(report.moves[0].minSafeDuration, Math.max(speedBound, accelBound), 1e-12);
  });

  it("is given for an instant move with its shape, and named in the jump message", () => {
    const report = check(planOf([{ maxVelocity: 2 }], [0], [{ goal: [1], duration: 0, shape: "cubic" }]));
    expectClose(report.moves[0].minSafeDuration, 1.5 / 2);
    expect(report.findings[0].message).toContain("0.75 s");
  });
});

describe("check: report shape and extension", () => {
  it("has exactly the documented keys (issue 3's, plus each finding's timeS)", () => {
    const report = check(planOf([{}], [0], [{ goal: [3.5], duration: 1 }]));
    expect(Object.keys(report).sort()).toEqual(["findings", "moves", "verdict"]);
    expect(Object.keys(report.moves[0]).sort()).toEqual(
      ["duration", "findings", "index", "minSafeDuration", "peakAcceleration", "peakVelocity", "shape"].sort(),
    );
    expect(Object.keys(report.findings[0]).sort()).toEqual(
      ["joint", "kind", "limit", "message", "move", "severity", "timeS", "value"].sort(),
    );
    expect(JSON.parse(JSON.stringify(report))).toEqual(report);
  });

  it("runs extra move checkers and counts their findings in the verdict", () => {
    const effortChecker: MoveChecker = ({ index, peakVelocity }, out) => {
      if (peakVelocity[0] > 0.5) {
        out.push({
          kind: "effort-over",
          severity: "caution",
          move: index,
          joint: 0,
          value: peakVelocity[0],
          limit: 0.5,
          message: "test",
        });
      }
    };
    const plan = planOf([{}], [0], [{ goal: [1], duration: 2 }]);
    expect(check(plan).verdict).toBe("pass");
    const report = check(plan, { moveCheckers: [...defaultMoveCheckers, effortChecker] });
    expect(report.verdict).toBe("caution");
    expect(report.moves[0].findings.map((f) => f.kind)).toEqual(["effort-over"]);
  });
});
