import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { chainLimits, compileChain, createChainBuffers, forwardKinematics } from "@/kinematics/arm/chain";
import { rotationErrorVector, solveIk, solveLinear } from "@/kinematics/arm/ik";
import { resolveCartesianGoals } from "@/kinematics/plan/targets";
import * as mat4 from "@/kinematics/arm/mat4";
import { parseArm, parsePlan, type Arm } from "@/kinematics";
import { readJson } from "./helpers";
import { expectClose } from "../tolerance";

const armL = parseArm(readJson("kinematics/arm/presets/bench-arm-l.json"));
if (!armL.ok) throw new Error("demo arm L does not parse");
const arm: Arm = armL.value;
const chain = compileChain(
  arm.chain!,
  arm.joints.map((j) => j.type),
);
const { lower, upper } = chainLimits(arm.joints, chain.jointCount);
// uniform on a fine grid inside 90% of the travel (fc.double favours tiny and extreme values)
const within = (lo: number, hi: number) =>
  fc.integer({ min: 0, max: 1_000_000 }).map((k) => lo + ((hi - lo) * k) / 1_000_000);
const poseArb = fc.tuple(...Array.from({ length: 6 }, (_, i) => within(lower[i] * 0.9, upper[i] * 0.9)));

/** A recorded failing draw (pose q, seed) in the shape of the property's arguments (q, seed − q). */
function regression(q: number[], seed: number[]): [number[], number[]] {
  return [q, seed.map((v, i) => v - q[i])];
}

function toolOf(q: ArrayLike<number>) {
  const t = forwardKinematics(chain, q, createChainBuffers(chain));
  return {
    m: Float64Array.from(t),
    position: [t[12], t[13], t[14]] as [number, number, number],
    rpy: mat4.toRpy([0, 0, 0], t) as [number, number, number],
  };
}

describe("inverse kinematics (damped least squares)", () => {
  it("FK(IK(FK(q))) reaches the position and orientation of FK(q) for random reachable poses, within the joint travel", () => {
    fc.assert(
      fc.property(poseArb, fc.array(within(-0.3, 0.3), { minLength: 6, maxLength: 6 }), (q, noise) => {
        const target = toolOf(q);
        const seed = q.map((v, i) => Math.min(upper[i], Math.max(lower[i], v + noise[i])));
        const r = solveIk(chain, { position: target.position, rpy: target.rpy }, { seed, lower, upper });
        expect(r.reachable, `errors ${r.positionErrorM} m, ${r.orientationErrorRad} rad`).toBe(true);
        r.pose.forEach((v, i) => expect(v >= lower[i] && v <= upper[i], `joint ${i} = ${v}`).toBe(true));
        const back = toolOf(r.pose);
        for (let k = 0; k < 3; k++) expectClose(back.position[k], target.position[k], 1e-4, 0, `p${k}`);
        const w = rotationErrorVector(new Float64Array(3), target.m, back.m);
        expect(Math.hypot(w[0], w[1], w[2])).toBeLessThan(1e-3);
      }),
      {
        numRuns: 60,
        // Draws this property once failed on (about 1 in 3000; kept so they are tried on every run).
        // 1: wrist-roll near π/2 puts the wrist-pitch and wrist-yaw axes almost parallel; the solver
        //    stalled on the wrist-pitch limit 0.6 mm away. 2–3: the seed rests on the shoulder limit
        //    and the solver stalled there, 0.2 mm and 2.3 mm away, with restarts only over the whole travel.
        examples: [
          regression(
            [
              -0.9694815838756039, -1.2472875081840904, 2.161004309998825, -0.8280443429248407, 1.5834960706019778,
              -1.6859038975881413,
            ],
            [
              -0.8905640678526833, -1.2184611226804556, 2.022514050817117, -0.9190587290329859, 1.7988434390584012,
              -1.4236069624638186,
            ],
          ),
          regression(
            [-0.429560233494267, 1.62, 0.19667980976169908, -1.71, 2.745, 2.61],
            [-0.12956023349426699, 1.8, -0.04052676770137642, -1.9, 2.741316118631512, 2.31],
          ),
          regression(
            [2.614707509397995, 1.62, 0.25950629363302125, 0.761430215165019, 2.745, 2.39040701766964],
            [2.4272238179272976, 1.8, -0.04049370636697874, 1.061430215165019, 2.4874837733153257, 2.69040701766964],
          ),
        ],
      },
    );
  });

  it("position-only targets converge from the middle of the travel (restarts allowed)", () => {
    fc.assert(
      fc.property(poseArb, (q) => {
        const target = toolOf(q);
        const r = solveIk(chain, { position: target.position }, { lower, upper });
        expect(r.reachable).toBe(true);
        const back = toolOf(r.pose);
        expect(
          Math.hypot(
            back.position[0] - target.position[0],
            back.position[1] - target.position[1],
            back.position[2] - target.position[2],
          ),
        ).toBeLessThan(1e-4);
      }),
      { numRuns: 40 },
    );
  });

  it("a target beyond the arm's reach is reported unreachable with the remaining distance", () => {
    // Reach from the shoulder axis (z = 0.16 m) is 0.28 + 0.25 + 0.06 + 0.05 + 0.10 = 0.74 m (the demo arm's lengths).
    const r = solveIk(chain, { position: [2, 0, 0.16] }, { lower, upper });
    expect(r.reachable).toBe(false);
    expectClose(r.positionErrorM, 2 - 0.74, 1e-3, 0, "distance left");
  });

  it("an orientation the wrist cannot take at that point is unreachable, while the point alone is reachable", () => {
    // At pose 0 the demo arm stands straight up with the tool point at z = 0.9 m, tool z axis up.
    // 2 cm below that, the tool turned upside down (roll π) would need the 0.10 m tool and the
    // wrist folded back inside a nearly straight arm. (Before the orientation rows were weighted,
    // this test used "straight down above the base", which the solver now shows is reachable.)
    const r = solveIk(chain, { position: [0, 0, 0.88], rpy: [Math.PI, 0, 0] }, { lower, upper, restarts: 3 });
    expect(r.reachable).toBe(false);
    expect(r.orientationErrorRad).toBeGreaterThan(1e-3);
    const p = solveIk(chain, { position: [0, 0, 0.88] }, { lower, upper });
    expect(p.reachable).toBe(true);
  });

  it("rotationErrorVector returns θ·axis for a rotation of θ about an axis, including θ = π", () => {
    // Matrix logarithm, Lynch & Park, Modern Robotics (2017), §3.2.3.3.
    for (const theta of [0.3, 2.5, Math.PI]) {
      const axis = [1 / Math.sqrt(3), 1 / Math.sqrt(3), -1 / Math.sqrt(3)];
      const target = mat4.fromAxisAngle(new Float64Array(16), axis, theta);
      const w = rotationErrorVector(new Float64Array(3), target, mat4.create());
      const sign = Math.sign(w[0]) || 1; // at θ = π the axis sign is arbitrary
      for (let k = 0; k < 3; k++) expectClose(w[k] * sign, theta * axis[k], 1e-6, 0, `ω${k}`);
    }
  });

  it("solveLinear solves a 3×3 system and refuses a singular one", () => {
    const a = Float64Array.from([2, 1, 0, 1, 3, 1, 0, 1, 4]);
    const b = Float64Array.from([3, 5, 5]); // solution (1, 1, 1)
    expect(solveLinear(a, b, 3)).toBe(true);
    b.forEach((v) => expectClose(v, 1, 1e-12));
    expect(solveLinear(new Float64Array(9), new Float64Array(3), 3)).toBe(false);
  });
});

