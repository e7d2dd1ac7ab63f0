import fc from "fast-check";
import { Matrix4, Vector3 } from "three";
import { describe, it } from "vitest";
import { createChainBuffers, forwardKinematics, linkFrames } from "@/kinematics/arm/chain";
import { chainFromModifiedDh, chainFromStandardDh, type DhRow } from "@/kinematics/arm/dh";
import * as mat4 from "@/kinematics/arm/mat4";
import { compile } from "./helpers";
import { expectAllClose, expectClose } from "../tolerance";

describe("forward kinematics against published examples", () => {
  it("reproduces the product-of-exponentials FK example of Lynch & Park, Modern Robotics (2017), §4.1 / companion library FKinSpace example", () => {
    // Source: Lynch & Park, Modern Robotics (2017), ch. 4 example with M, S1..S3 (axes recalled from memory;
    // the result T was re-computed independently, per REFERENCES.md).
    // Conversion to our joint model: S1 = (0,0,1, 4,0,0) is a revolute joint about +z through q with
    // −ω×q = (4,0,0) ⇒ q = (0,4,0); S2 = (0,0,0, 0,1,0) is prismatic along +y; S3 = (0,0,−1, −6,0,−0.1) is a screw
    // about −z through (0,6,0) with pitch h = 0.1 (v = −ω×q + hω), i.e. a revolute joint plus a prismatic joint
    // along the same axis moved by h·θ3 (rotation and translation along one axis commute).
    const chain = compile(
      {
        joints: [
          { origin: { xyz: [0, 4, 0] }, axis: [0, 0, 1] },
          { origin: { xyz: [0, -4, 0] }, axis: [0, 1, 0] },
          { origin: { xyz: [0, 6, 0] }, axis: [0, 0, -1] },
          { axis: [0, 0, -1] },
        ],
        // Tool in the last link's frame (at home the last link frame is T(0,6,0)): T(0,−6,0)·M with
        // M = [[−1,0,0,0],[0,1,0,6],[0,0,−1,2]] ⇒ xyz (0,0,2); M's rotation diag(−1, 1, −1) = Ry(π) ⇒ rpy (0, π, 0).
        tool: { xyz: [0, 0, 2], rpy: [0, Math.PI, 0] },
      },
      ["revolute", "prismatic", "revolute", "prismatic"],
    );
    const buf = createChainBuffers(chain);
    const t = forwardKinematics(chain, [Math.PI / 2, 3, Math.PI, 0.1 * Math.PI], buf);
    // Expected T = [[0,1,0,−5],[1,0,0,4],[0,0,−1,1.68584073]] (column-major below).
    expectAllClose(Array.from(t), [0, 1, 0, 0, 1, 0, 0, 0, 0, 0, -1, 0, -5, 4, 1.68584073, 1], 1e-8, 0, "T");
  });

  it("puts the planar two-link tool point at (1.1248, 1.4659) for θ = (30°, 45°) with standard and modified DH", () => {
    // REFERENCES.md: planar two-link arm L1 = L2 = 1 (derived): x = cos30° + cos75°, y = sin30° + sin75°.
    const q = [Math.PI / 6, Math.PI / 4];
    const std = compile(
      chainFromStandardDh([
        { a: 1, alpha: 0, d: 0, theta: 0 },
        { a: 1, alpha: 0, d: 0, theta: 0 },
      ]),
    );
    const mod = compile(
      chainFromModifiedDh(
        [
          { a: 0, alpha: 0, d: 0, theta: 0 },
          { a: 1, alpha: 0, d: 0, theta: 0 },
        ],
        { xyz: [1, 0, 0], rpy: [0, 0, 0] },
      ),
    );
    for (const c of [std, mod]) {
      const t = forwardKinematics(c, q, createChainBuffers(c));
      expectClose(t[12], 1.1248, 1e-4, 0, "x");
      expectClose(t[13], 1.4659, 1e-4, 0, "y");
      expectClose(t[12], Math.cos(Math.PI / 6) + Math.cos((5 * Math.PI) / 12), 1e-12, 0, "x exact");
    }
  });
});

// three.js Matrix4 as an outside reference for frame composition.
function threeOrigin(xyz: number[], rpy: number[]): Matrix4 {
  // URDF: R = Rz(yaw)·Ry(pitch)·Rx(roll), then translate.
  const r = new Matrix4()
    .makeRotationZ(rpy[2])
    .multiply(new Matrix4().makeRotationY(rpy[1]))
    .multiply(new Matrix4().makeRotationX(rpy[0]));
  return new Matrix4().makeTranslation(xyz[0], xyz[1], xyz[2]).multiply(r);
}

// Uniform values on a grid of 1e-6·m: fc.double's bias towards tiny and extreme values would hide velocity-squared terms.
const num = (m: number) => fc.integer({ min: -1_000_000, max: 1_000_000 }).map((k) => (k / 1_000_000) * m);
const vec = (m: number) => fc.tuple(num(m), num(m), num(m));
const axisArb = vec(1).filter((a) => Math.hypot(...a) > 0.1);
const jointArb = fc.record({ xyz: vec(0.5), rpy: vec(Math.PI), axis: axisArb, prismatic: fc.boolean(), q: num(3) });

