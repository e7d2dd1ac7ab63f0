import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  armFromDescription,
  check,
  closestName,
  editDistance,
  formatProblem,
  parseArm,
  parsePlan,
  parseUrdf,
  planSchema,
  samplePlan,
  type InputProblem,
  type PlanInput,
} from "@/kinematics";
import { demoArms, demoPlans } from "@/db/demo";
import { buildJsonExport, planOfExport } from "@/lib/shared/export-format";

const root = join(__dirname, "..", "..", "..", "..");
const readJson = (path: string): unknown => JSON.parse(readFileSync(join(root, path), "utf8"));
const jsonFiles = (dir: string) =>
  readdirSync(join(root, dir))
    .filter((f) => f.endsWith(".json"))
    .map((f) => `${dir}/${f}`);

/** A three-joint plan whose elbow has an acceleration limit of 1 rad/s²: the move faults with it. */
function elbowPlan(elbow: Record<string, unknown>) {
  return {
    format: "jointproof.plan",
    version: 1,
    arm: {
      name: "Three joints (invented)",
      controlRateHz: 1000,
      joints: [
        { name: "base", min: -3, max: 3, maxVelocity: 3 },
        { name: "shoulder", min: -2, max: 2, maxVelocity: 3 },
        { name: "elbow", min: -2.5, max: 2.5, maxVelocity: 3, ...elbow },
      ],
    },
    start: [0, 0, 0],
    moves: [{ goal: [0.2, 0.2, 1.2], duration: 2 }],
  };
}

function problemLines(input: unknown): string[] {
  const result = parsePlan(input);
  return result.ok ? [] : result.problems.map((p) => formatProblem(p));
}

describe("edit distance and the suggested name", () => {
  it("counts insertions, deletions and substitutions (kitten → sitting is 3: the textbook example, memory)", () => {
    expect(editDistance("kitten", "sitting")).toBe(3);
    expect(editDistance("", "abc")).toBe(3);
    expect(editDistance("abc", "abc")).toBe(0);
    expect(editDistance("maxAccelaration", "maxAcceleration")).toBe(1);
  });

  it("suggests a name that differs in letter case only, or by at most two edits, and nothing further away", () => {
    const joint = ["name", "type", "min", "max", "maxVelocity", "maxAcceleration", "maxEffort", "friction"];
    expect(closestName("MaxVelocity", joint)).toBe("maxVelocity");
    expect(closestName("MAXEFFORT", joint)).toBe("maxEffort");
    expect(closestName("maxAccelaration", joint)).toBe("maxAcceleration");
    expect(closestName("frictoin", joint)).toBe("friction"); // a transposition is two edits
    expect(closestName("maxAccel", joint)).toBeUndefined(); // seven edits
    expect(closestName("colour", joint)).toBeUndefined();
  });
});

