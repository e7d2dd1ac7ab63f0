import { describe, expect, it } from "vitest";
import { formatPath, formatProblem, homePose, parseArm, parsePlan, planSchema } from "@/kinematics";

const validDocument = {
  format: "jointproof.plan",
  version: 1,
  arm: {
    name: "Demo arm",
    controlRateHz: 1000,
    cautionRatio: 0.9,
    joints: [{ name: "base", type: "revolute", min: -3.0, max: 3.0, maxVelocity: 3.1, maxAcceleration: 20 }],
  },
  start: [0.0],
  moves: [{ goal: [1.2], duration: 2.0, shape: "quintic" }],
};

function clone<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T;
}

function problemsOf(document: unknown): string[] {
  const result = parsePlan(document);
  if (result.ok) return [];
  return result.problems.map((p) => formatProblem(p));
}

describe("plan document v1", () => {
  it("accepts the example document from the issue", () => {
    const result = parsePlan(validDocument);
    expect(result.ok).toBe(true);
  });

  it("fills the documented defaults: type revolute, cautionRatio 0.9, shape quintic", () => {
    const document = clone(validDocument) as Record<string, unknown> & typeof validDocument;
    const arm = document.arm as Record<string, unknown>;
    delete arm.cautionRatio;
    delete (document.arm.joints[0] as Record<string, unknown>).type;
    delete (document.arm.joints[0] as Record<string, unknown>).maxAcceleration;
    delete (document.moves[0] as Record<string, unknown>).shape;
    const parsed = planSchema.parse(document);
    expect(parsed.arm.cautionRatio).toBe(0.9);
    expect(parsed.arm.joints[0].type).toBe("revolute");
    expect(parsed.arm.joints[0].maxAcceleration).toBeUndefined();
    expect(parsed.moves[0].shape).toBe("quintic");
  });

  it("names the field path of a limit that is not greater than zero", () => {
    const document = clone(validDocument);
    document.arm.joints.push({
      name: "shoulder",
      type: "revolute",
      min: -1,
      max: 1,
      maxVelocity: -2,
      maxAcceleration: 5,
    });
    document.start = [0, 0];
    document.moves[0].goal = [1.2, 0];
    expect(problemsOf(document)).toEqual(["arm.joints[1].maxVelocity: must be greater than 0"]);
  });

  it("refuses a pose of the wrong length", () => {
    const document = clone(validDocument);
    document.moves[0].goal = [1.2, 0.5];
    expect(problemsOf(document)).toEqual(["moves[0].goal: must have 1 value, one per joint (has 2)"]);
  });

  it("refuses min above max", () => {
    const document = clone(validDocument);
    document.arm.joints[0].min = 2;
    document.arm.joints[0].max = 1;
    expect(problemsOf(document)).toEqual(["arm.joints[0].max: must not be below min (2)"]);
  });

  it("refuses negative durations and negative limits", () => {
    const document = clone(validDocument);
    document.moves[0].duration = -0.5;
    document.arm.joints[0].maxAcceleration = -1;
    expect(problemsOf(document).sort()).toEqual([
      "arm.joints[0].maxAcceleration: must be greater than 0",
      "moves[0].duration: must be 0 or greater",
    ]);
  });

  it("refuses unknown shapes", () => {
    const document = clone(validDocument) as { moves: { shape: string }[] };
    document.moves[0].shape = "zigzag";
    expect(problemsOf(document)).toEqual(['moves[0].shape: must be one of "cubic", "quintic", "trapezoid"']);
  });

  it("refuses non-numbers and reports every problem, not only the first", () => {
    const document = clone(validDocument) as unknown as { start: unknown[]; arm: { controlRateHz: unknown } };
    document.start = ["zero"];
    document.arm.controlRateHz = "fast";
    expect(problemsOf(document).sort()).toEqual(["arm.controlRateHz: must be a number", "start[0]: must be a number"]);
  });

  it("still reports a pose-length problem when another field is also wrong", () => {
    const document = clone(validDocument);
    document.moves[0].duration = -1;
    document.start = [0, 0];
    expect(problemsOf(document).sort()).toEqual([
      "moves[0].duration: must be 0 or greater",
      "start: must have 1 value, one per joint (has 2)",
    ]);
  });

  it("refuses another format or version", () => {
    const document = { ...clone(validDocument), format: "other", version: 2 };
    expect(problemsOf(document).sort()).toEqual([
      'format: must be "jointproof.plan"',
      "version: must be 1 (the only version this checker reads)",
    ]);
  });

  it("refuses a document that is not an object", () => {
    expect(problemsOf(null)).toEqual(["(document): must be an object (a plan document)"]);
  });

  it("refuses repeated joint names (recording columns are matched by name)", () => {
    const result = parseArm({
      name: "A",
      controlRateHz: 500,
      joints: [
        { name: "a", min: 0, max: 1, maxVelocity: 1 },
        { name: "a", min: 0, max: 1, maxVelocity: 1 },
      ],
    });
    expect(result.ok).toBe(false);
    if (!result.ok)
      expect(result.problems).toEqual([
        {
          path: ["joints", 1, "name"],
          message: 'repeats the name "a" of an earlier joint (joints[0]); give each joint its own name',
        },
      ]);
  });

  it("formats nested paths with list indexes in brackets", () => {
    expect(formatPath(["arm", "joints", 1, "maxVelocity"])).toBe("arm.joints[1].maxVelocity");
    expect(formatPath(["moves", 3, "goal", 0])).toBe("moves[3].goal[0]");
    expect(formatPath([])).toBe("(document)");
    expect(formatPath([], "(body)")).toBe("(body)");
  });
});

describe("home pose", () => {
  // The project's own rest pose (no published source): 0 where 0 is inside the travel, else mid-travel.
  it("puts a joint at 0 when 0 is inside its travel, at either end of it, and mid-travel otherwise", () => {
    const joints = [
      { min: -1, max: 1 },
      { min: 0, max: 2 },
      { min: -2, max: 0 },
      { min: 0.2, max: 0.6 },
      { min: -0.6, max: -0.2 },
    ];
    const home = homePose({ joints });
    expect(home.slice(0, 3)).toEqual([0, 0, 0]);
    expect(home[3]).toBeCloseTo(0.4, 12);
    expect(home[4]).toBeCloseTo(-0.4, 12);
  });
});
