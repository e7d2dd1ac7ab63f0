import fc from "fast-check";
import { describe, it } from "vitest";
import { armChainSchema } from "@/kinematics/plan/arm-model";
import { compileChain, createChainBuffers, forwardKinematics, toolJacobian } from "@/kinematics/arm/chain";
import { parseArm } from "@/kinematics";
import { createToolSpeedScanner, toolSpeedAt } from "@/kinematics/arm/tool-speed";
import { readJson } from "./helpers";
import { expectClose } from "../tolerance";

describe("tool-point speed", () => {
  it("a single link of length L turning at ω moves its tip at ω·L (circular motion, by hand)", () => {
    const c = compileChain(armChainSchema.parse({ joints: [{ axis: [0, 0, 1] }], tool: { xyz: [0.6, 0, 0] } }), [
      "revolute",
    ]);
    expectClose(toolSpeedAt(createToolSpeedScanner(c), [0.3], [2.5]), 1.5, 1e-12);
  });

  it("matches central finite differences of the FK tool position on the demo arm", () => {
    const parsed = parseArm(readJson("kinematics/arm/presets/bench-arm-h.json"));
    if (!parsed.ok) throw new Error("demo arm H does not parse");
    const arm = parsed.value;
    const c = compileChain(
      arm.chain!,
      arm.joints.map((j) => j.type),
    );
    const s = createToolSpeedScanner(c);
    const buf = createChainBuffers(c);
    // uniform on a fine grid (fc.double favours tiny and extreme values)
    const d = (lo: number, hi: number) =>
      fc.integer({ min: 0, max: 1_000_000 }).map((k) => lo + ((hi - lo) * k) / 1_000_000);
    fc.assert(
      fc.property(
        fc.array(d(-1.5, 1.5), { minLength: 6, maxLength: 6 }),
        fc.array(d(-2, 2), { minLength: 6, maxLength: 6 }),
        (q, qd) => {
          const h = 1e-6;
          const p = (sign: number) => {
            const t = forwardKinematics(
              c,
              q.map((v, i) => v + sign * h * qd[i]),
              buf,
            );
            return [t[12], t[13], t[14]];
          };
          const a = p(1),
            b = p(-1);
          const fd = Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]) / (2 * h); // central difference
          expectClose(toolSpeedAt(s, q, qd), fd, 1e-6, 1e-6);
        },
      ),
      { numRuns: 200 },
    );
  });
});

describe("geometric Jacobian", () => {
  const g = (m: number) => fc.integer({ min: -1_000_000, max: 1_000_000 }).map((k) => (k / 1_000_000) * m);
  const v3 = (m: number) => fc.tuple(g(m), g(m), g(m));
  const joint = fc.record({
    xyz: v3(0.5),
    rpy: v3(Math.PI),
    axis: v3(1).filter((a) => Math.hypot(...a) > 0.2),
    prismatic: fc.boolean(),
    q: g(2),
    qd: g(2),
  });

  it("J·q̇ equals the finite-difference tool velocity (linear and angular) for random chains with revolute and prismatic joints", () => {
    fc.assert(
      fc.property(fc.array(joint, { minLength: 1, maxLength: 7 }), v3(0.3), (joints, toolXyz) => {
        const c = compileChain(
          armChainSchema.parse({
            joints: joints.map((j) => ({ origin: { xyz: j.xyz, rpy: j.rpy }, axis: j.axis })),
            tool: { xyz: toolXyz },
          }),
          joints.map((j) => (j.prismatic ? "prismatic" : "revolute")),
        );
        const n = joints.length;
        const buf = createChainBuffers(c);
        const q = joints.map((j) => j.q),
          qd = joints.map((j) => j.qd);
        const h = 1e-6;
        const plus = Float64Array.from(
          forwardKinematics(
            c,
            q.map((v, i) => v + h * qd[i]),
            buf,
          ),
        );
        const minus = Float64Array.from(
          forwardKinematics(
            c,
            q.map((v, i) => v - h * qd[i]),
            buf,
          ),
        );
        const now = Float64Array.from(forwardKinematics(c, q, buf));
        const jac = toolJacobian(c, buf, new Float64Array(6 * n));
        const twist = [0, 1, 2, 3, 4, 5].map((r) => qd.reduce((s, v, i) => s + jac[r * n + i] * v, 0));
        for (let k = 0; k < 3; k++)
          expectClose(twist[k], (plus[12 + k] - minus[12 + k]) / (2 * h), 1e-6, 1e-6, `v${k}`);
        // [ω]× = Ṙ·Rᵀ (Lynch & Park, Modern Robotics, §3.2.2), Ṙ by central differences.
        const W = (r: number, cc: number) =>
          [0, 1, 2].reduce((s, k) => s + ((plus[r + 4 * k] - minus[r + 4 * k]) / (2 * h)) * now[cc + 4 * k], 0);
        [W(2, 1), W(0, 2), W(1, 0)].forEach((w, k) => expectClose(twist[3 + k], w, 1e-6, 1e-6, `ω${k}`));
      }),
      { numRuns: 200 },
    );
  });
});