describe("unknown fields in a plan document are refused with their path and the intended name", () => {
  it("a correctly spelt acceleration limit of 1 rad/s² faults the move (the contrast for the misspelt one)", () => {
    const parsed = parsePlan(elbowPlan({ maxAcceleration: 1 }));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    const report = check(parsed.value);
    expect(report.verdict).toBe("fault");
    expect(report.findings.some((f) => f.kind === "accel-over" && f.joint === 2)).toBe(true);
  });

  it('"maxAccelaration" on joints[2] is refused, naming "maxAcceleration", instead of checking without a limit', () => {
    const result = parsePlan(elbowPlan({ maxAccelaration: 1 }));
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.problems).toEqual<InputProblem[]>([
      {
        path: ["arm", "joints", 2, "maxAccelaration"],
        message: 'is not a known field; did you mean "maxAcceleration"?',
      },
    ]);
    expect(formatProblem(result.problems[0])).toBe(
      'arm.joints[2].maxAccelaration: is not a known field; did you mean "maxAcceleration"?',
    );
  });

  it('"keepOutt" at the top level is refused, naming "keepOut"', () => {
    const document = { ...elbowPlan({}), keepOutt: [{ min: [0.2, -0.1, 0], max: [0.4, 0.1, 0.3] }] };
    expect(problemLines(document)).toEqual(['keepOutt: is not a known field; did you mean "keepOut"?']);
  });

  it("a key with no close known name is refused with the fields that object takes", () => {
    const document = elbowPlan({});
    const moves = [{ ...document.moves[0], colour: "red" }];
    expect(problemLines({ ...document, moves })).toEqual([
      "moves[0].colour: is not a known field (known here: goal, duration, shape, target)",
    ]);
  });

  it("each unknown key of one object is its own problem, in the document's key order", () => {
    expect(problemLines(elbowPlan({ MaxVelocity: 2, maxEfort: 3 }))).toEqual([
      'arm.joints[2].MaxVelocity: is not a known field; did you mean "maxVelocity"?',
      'arm.joints[2].maxEfort: is not a known field; did you mean "maxEffort"?',
    ]);
  });

  it("unknown keys are refused at every depth of the arm model: chain, link, inertial, collision, friction, payload, keep-out, target", () => {
    const document = readJson("tests/fixtures/arm-plans/reach-out-heavy.json") as {
      arm: { chain: { joints: { link: Record<string, unknown> }[]; tool: Record<string, unknown> } };
      moves: Record<string, unknown>[];
    } & Record<string, unknown>;
    expect(parsePlan(document).ok).toBe(true);
    const bad = JSON.parse(JSON.stringify(document));
    bad.arm.joints[0].friction = { coulomb: 0.1, viscuos: 0.2 };
    bad.arm.chain.joints[1].link.inertial = { mass: 1, comm: [0, 0, 0] };
    bad.arm.chain.joints[1].link.collision = [{ kind: "sphere", center: [0, 0, 0], radius: 0.05, raduis: 1 }];
    bad.arm.chain.tool = { xyz: [0, 0, 0.1], rpyy: [0, 0, 0] };
    bad.payload = { mass: 0.2, Com: [0, 0, 0] };
    bad.keepOut = [{ nmae: "tray", min: [0.2, -0.1, 0], max: [0.4, 0.1, 0.3] }];
    bad.moves[0].target = { positon: [0.3, 0, 0.2] };
    const lines = problemLines(bad);
    expect(lines).toEqual(
      expect.arrayContaining([
        'arm.joints[0].friction.viscuos: is not a known field; did you mean "viscous"?',
        'arm.chain.joints[1].link.inertial.comm: is not a known field; did you mean "com"?',
        'arm.chain.joints[1].link.collision[0].raduis: is not a known field; did you mean "radius"?',
        'arm.chain.tool.rpyy: is not a known field; did you mean "rpy"?',
        'payload.Com: is not a known field; did you mean "com"?',
        'keepOut[0].nmae: is not a known field; did you mean "name"?',
        'moves[0].target.positon: is not a known field; did you mean "position"?',
      ]),
    );
  });

  it("an arm on its own (an arm revision, a scan's arm file) refuses a misspelt limit the same way", () => {
    const result = parseArm({ ...elbowPlan({ maxAccelaration: 1 }).arm });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.problems.map((p) => formatProblem(p))).toEqual([
      'joints[2].maxAccelaration: is not a known field; did you mean "maxAcceleration"?',
    ]);
  });
});