describe("frame composition cross-checked against three.js Matrix4", () => {
  it("every link frame and the tool pose match three.js for random chains and poses", () => {
    fc.assert(
      fc.property(
        fc.array(jointArb, { minLength: 1, maxLength: 8 }),
        vec(0.3),
        vec(Math.PI),
        (joints, toolXyz, toolRpy) => {
          const chain = compile(
            {
              joints: joints.map((j) => ({ origin: { xyz: j.xyz, rpy: j.rpy }, axis: j.axis })),
              tool: { xyz: toolXyz, rpy: toolRpy },
            },
            joints.map((j) => (j.prismatic ? "prismatic" : "revolute")),
          );
          const buf = createChainBuffers(chain);
          const tool = forwardKinematics(
            chain,
            joints.map((j) => j.q),
            buf,
          );
          const ref = new Matrix4();
          joints.forEach((j, i) => {
            const axis = new Vector3(...j.axis).normalize();
            const motion = j.prismatic
              ? new Matrix4().makeTranslation(axis.x * j.q, axis.y * j.q, axis.z * j.q)
              : new Matrix4().makeRotationAxis(axis, j.q);
            ref.multiply(threeOrigin(j.xyz, j.rpy)).multiply(motion);
            expectAllClose(buf.frames.subarray(16 * (i + 1), 16 * (i + 2)), ref.elements, 1e-9, 1e-9, `frame ${i + 1}`);
          });
          ref.multiply(threeOrigin(toolXyz, toolRpy));
          expectAllClose(tool, ref.elements, 1e-9, 1e-9, "tool");
        },
      ),
      { numRuns: 200 },
    );
  });

  it("linkFrames writes frame 0 as the identity and leaves the buffer length n + 1 frames", () => {
    const chain = compile({ joints: [{ origin: { xyz: [0, 0, 1] }, axis: [0, 0, 1] }] });
    const out = new Float64Array(32).fill(7);
    linkFrames(chain, [0.3], out);
    expectAllClose(out.subarray(0, 16), mat4.create());
    expectClose(out[30], 1, 1e-12);
  });

  it("toRpy inverts fromXyzRpy, including at pitch = ±π/2", () => {
    fc.assert(
      fc.property(vec(Math.PI), fc.constantFrom(0, Math.PI / 2, -Math.PI / 2), fc.boolean(), (rpy, p, lock) => {
        const r = lock ? [rpy[0], p, rpy[2]] : rpy;
        const m = mat4.fromXyzRpy(new Float64Array(16), [0, 0, 0], r);
        const back = mat4.toRpy([0, 0, 0], m);
        const m2 = mat4.fromXyzRpy(new Float64Array(16), [0, 0, 0], back);
        expectAllClose(m2, m, 1e-9, 0, "R");
      }),
    );
  });
});

describe("Denavit–Hartenberg conversion", () => {
  const dhRow = fc.record({
    a: num(0.5),
    alpha: num(Math.PI),
    d: num(0.5),
    theta: num(Math.PI),
    prismatic: fc.boolean(),
  });

  it("standard DH chain matches the direct product Rz(θ)·Tz(d)·Tx(a)·Rx(α) computed with three.js", () => {
    // Standard DH: Siciliano et al., Robotics: Modelling, Planning and Control (2009), §2.8.2, eq. 2.52.
    fc.assert(
      fc.property(fc.array(fc.tuple(dhRow, num(2)), { minLength: 1, maxLength: 7 }), (rows) => {
        const dh: DhRow[] = rows.map(([r]) => ({
          a: r.a,
          alpha: r.alpha,
          d: r.d,
          theta: r.theta,
          type: r.prismatic ? "prismatic" : "revolute",
        }));
        const q = rows.map(([, v]) => v);
        const chain = compile(
          chainFromStandardDh(dh),
          dh.map((r) => r.type!),
        );
        const t = forwardKinematics(chain, q, createChainBuffers(chain));
        const ref = new Matrix4();
        dh.forEach((r, i) => {
          const theta = r.theta + (r.type === "revolute" ? q[i] : 0);
          const d = r.d + (r.type === "prismatic" ? q[i] : 0);
          ref
            .multiply(new Matrix4().makeRotationZ(theta))
            .multiply(new Matrix4().makeTranslation(0, 0, d))
            .multiply(new Matrix4().makeTranslation(r.a, 0, 0))
            .multiply(new Matrix4().makeRotationX(r.alpha));
        });
        expectAllClose(t, ref.elements, 1e-9, 1e-9, "tool");
      }),
      { numRuns: 200 },
    );
  });

  it("standard and modified DH tables of the same arm give the same tool pose", () => {
    // Craig, Introduction to Robotics (3rd ed.), §3.4 (modified DH) vs standard DH. Re-derivation of the table
    // conversion: A1…An = Rz(θ1)Tz(d1) · Π [Tx(a_{i−1})Rx(α_{i−1}) Rz(θi)Tz(di)] · Tx(an)Rx(αn), and Tx·Rx commute,
    // so modified row i = (a_{i−1}, α_{i−1}, di, θi) with a0 = α0 = 0 and the tool Tx(an)·Rx(αn).
    fc.assert(
      fc.property(fc.array(fc.tuple(dhRow, num(2)), { minLength: 1, maxLength: 7 }), (rows) => {
        const std: DhRow[] = rows.map(([r]) => ({
          a: r.a,
          alpha: r.alpha,
          d: r.d,
          theta: r.theta,
          type: r.prismatic ? "prismatic" : "revolute",
        }));
        const mod: DhRow[] = std.map((r, i) => ({
          ...r,
          a: i === 0 ? 0 : std[i - 1].a,
          alpha: i === 0 ? 0 : std[i - 1].alpha,
        }));
        const last = std[std.length - 1];
        const q = rows.map(([, v]) => v);
        const types = std.map((r) => r.type!);
        const a = compile(chainFromStandardDh(std), types);
        const b = compile(chainFromModifiedDh(mod, { xyz: [last.a, 0, 0], rpy: [last.alpha, 0, 0] }), types);
        const ta = forwardKinematics(a, q, createChainBuffers(a));
        const tb = forwardKinematics(b, q, createChainBuffers(b));
        expectAllClose(ta, tb, 1e-9, 1e-9, "tool");
      }),
      { numRuns: 200 },
    );
  });
});
