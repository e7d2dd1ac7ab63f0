import fc from "fast-check";
import { describe, it } from "vitest";
import { armChainSchema } from "@/kinematics/plan/arm-model";
import { compileChain, linkFrames, type CompiledChain } from "@/kinematics/arm/chain";
import { createDynamicsWorkspace, inverseDynamics } from "@/kinematics/arm/dynamics";
import { expectClose } from "../tolerance";

/**
 * Newton–Euler against the Lagrangian form τ = M(q)q̈ + Ṁq̇ − ½∂(q̇ᵀMq̇)/∂q + ∂P/∂q (Lynch & Park, Modern
 * Robotics (2017), §8.1.2; Siciliano et al. 2009, §7.1 — memory), for random spatial chains with revolute
 * and prismatic joints. M is built here from forward-kinematics frames and per-link geometric Jacobians,
 * M = Σ mᵢJᵥᵢᵀJᵥᵢ + J_ωᵢᵀ(RᵢIᵢRᵢᵀ)J_ωᵢ (Lynch & Park eq. 8.x — memory), and its derivatives by central
 * differences — nothing is shared with the Newton–Euler code but the chain's FK.
 */
// Uniform values on a grid of 1e-6·m: fc.double's bias towards tiny and extreme values would hide velocity-squared terms.
const num = (m: number) => fc.integer({ min: -1_000_000, max: 1_000_000 }).map((k) => (k / 1_000_000) * m);
const vec = (m: number) => fc.tuple(num(m), num(m), num(m));
const linkArb = fc.record({
  xyz: vec(0.4),
  rpy: vec(Math.PI),
  axis: vec(1).filter((a) => Math.hypot(...a) > 0.2),
  prismatic: fc.boolean(),
  mass: num(1).map((v) => 1.55 + 1.45 * v),
  com: vec(0.2),
  moments: fc.tuple(...[0, 1, 2].map(() => num(1).map((v) => 0.0255 + 0.0245 * v))),
  turn: fc.tuple(num(Math.PI), num(Math.PI), num(Math.PI)),
  q: num(2),
  qd: num(2),
  qdd: num(3),
});

function rpyMatrix([r, p, y]: number[]): number[][] {
  const cr = Math.cos(r),
    sr = Math.sin(r),
    cp = Math.cos(p),
    sp = Math.sin(p),
    cy = Math.cos(y),
    sy = Math.sin(y);
  return [
    [cy * cp, cy * sp * sr - sy * cr, cy * sp * cr + sy * sr],
    [sy * cp, sy * sp * sr + cy * cr, sy * sp * cr - cy * sr],
    [-sp, cp * sr, cp * cr],
  ];
}

/** M(q) and the potential energy P(q) from FK frames and per-link com Jacobians. */
function massAndPotential(
  chain: CompiledChain,
  links: { mass: number; com: number[] }[],
  inertias: number[][][],
  gravity: number[],
  q: number[],
) {
  const n = q.length;
  const frames = new Float64Array(16 * (n + 1));
  linkFrames(chain, q, frames);
  const M = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  let P = 0;
  const z: number[][] = [],
    o: number[][] = [];
  for (let j = 0; j < n; j++) {
    const f = 16 * (j + 1);
    const a = [chain.axis[3 * j], chain.axis[3 * j + 1], chain.axis[3 * j + 2]];
    z.push([0, 1, 2].map((r) => frames[f + r] * a[0] + frames[f + 4 + r] * a[1] + frames[f + 8 + r] * a[2]));
    o.push([frames[f + 12], frames[f + 13], frames[f + 14]]);
  }
  for (let i = 0; i < n; i++) {
    const f = 16 * (i + 1);
    const c = links[i].com;
    const pc = [0, 1, 2].map(
      (r) => frames[f + r] * c[0] + frames[f + 4 + r] * c[1] + frames[f + 8 + r] * c[2] + frames[f + 12 + r],
    );
    const R = [0, 1, 2].map((r) => [0, 1, 2].map((k) => frames[f + 4 * k + r]));
    const Iw = [0, 1, 2].map((r) =>
      [0, 1, 2].map((k) =>
        [0, 1, 2].reduce((s, a) => s + R[r][a] * [0, 1, 2].reduce((s2, b) => s2 + inertias[i][a][b] * R[k][b], 0), 0),
      ),
    );
    const Jv: number[][] = [],
      Jw: number[][] = [];
    for (let j = 0; j < n; j++) {
      if (j > i) {
        Jv.push([0, 0, 0]);
        Jw.push([0, 0, 0]);
      } else if (chain.prismatic[j]) {
        Jv.push(z[j]);
        Jw.push([0, 0, 0]);
      } else {
        const d = [pc[0] - o[j][0], pc[1] - o[j][1], pc[2] - o[j][2]];
        Jv.push([z[j][1] * d[2] - z[j][2] * d[1], z[j][2] * d[0] - z[j][0] * d[2], z[j][0] * d[1] - z[j][1] * d[0]]);
        Jw.push(z[j]);
      }
    }
    for (let a = 0; a < n; a++)
      for (let b = 0; b < n; b++) {
        let s = links[i].mass * (Jv[a][0] * Jv[b][0] + Jv[a][1] * Jv[b][1] + Jv[a][2] * Jv[b][2]);
        for (let r = 0; r < 3; r++) for (let k = 0; k < 3; k++) s += Jw[a][r] * Iw[r][k] * Jw[b][k];
        M[a][b] += s;
      }
    P -= links[i].mass * (gravity[0] * pc[0] + gravity[1] * pc[1] + gravity[2] * pc[2]);
  }
  return { M, P };
}

