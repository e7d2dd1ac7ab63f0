import fc from "fast-check";
import { describe, it } from "vitest";
import { compileChain } from "@/kinematics/arm/chain";
import { armChainSchema } from "@/kinematics/plan/arm-model";
import {
  createDynamicsWorkspace,
  frictionEffort,
  gravityEffort,
  gravityEffortAtLastPose,
  inverseDynamics,
  toolSpeedAtLastPose,
} from "@/kinematics/arm/dynamics";
import { createToolSpeedScanner, toolSpeedAt } from "@/kinematics/arm/tool-speed";
import { readJson } from "./helpers";
import { expectClose } from "../tolerance";

/** Planar two-link arm in the x–y plane, joints about z, point masses at the link ends, gravity along −y. */
function twoLink(m1: number, m2: number, l1: number, l2: number, g = 9.81) {
  const chain = armChainSchema.parse({
    joints: [
      { axis: [0, 0, 1], link: { inertial: { mass: m1, com: [l1, 0, 0] } } },
      { origin: { xyz: [l1, 0, 0] }, axis: [0, 0, 1], link: { inertial: { mass: m2, com: [l2, 0, 0] } } },
    ],
    gravity: [0, -g, 0],
  });
  return compileChain(chain, ["revolute", "revolute"]);
}

/**
 * Closed-form torques of the two-link planar arm with point masses at the link ends (Lynch & Park, Modern
 * Robotics (2017), §8.1; Craig, Introduction to Robotics, eq. 6.60 — memory; re-derived from the Lagrangian in
 * REFERENCES.md).
 */
function closedForm(
  m1: number,
  m2: number,
  l1: number,
  l2: number,
  g: number,
  q: number[],
  qd: number[],
  qdd: number[],
) {
  const c1 = Math.cos(q[0]),
    c2 = Math.cos(q[1]),
    s2 = Math.sin(q[1]),
    c12 = Math.cos(q[0] + q[1]);
  const t1 =
    (m1 * l1 * l1 + m2 * (l1 * l1 + 2 * l1 * l2 * c2 + l2 * l2)) * qdd[0] +
    m2 * (l1 * l2 * c2 + l2 * l2) * qdd[1] -
    m2 * l1 * l2 * s2 * (2 * qd[0] * qd[1] + qd[1] * qd[1]) +
    (m1 + m2) * g * l1 * c1 +
    m2 * g * l2 * c12;
  const t2 =
    m2 * (l1 * l2 * c2 + l2 * l2) * qdd[0] +
    m2 * l2 * l2 * qdd[1] +
    m2 * l1 * l2 * s2 * qd[0] * qd[0] +
    m2 * g * l2 * c12;
  return [t1, t2];
}