describe("documents the product writes still parse", () => {
  const planFixtures = [...jsonFiles("tests/fixtures/plans"), ...jsonFiles("tests/fixtures/arm-plans")].filter(
    (f) => !f.endsWith("/invalid.json") && !f.endsWith("/demo-arm.json"),
  );

  it.each(planFixtures)("the plan fixture %s parses", (file) => {
    const result = parsePlan(readJson(file));
    expect(result.ok ? [] : result.problems.map((p) => formatProblem(p))).toEqual([]);
  });

  it("the invalid fixture is still refused for its own problems, none of them an unknown field", () => {
    const lines = problemLines(readJson("tests/fixtures/plans/invalid.json"));
    expect(lines.length).toBeGreaterThan(0);
    expect(lines.filter((l) => l.includes("is not a known field"))).toEqual([]);
  });

  it.each([
    "tests/fixtures/plans/demo-arm.json",
    "tests/fixtures/recordings/demo-arm.json",
    "kinematics/arm/presets/bench-arm-l.json",
    "kinematics/arm/presets/bench-arm-h.json",
  ])("the arm file %s parses as an arm", (file) => {
    const result = parseArm(readJson(file));
    expect(result.ok ? [] : result.problems.map((p) => formatProblem(p))).toEqual([]);
  });

  it.each([
    "kinematics/arm/presets/bench-arm-l.urdf",
    "kinematics/arm/presets/bench-arm-h.urdf",
    "tests/fixtures/urdf/every-element.urdf",
  ])("the arm imported from %s (as the URDF import route builds it) parses", (file) => {
    const urdf = parseUrdf(readFileSync(join(root, file), "utf8"));
    expect(urdf.ok).toBe(true);
    if (!urdf.ok) return;
    const result = parseArm(armFromDescription(urdf.value, 500));
    expect(result.ok ? [] : result.problems.map((p) => formatProblem(p))).toEqual([]);
  });

  it("every demo plan version, built as the seed builds it, parses, and its parsed form (the stored version) parses again to itself", () => {
    for (const plan of demoPlans) {
      const arm = demoArms.find((a) => a.id === plan.armId)!.description;
      for (const version of plan.versions) {
        const stored = planSchema.parse({
          format: "jointproof.plan",
          version: 1,
          arm,
          start: version.start,
          moves: version.moves,
        });
        const again = parsePlan(JSON.parse(JSON.stringify(stored)));
        expect(again.ok ? again.value : again.problems, `${plan.name}: ${version.note}`).toEqual(stored);
      }
    }
  });

  it("a JSON export is refused by the plan schema with its block, and read as the plan it holds without it", async () => {
    const parsed = parsePlan(readJson("tests/fixtures/plans/just-long-enough.json"));
    if (!parsed.ok) throw new Error("fixture does not parse");
    const plan = parsed.value;
    const report = check(plan);
    const samples = samplePlan(plan, { rateHz: 50 });
    const json = await buildJsonExport(plan, report, samples, {
      plan: { id: "00000000-0000-4000-8000-000000000399", name: "Export probe" },
      planVersion: 1,
      savedAt: "2026-12-02T14:05:00.000Z",
      armRevision: { armId: "00000000-0000-4000-8000-000000000201", name: plan.arm.name, revision: 1 },
    });
    const exported = JSON.parse(json);
    expect(problemLines(exported)).toEqual([
      "export: is not a known field of a plan: it is the block of an export file; check an export with `jointproof check FILE` (it verifies the block), or remove the block to send the plan",
    ]);
    const back = parsePlan(planOfExport(exported));
    expect(back.ok ? back.value : back.problems).toEqual(plan);
  });
});

/** A small valid plan document with every optional object of the arm model, drawn at random. */
const validPlanArb: fc.Arbitrary<PlanInput> = fc
  .record({
    jointCount: fc.integer({ min: 1, max: 4 }),
    moveCount: fc.integer({ min: 0, max: 3 }),
    friction: fc.boolean(),
    chain: fc.boolean(),
    payload: fc.boolean(),
    keepOut: fc.boolean(),
    target: fc.boolean(),
    seed: fc.double({ min: 0.1, max: 0.9, noNaN: true }),
  })
  .map(({ jointCount, moveCount, friction, chain, payload, keepOut, target, seed }) => {
    const joints = Array.from({ length: jointCount }, (_, j) => ({
      name: `j${j}`,
      type: "revolute" as const,
      min: -2 - seed,
      max: 2 + seed,
      maxVelocity: 1 + seed,
      maxAcceleration: 5 + seed,
      ...(friction ? { friction: { coulomb: seed, viscous: seed / 2 } } : {}),
    }));
    const pose = (k: number) => joints.map((_, j) => ((k + j) % 3) * seed - seed);
    const arm = {
      name: "Random arm (invented)",
      controlRateHz: 1000,
      cautionRatio: 0.9,
      joints,
      ...(chain
        ? {
            chain: {
              base: { name: "base", collision: [{ kind: "sphere" as const, center: [0, 0, 0.05], radius: 0.05 }] },
              joints: joints.map(() => ({
                origin: { xyz: [0, 0, 0.1], rpy: [0, 0, 0] },
                axis: [0, 0, 1],
                link: {
                  inertial: { mass: seed, com: [0, 0, 0.05], inertia: { ixx: 0.001, iyy: 0.001, izz: 0.001 } },
                  collision: [{ kind: "capsule" as const, from: [0, 0, 0], to: [0, 0, 0.1], radius: 0.02 }],
                },
              })),
              tool: { xyz: [0, 0, 0.05], rpy: [0, 0, 0] },
              gravity: [0, 0, -9.81],
            },
          }
        : {}),
    };
    return {
      format: "jointproof.plan",
      version: 1,
      arm,
      start: pose(0),
      moves: Array.from({ length: moveCount }, (_, k) => ({
        goal: pose(k + 1),
        duration: 1 + k,
        shape: "cubic" as const,
        ...(target ? { target: { position: [0.1, 0, 0.3], rpy: [0, 0, 0] } } : {}),
      })),
      ...(payload ? { payload: { mass: seed, com: [0, 0, 0.01] } } : {}),
      ...(keepOut ? { keepOut: [{ name: "box", min: [1, 1, 0], max: [1.5, 1.5, 0.5] }] } : {}),
      surfaceMargin: 0.01,
    } as PlanInput;
  });