describe("recursive Newton–Euler against the Lagrangian equations on random spatial chains", () => {
  it("τ(q, q̇, q̈) matches M q̈ + Ṁ q̇ − ½∂(q̇ᵀMq̇)/∂q + ∂P/∂q", () => {
    fc.assert(
      fc.property(fc.array(linkArb, { minLength: 1, maxLength: 5 }), (links) => {
        const inertias = links.map((l) => {
          const R = rpyMatrix(l.turn);
          return [0, 1, 2].map((r) =>
            [0, 1, 2].map(
              (c) =>
                R[r][0] * l.moments[0] * R[c][0] + R[r][1] * l.moments[1] * R[c][1] + R[r][2] * l.moments[2] * R[c][2],
            ),
          );
        });
        const gravity = [0.3, -1.2, -9.81];
        const chain = compileChain(
          armChainSchema.parse({
            joints: links.map((l, i) => ({
              origin: { xyz: l.xyz, rpy: l.rpy },
              axis: l.axis,
              link: {
                inertial: {
                  mass: l.mass,
                  com: l.com,
                  inertia: {
                    ixx: inertias[i][0][0],
                    ixy: inertias[i][0][1],
                    ixz: inertias[i][0][2],
                    iyy: inertias[i][1][1],
                    iyz: inertias[i][1][2],
                    izz: inertias[i][2][2],
                  },
                },
              },
            })),
            gravity,
          }),
          links.map((l) => (l.prismatic ? "prismatic" : "revolute")),
        );
        const n = links.length;
        const q = links.map((l) => l.q),
          qd = links.map((l) => l.qd),
          qdd = links.map((l) => l.qdd);
        const at = (qq: number[]) => massAndPotential(chain, links, inertias, gravity, qq);
        const h = 1e-5;
        const shift = (v: number[], d: number[], s: number) => v.map((x, k) => x + s * d[k]);
        const { M } = at(q);
        const Mp = at(shift(q, qd, h)).M,
          Mm = at(shift(q, qd, -h)).M; // Ṁ = (M(q + hq̇) − M(q − hq̇))/2h
        const quad = (MM: number[][]) =>
          qd.reduce((s, a, r) => s + a * MM[r].reduce((s2, m, c) => s2 + m * qd[c], 0), 0);
        const tau = new Float64Array(n);
        inverseDynamics(chain, createDynamicsWorkspace(chain), q, qd, qdd, tau, 0, 0, true, false);
        for (let i = 0; i < n; i++) {
          const e = q.map((_, k) => (k === i ? 1 : 0));
          const up = at(shift(q, e, h)),
            down = at(shift(q, e, -h));
          let expected = 0;
          for (let j = 0; j < n; j++) expected += M[i][j] * qdd[j] + ((Mp[i][j] - Mm[i][j]) / (2 * h)) * qd[j];
          expected += (-0.5 * (quad(up.M) - quad(down.M))) / (2 * h) + (up.P - down.P) / (2 * h);
          expectClose(tau[i], expected, 1e-6, 1e-6, `τ${i}`);
        }
      }),
      { numRuns: 150 },
    );
  });
});