describe("recursive Newton–Euler against the two-link planar arm", () => {
  it("m = L = 1, g = 9.81, at rest and straight along x: τ = (29.43, 9.81) N·m (REFERENCES.md, derived)", () => {
    const c = twoLink(1, 1, 1, 1);
    const out = new Float64Array(2);
    inverseDynamics(c, createDynamicsWorkspace(c), [0, 0], [0, 0], [0, 0], out);
    expectClose(out[0], 29.43, 1e-9, 1e-12, "τ1");
    expectClose(out[1], 9.81, 1e-9, 1e-12, "τ2");
  });

  it("m = (2, 1), L = (1, 0.5), θ = (π/6, π/3), θ̇ = (1, −0.5), θ̈ = (2, 1): τ = (33.8119, 1.6830) N·m (REFERENCES.md, derived)", () => {
    const c = twoLink(2, 1, 1, 0.5);
    const out = new Float64Array(2);
    const q = [Math.PI / 6, Math.PI / 3],
      qd = [1, -0.5],
      qdd = [2, 1];
    inverseDynamics(c, createDynamicsWorkspace(c), q, qd, qdd, out);
    expectClose(out[0], 33.8119, 1e-4, 0, "τ1");
    expectClose(out[1], 1.683, 1e-4, 0, "τ2");
    const ref = closedForm(2, 1, 1, 0.5, 9.81, q, qd, qdd);
    expectClose(out[0], ref[0], 1e-9, 1e-9, "τ1 closed form");
    expectClose(out[1], ref[1], 1e-9, 1e-9, "τ2 closed form");
  });

  it("matches the closed-form equations for random masses, lengths and states", () => {
    const n = (lo: number, hi: number) =>
      fc.integer({ min: 0, max: 1_000_000 }).map((k) => lo + ((hi - lo) * k) / 1_000_000); // uniform grid
    fc.assert(
      fc.property(
        fc.tuple(n(0.1, 5), n(0.1, 5), n(0.1, 2), n(0.1, 2)),
        fc.array(n(-4, 4), { minLength: 6, maxLength: 6 }),
        ([m1, m2, l1, l2], s) => {
          const c = twoLink(m1, m2, l1, l2);
          const out = new Float64Array(2);
          inverseDynamics(c, createDynamicsWorkspace(c), [s[0], s[1]], [s[2], s[3]], [s[4], s[5]], out);
          const ref = closedForm(m1, m2, l1, l2, 9.81, [s[0], s[1]], [s[2], s[3]], [s[4], s[5]]);
          expectClose(out[0], ref[0], 1e-8, 1e-9, "τ1");
          expectClose(out[1], ref[1], 1e-8, 1e-9, "τ2");
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("gravity load of a straight horizontal arm by hand (τ = Σ m·g·r)", () => {
  // A spatial arm: base yaw about z, shoulder and elbow about y, links along x, gravity −z.
  // By hand: shoulder τ = g·(m1·r1 + m2·(L1 + r2) + payload·(L1 + L2)); sign: gravity pulls the tip down (−z),
  // a torque about +y that lifts the tip (x → −z is +y rotation), so the holding torque about +y is negative.
  const m1 = 1.5,
    m2 = 0.8,
    r1 = 0.15,
    r2 = 0.12,
    L1 = 0.3,
    L2 = 0.25,
    mp = 0.5,
    g = 9.81;
  const chain = armChainSchema.parse({
    joints: [
      {
        axis: [0, 0, 1],
        link: { inertial: { mass: 0.7, com: [0, 0, 0.05], inertia: { ixx: 1e-3, iyy: 1e-3, izz: 1e-3 } } },
      },
      {
        origin: { xyz: [0, 0, 0.1] },
        axis: [0, 1, 0],
        link: { inertial: { mass: m1, com: [r1, 0, 0], inertia: { ixx: 1e-3, iyy: 0.01, izz: 0.01 } } },
      },
      {
        origin: { xyz: [L1, 0, 0] },
        axis: [0, 1, 0],
        link: { inertial: { mass: m2, com: [r2, 0, 0], inertia: { ixx: 1e-3, iyy: 0.004, izz: 0.004 } } },
      },
    ],
    tool: { xyz: [L2, 0, 0] },
  });
  const types = ["revolute", "revolute", "revolute"] as const;

  it("without payload: shoulder −g(m1·r1 + m2(L1 + r2)), elbow −g·m2·r2, base 0", () => {
    const c = compileChain(chain, [...types]);
    const out = new Float64Array(3);
    gravityEffort(c, createDynamicsWorkspace(c), [0.4, 0, 0], out);
    expectClose(out[0], 0, 1e-12, 0, "base");
    expectClose(out[1], -g * (m1 * r1 + m2 * (L1 + r2)), 1e-12, 1e-12, "shoulder");
    expectClose(out[2], -g * m2 * r2, 1e-12, 1e-12, "elbow");
  });

  it("a payload at the tool point adds m_p·g times its lever arm to every pitch joint", () => {
    const c = compileChain(chain, [...types], { mass: mp, com: [0, 0, 0] });
    const out = new Float64Array(3);
    gravityEffort(c, createDynamicsWorkspace(c), [0, 0, 0], out);
    expectClose(out[1], -g * (m1 * r1 + m2 * (L1 + r2) + mp * (L1 + L2)), 1e-12, 1e-12, "shoulder");
    expectClose(out[2], -g * (m2 * r2 + mp * L2), 1e-12, 1e-12, "elbow");
  });

  it("pointing straight up the arm needs no holding torque", () => {
    const c = compileChain(chain, [...types], { mass: mp, com: [0, 0, 0] });
    const out = new Float64Array(3);
    gravityEffort(c, createDynamicsWorkspace(c), [0, -Math.PI / 2, 0], out);
    expectClose(out[1], 0, 1e-12, 0, "shoulder");
    expectClose(out[2], 0, 1e-12, 0, "elbow");
  });
});

describe("joint friction", () => {
  it("τ_f = F_v·q̇ + F_c·sgn(q̇) away from zero velocity, odd in q̇, and continuous through 0 (Siciliano et al. 2009, ch. 7 — memory)", () => {
    expectClose(frictionEffort(0.4, 0.1, 2, 0.01), 0.1 * 2 + 0.4, 1e-9, 0);
    expectClose(frictionEffort(0.4, 0.1, -2, 0.01), -(0.1 * 2 + 0.4), 1e-9, 0);
    expectClose(frictionEffort(0.4, 0.1, 0, 0.01), 0, 1e-15, 0);
    expectClose(Math.abs(frictionEffort(0.4, 0.1, 1e-6, 0.01)), 0.4 * Math.tanh(1e-4) + 1e-7, 1e-12, 0);
  });

  it("is added to the rigid-body effort in inverseDynamics", () => {
    const c = twoLink(1, 1, 1, 1);
    const ws = createDynamicsWorkspace(c, [
      { coulomb: 0.5, viscous: 0.2 },
      { coulomb: 0.3, viscous: 0.1 },
    ]);
    const plain = new Float64Array(2),
      withF = new Float64Array(2);
    inverseDynamics(c, ws, [0.1, 0.2], [1, -1], [0, 0], plain, 0, 0, true, false);
    inverseDynamics(c, ws, [0.1, 0.2], [1, -1], [0, 0], withF);
    expectClose(withF[0] - plain[0], 0.2 + 0.5 * Math.tanh(100), 1e-12, 0, "joint 0");
    expectClose(withF[1] - plain[1], -0.1 - 0.3 * Math.tanh(100), 1e-12, 0, "joint 1");
  });
});

describe("gravity at the last pose", () => {
  it("equals gravityEffort at the pose of the preceding inverse-dynamics call, on the heavy demo arm with any velocity and acceleration", () => {
    const arm = readJson("kinematics/arm/presets/bench-arm-h.json") as {
      chain: unknown;
      joints: { type?: "revolute" | "prismatic" }[];
    };
    const chain = compileChain(
      armChainSchema.parse(arm.chain),
      arm.joints.map((j) => j.type ?? "revolute"),
    );
    const n = chain.jointCount;
    const ws = createDynamicsWorkspace(chain);
    const vec = fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: n, maxLength: n });
    fc.assert(
      fc.property(vec, vec, vec, (q, qd, qdd) => {
        const fromFrames = new Float64Array(n),
          direct = new Float64Array(n);
        inverseDynamics(chain, ws, q, qd, qdd, new Float64Array(n), 0, 0, false, false);
        gravityEffortAtLastPose(chain, ws, fromFrames);
        gravityEffort(chain, createDynamicsWorkspace(chain), q, direct);
        // the same arithmetic on the same rotations: equal to the last bit (tolerance 0)
        for (let j = 0; j < n; j++) expectClose(fromFrames[j], direct[j], 0, 0, `joint ${j}`);
      }),
      { numRuns: 100, seed: 5 },
    );
  });
});

describe("tool speed at the last pose", () => {
  it("is the elbow speed l₁·|q̇₁| of the planar two-link arm (tool point at the second joint; Siciliano et al. 2009, §3.1 — memory)", () => {
    const chain = twoLink(1, 1, 0.7, 0.4);
    const ws = createDynamicsWorkspace(chain);
    for (const [q, qd] of [
      [
        [0.3, -1.1],
        [2, 5],
      ],
      [
        [-2, 0.4],
        [-0.5, 0],
      ],
    ] as const) {
      inverseDynamics(chain, ws, q, qd, [0, 0], new Float64Array(2));
      expectClose(toolSpeedAtLastPose(chain, ws, qd), 0.7 * Math.abs(qd[0]), 1e-12, 1e-15, `q=${q}`);
    }
  });

  it("moves the tool point by ḋ along a prismatic joint's axis after a revolute joint (rigid-body velocity, derived)", () => {
    const chain = compileChain(
      armChainSchema.parse({
        joints: [
          { axis: [0, 0, 1], link: { inertial: { mass: 1, com: [0.1, 0, 0] } } },
          { origin: { xyz: [0.5, 0, 0] }, axis: [1, 0, 0], link: { inertial: { mass: 0.5, com: [0, 0, 0] } } },
        ],
        tool: { xyz: [0, 0, 0] },
      }),
      ["revolute", "prismatic"],
    );
    const ws = createDynamicsWorkspace(chain);
    // q = (0, d): the tool point at x = 0.5 + d; joint 1 spins it about z, joint 2 slides it along x
    const d = 0.2,
      w = 3,
      dd = -0.4;
    inverseDynamics(chain, ws, [0, d], [w, dd], [0, 0], new Float64Array(2));
    expectClose(toolSpeedAtLastPose(chain, ws, [w, dd]), Math.hypot(dd, w * (0.5 + d)), 1e-12, 1e-15, "speed");
  });

  it("equals |J_v(q)·q̇| from the geometric Jacobian on both demo arms at any pose and velocity", () => {
    for (const file of ["bench-arm-h.json", "bench-arm-l.json"]) {
      const arm = readJson(`kinematics/arm/presets/${file}`) as {
        chain: unknown;
        joints: { type?: "revolute" | "prismatic" }[];
      };
      const chain = compileChain(
        armChainSchema.parse(arm.chain),
        arm.joints.map((j) => j.type ?? "revolute"),
      );
      const n = chain.jointCount;
      const ws = createDynamicsWorkspace(chain);
      const scanner = createToolSpeedScanner(chain);
      const vec = fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: n, maxLength: n });
      fc.assert(
        fc.property(vec, vec, vec, (q, qd, qdd) => {
          inverseDynamics(chain, ws, q, qd, qdd, new Float64Array(n));
          expectClose(toolSpeedAtLastPose(chain, ws, qd), toolSpeedAt(scanner, q, qd), 1e-12, 1e-12, file);
        }),
        { numRuns: 200, seed: 11 },
      );
    }
  });
});
