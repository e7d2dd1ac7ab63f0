import { describe, expect, it } from "vitest";
import { compileChain } from "@/kinematics/arm/chain";
import { check } from "@/kinematics";
import { createDynamicsWorkspace, inverseDynamics } from "@/kinematics/arm/dynamics";
import { parsePlan, type Plan } from "@/kinematics";
import { sampleMoveAt } from "@/kinematics/motion/sample";
import { timelineOf } from "@/kinematics/motion/timeline";
import { createToolSpeedScanner, toolSpeedAt } from "@/kinematics/arm/tool-speed";
import { readJson } from "../arm/helpers";
import { expectClose } from "../tolerance";

function plan(doc: unknown): Plan {
  const r = parsePlan(doc);
  if (!r.ok) throw new Error(r.problems.map((p) => `${p.path}: ${p.message}`).join("\n"));
  return r.value;
}
const fixture = (name: string) => readJson(`tests/fixtures/arm-plans/${name}.json`) as Record<string, unknown>;

/** The sampled state of a plan at plan time tS, from the sampler (independent of the checkers' own sampling). */
function stateAt(p: Plan, move: number, tS: number) {
  const tl = timelineOf(p);
  const n = p.arm.joints.length;
  const q = new Float64Array(n),
    qd = new Float64Array(n),
    qdd = new Float64Array(n);
  sampleMoveAt(tl, move, tS - tl.startS[move], q, qd, qdd, 0);
  return { q, qd, qdd, startS: tl.startS[move], durationS: tl.durationS[move] };
}

describe("arm findings carry the time of their worst sample (seconds from the plan's start)", () => {
  it("effort-over: Newton–Euler at timeS gives the finding's value, and timeS lies in its move", () => {
    const p = plan(fixture("reach-out-heavy"));
    const chain = compileChain(
      p.arm.chain!,
      p.arm.joints.map((j) => j.type),
      p.payload,
    );
    const ws = createDynamicsWorkspace(
      chain,
      p.arm.joints.slice(0, chain.jointCount).map((j) => j.friction),
    );
    const efforts = check(p).findings.filter((f) => f.kind === "effort-over" && f.move !== null);
    expect(efforts.map((f) => f.move)).toEqual([0, 1]);
    for (const f of efforts) {
      const s = stateAt(p, f.move!, f.timeS!);
      expect(f.timeS! >= s.startS && f.timeS! <= s.startS + s.durationS, `timeS ${f.timeS}`).toBe(true);
      const tau = inverseDynamics(chain, ws, s.q, s.qd, s.qdd, new Float64Array(chain.jointCount));
      expectClose(Math.abs(tau[f.joint!]), f.value, 1e-9, 1e-9, `effort at ${f.timeS} s`);
    }
  });

  it("tool-speed: the tool speed at timeS is the finding's value", () => {
    const p = plan(fixture("bench-e2e"));
    const chain = compileChain(
      p.arm.chain!,
      p.arm.joints.map((j) => j.type),
      p.payload,
    );
    const scanner = createToolSpeedScanner(chain);
    const fs = check(p).findings.filter((f) => f.kind === "tool-speed");
    expect(fs.length).toBeGreaterThan(0);
    for (const f of fs) {
      const s = stateAt(p, f.move!, f.timeS!);
      expectClose(toolSpeedAt(scanner, s.q, s.qd), f.value, 1e-9, 1e-9, `tool speed at ${f.timeS} s`);
    }
  });

  it("clearance: link and zone are on the finding, timeS is the move's start plus the deepest time within the move", () => {
    const doc = fixture("clip-surface");
    const lead = { goal: doc.start, duration: 1.5 }; // a move that stays put shifts the clip by 1.5 s
    const shifted = check(plan({ ...doc, moves: [lead, ...(doc.moves as unknown[])] })).findings.filter(
      (f) => f.kind === "clearance",
    );
    const alone = check(plan(doc)).findings.filter((f) => f.kind === "clearance");
    expect(alone.length).toBeGreaterThan(0);
    expect(shifted.map((f) => [f.link, f.zone])).toEqual(alone.map((f) => [f.link, f.zone]));
    expect(alone[0].link).toBe("handle");
    expect(alone[0].zone).toBe("work surface");
    alone.forEach((f, i) => expectClose(shifted[i].timeS!, f.timeS! + 1.5, 1e-9, 0, "shifted timeS"));
    expect(alone[0].timeS!).toBeGreaterThan(0);
  });
});

describe("check option sampleRateHz", () => {
  it("in control-rate sampling, samples the arm checks at that rate: the joint figures are unchanged, the effort peak is a sampled value no higher than at the control rate", () => {
    const p = plan(fixture("reach-out-heavy"));
    const full = check(p, { sampling: "control-rate" });
    const coarse = check(p, { sampleRateHz: 50, sampling: "control-rate" });
    expect(coarse.moves.map((m) => m.peakVelocity)).toEqual(full.moves.map((m) => m.peakVelocity));
    const fine = full.moves[0].peakEffort![1]!,
      rough = coarse.moves[0].peakEffort![1]!;
    expect(rough).toBeLessThanOrEqual(fine * (1 + 1e-12));
    expect(rough).not.toBe(fine); // 50 Hz misses the control-rate peak of this move
    // every coarse effort finding's time is on the 50 Hz grid of its move
    for (const f of coarse.findings.filter((x) => x.kind === "effort-over" && x.move !== null)) {
      const within = f.timeS! - timelineOf(p).startS[f.move!];
      expectClose(Math.round(within * 50), within * 50, 1e-6, 0, "grid index");
    }
  });
});
