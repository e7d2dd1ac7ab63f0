import fc from "fast-check";
import { describe, it } from "vitest";
import { armChainSchema } from "@/kinematics/arm-model";
import { compileChain, createChainBuffers, forwardKinematics } from "@/kinematics/chain";
import { parseArm } from "@/kinematics/plan";
import { createToolSpeedScanner, toolSpeedAt } from "@/kinematics/toolspeed";
import { readJson } from "./helpers";
import { expectClose } from "./tolerance";

describe("tool-point speed", () => {
  it("a single link of length L turning at ω moves its tip at ω·L (circular motion, by hand)", () => {
    const c = compileChain(armChainSchema.parse({ joints: [{ axis: [0, 0, 1] }], tool: { xyz: [0.6, 0, 0] } }), ["revolute"]);
    expectClose(toolSpeedAt(createToolSpeedScanner(c), [0.3], [2.5]), 1.5, 1e-12);
  });

  it("matches central finite differences of the FK tool position on the demo arm", () => {
    const parsed = parseArm(readJson("kinematics/arms/bench-arm-h.json"));
    if (!parsed.ok) throw new Error("demo arm H does not parse");
    const arm = parsed.value;
    const c = compileChain(arm.chain!, arm.joints.map((j) => j.type));
    const s = createToolSpeedScanner(c);
    const buf = createChainBuffers(c);
    // uniform on a fine grid (fc.double favours tiny and extreme values)
    const d = (lo: number, hi: number) => fc.integer({ min: 0, max: 1_000_000 }).map((k) => lo + ((hi - lo) * k) / 1_000_000);
    fc.assert(
      fc.property(fc.array(d(-1.5, 1.5), { minLength: 6, maxLength: 6 }), fc.array(d(-2, 2), { minLength: 6, maxLength: 6 }), (q, qd) => {
        const h = 1e-6;
        const p = (sign: number) => {
          const t = forwardKinematics(c, q.map((v, i) => v + sign * h * qd[i]), buf);
          return [t[12], t[13], t[14]];
        };
        const a = p(1), b = p(-1);
        const fd = Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]) / (2 * h); // central difference
        expectClose(toolSpeedAt(s, q, qd), fd, 1e-6, 1e-6);
      }),
      { numRuns: 200 },
    );
  });
});