describe("Cartesian goals in a plan", () => {
  const base = {
    format: "jointproof.plan",
    version: 1,
    arm: readJson("kinematics/arm/presets/bench-arm-l.json"),
    start: [0, 0.3, 0.6, 0.2, 0, 0, 0.01],
  };

  it("a move with a target gets a joint goal that puts the tool point there; the gripper keeps its value", () => {
    const parsed = parsePlan({ ...base, moves: [{ target: { position: [0.35, 0.2, 0.25] }, duration: 2 }] });
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    const goal = parsed.value.moves[0].goal;
    expect(goal).toHaveLength(7);
    expectClose(goal[6], 0.01, 1e-15, 0, "gripper");
    const t = toolOf(goal);
    [0.35, 0.2, 0.25].forEach((v, k) => expectClose(t.position[k], v, 1e-4, 0, `p${k}`));
  });

  it("an unreachable target is an input problem on moves[i].target that gives the distance", () => {
    const parsed = parsePlan({
      ...base,
      moves: [
        { goal: [0, 0, 0, 0, 0, 0, 0], duration: 1 },
        { target: { position: [1.5, 0, 0.2] }, duration: 2 },
      ],
    });
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.problems.map((p) => p.path)).toEqual([["moves", 1, "target"]]);
    expect(parsed.problems[0].message).toMatch(/cannot reach \(1\.5, 0, 0\.2\) m .* mm away/);
  });

  it("a target on an arm without a chain is refused, and a document without targets is left unchanged", () => {
    const noChain = { ...base, arm: { ...(base.arm as object), chain: undefined } };
    const r = resolveCartesianGoals({ ...noChain, moves: [{ target: { position: [0.3, 0, 0.3] }, duration: 1 }] });
    expect(r.problems).toEqual([
      { path: ["moves", 0, "target"], message: "needs the arm's chain (arm.chain) to be turned into a joint goal" },
    ]);
    const plain = { ...base, moves: [{ goal: [0, 0, 0, 0, 0, 0, 0], duration: 1 }] };
    expect(resolveCartesianGoals(plain).document).toBe(plain);
  });
});