/** Field paths of every plain object in a JSON value (the document itself is `[]`). */
function objectPaths(value: unknown, path: (string | number)[] = []): (string | number)[][] {
  if (Array.isArray(value)) return value.flatMap((v, i) => objectPaths(v, [...path, i]));
  if (typeof value !== "object" || value === null) return [];
  return [path, ...Object.entries(value).flatMap(([k, v]) => objectPaths(v, [...path, k]))];
}

function objectAt(document: unknown, path: (string | number)[]): Record<string, unknown> {
  return path.reduce<unknown>((v, k) => (v as Record<string | number, unknown>)[k], document) as Record<
    string,
    unknown
  >;
}

describe("property: one unknown key anywhere is refused at its own path", () => {
  it("every drawn plan parses, and its parsed form (what a saved version stores) parses again to itself", () => {
    fc.assert(
      fc.property(validPlanArb, (document) => {
        const first = parsePlan(document);
        expect(first.ok ? [] : first.problems).toEqual([]);
        if (!first.ok) return;
        const again = parsePlan(JSON.parse(JSON.stringify(first.value)));
        expect(again.ok ? again.value : again.problems).toEqual(first.value);
      }),
      { numRuns: 60 },
    );
  });

  it("adding one key no schema knows, at a random object of a valid plan, refuses the plan with exactly that path", () => {
    fc.assert(
      fc.property(
        validPlanArb,
        fc.nat(),
        // an underscore and a digit: no field of any schema is spelt like this
        fc.stringMatching(/^[a-z]{1,6}_[0-9]$/),
        (document, pick, key) => {
          const paths = objectPaths(document);
          const at = paths[pick % paths.length];
          const bad = JSON.parse(JSON.stringify(document));
          objectAt(bad, at)[key] = 1;
          const result = parsePlan(bad);
          expect(result.ok).toBe(false);
          if (result.ok) return;
          expect(result.problems).toHaveLength(1);
          expect(result.problems[0].path).toEqual([...at, key]);
          expect(result.problems[0].message).toMatch(/^is not a known field/);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("a one-letter misspelling of a key at a random object is refused there and names a known key one edit away", () => {
    fc.assert(
      fc.property(validPlanArb, fc.nat(), fc.nat(), fc.constantFrom(..."qxzw"), (document, pick, where, letter) => {
        const paths = objectPaths(document).filter((p) => Object.keys(objectAt(document, p)).length > 0);
        const at = paths[pick % paths.length];
        const bad = JSON.parse(JSON.stringify(document));
        const target = objectAt(bad, at);
        // the collision shape's `kind` picks the shape, so without it zod refuses at `kind` instead (tested above)
        const keys = Object.keys(target).filter((k) => k !== "kind");
        fc.pre(keys.length > 0);
        const original = keys[where % keys.length];
        const cut = where % (original.length + 1);
        const misspelt = original.slice(0, cut) + letter + original.slice(cut);
        target[misspelt] = target[original];
        delete target[original];
        const result = parsePlan(bad);
        expect(result.ok).toBe(false);
        if (result.ok) return;
        const problem = result.problems.find((p) => p.path.at(-1) === misspelt);
        expect(problem?.path).toEqual([...at, misspelt]);
        const suggested = /did you mean "([^"]+)"\?$/.exec(problem?.message ?? "")?.[1];
        expect(suggested).toBeDefined();
        expect(editDistance(misspelt.toLowerCase(), suggested!.toLowerCase())).toBeLessThanOrEqual(1);
      }),
      { numRuns: 200 },
    );
  });
});
