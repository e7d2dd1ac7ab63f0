// The timed-replay rules are the project's own (issue text of the dataset audit, derived: each frame must
// be reachable from the previous one at the joint's speed limit in the time between them). Values below
// are computed by hand in the comments; steps of 1/8 s keep every time and limit an exact binary number.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { parseArm, type Arm } from "@/kinematics";
import type { Recording } from "@/kinematics/recordings/recording";
import {
  auditEpisode,
  auditEpisodes,
  auditToJson,
  medianStepS,
  summarizeAudits,
  type EpisodeAudit,
} from "@/kinematics/recordings/timed-replay";
import { repairEpisode } from "@/kinematics/recordings/dataset-repair";
import { expectClose } from "../tolerance";

const dt = 0.125;

/** Two joints: "lift" travel −1..1 rad at 1 rad/s (one step may move 0.125 rad), "grip" 0..0.04 m at 0.1 m/s. */
function armOf(): Arm {
  const result = parseArm({
    name: "Replay arm",
    controlRateHz: 1000,
    cautionRatio: 0.9,
    joints: [
      { name: "lift", min: -1, max: 1, maxVelocity: 1 },
      { name: "grip", type: "prismatic", min: 0, max: 0.04, maxVelocity: 0.1 },
    ],
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

/** An episode of "lift" positions at 8 Hz (grip holds 0.02 m); `times` overrides the uniform times. */
function episodeOf(lift: number[], times?: number[]): Recording {
  return {
    names: ["lift", "grip"],
    jointCount: 2,
    count: lift.length,
    timeS: Float64Array.from(times ?? lift.map((_, k) => k * dt)),
    position: Float64Array.from(lift.flatMap((q) => [q, 0.02])),
  };
}

function audit(lift: number[], times?: number[]): EpisodeAudit {
  return auditEpisode(armOf(), { id: "ep-1", recording: episodeOf(lift, times) });
}

function kinds(result: EpisodeAudit): [string, string, number | null, number][] {
  return result.findings.map((f) => [f.kind, f.severity, f.joint, f.sample]);
}

describe("timed replay: range", () => {
  it("a run of frames outside the travel is one fault at the run's first frame with the farthest value", () => {
    const result = audit([0.9, 1.02, 1.05, 1.03, 0.95]);
    // steps: 0.12, 0.03, −0.02, −0.08 rad per 0.125 s → 0.96 rad/s is a caution (above 0.9 × 1 rad/s)
    const range = result.findings.filter((f) => f.kind === "range");
    expect(range).toHaveLength(1);
    expect(range[0]).toMatchObject({ severity: "fault", joint: 0, sample: 1, endSample: 3, limit: 1 });
    expectClose(range[0].value, 1.05);
    expect(result.verdict).toBe("fault");
  });

  it("a frame exactly at a travel bound passes", () => {
    expect(audit([0.9, 0.95, 1, 0.95, 0.9]).verdict).toBe("pass");
    expect(audit([-0.9, -0.95, -1, -0.95, -0.9]).verdict).toBe("pass");
  });

  it("two separate excursions are two findings, below min and above max", () => {
    const result = audit([-0.95, -1.01, -0.95, -0.9, -0.85]);
    expect(kinds(result)).toEqual([["range", "fault", 0, 1]]);
    expect(result.findings[0].limit).toBe(-1);
  });
});

describe("timed replay: speed-over", () => {
  it("a step exactly at maxVelocity × Δt is no fault (a caution); above cautionRatio of it a caution; above it a fault", () => {
    // 0.125 rad in 0.125 s = 1 rad/s, exactly the limit: not a fault, but above 0.9 of it
    expect(kinds(audit([0, 0.125, 0.25, 0.25]))).toEqual([["speed-over", "caution", 0, 1]]);
    // 0.115 rad in 0.125 s = 0.92 rad/s: above 0.9 rad/s, not above 1 rad/s
    const caution = audit([0, 0, 0.115, 0.115]);
    expect(kinds(caution)).toEqual([["speed-over", "caution", 0, 2]]);
    expectClose(caution.findings[0].value, 0.92);
    expect(caution.verdict).toBe("caution");
    // 0.1125 rad in 0.125 s = 0.9 rad/s, exactly the caution threshold: passes
    expect(audit([0, 0, 0.1125, 0.1125]).verdict).toBe("pass");
    const fault = audit([0, 0, 0.25, 0.25]);
    expect(kinds(fault)).toEqual([["speed-over", "fault", 0, 2]]);
    expectClose(fault.findings[0].value, 2);
    expect(fault.findings[0].limit).toBe(1);
  });

  it("a run of offending steps is one finding at the later frame of its first step, with the worst speed, a fault if any step is", () => {
    // steps 2..4: 0.115 (0.92 rad/s), 0.2 (1.6 rad/s), 0.12 (0.96 rad/s), then quiet
    const result = audit([0, 0, 0.115, 0.315, 0.435, 0.435]);
    expect(kinds(result)).toEqual([["speed-over", "fault", 0, 2]]);
    expect(result.findings[0].endSample).toBe(4);
    expectClose(result.findings[0].value, 1.6);
  });

  it("a step that jumps and stays is a speed-over, not a glitch", () => {
    const result = audit([0, 0, 0.5, 0.5, 0.5]);
    expect(kinds(result)).toEqual([["speed-over", "fault", 0, 2]]);
  });

  it("uses each step's own Δt: a large step over a long Δt is within the limit", () => {
    // 0.3 rad over 0.375 s = 0.8 rad/s; the long step is a gap (0.375 > 1.5 × 0.125), not a speed-over
    const result = audit([0, 0, 0.3, 0.3, 0.3, 0.3], [0, 0.125, 0.5, 0.625, 0.75, 0.875]);
    expect(kinds(result)).toEqual([["gap", "caution", null, 2]]);
  });
});

describe("timed replay: glitch", () => {
  it("a single frame that jumps away and back is one glitch at that frame, and its two steps are no speed-over", () => {
    const result = audit([0, 0, 0.6, 0, 0]);
    expect(kinds(result)).toEqual([["glitch", "fault", 0, 2]]);
    // 0.6 rad in 0.125 s = 4.8 rad/s
    expectClose(result.findings[0].value, 4.8);
    expect(result.findings[0].limit).toBe(1);
    expect(result.findings[0].message).toMatch(/frame 3 \(t = 0\.25 s\)/);
  });

  it("a glitch needs its neighbours to agree within maxVelocity × (tₖ₊₁ − tₖ₋₁); exactly at it still is a glitch", () => {
    // neighbours 0.25 rad apart over 0.25 s = 1 rad/s, exactly the limit: agree
    expect(kinds(audit([0, 0, 0.9, 0.25, 0.25]))).toEqual([["glitch", "fault", 0, 2]]);
    // neighbours 0.3 rad apart over 0.25 s: disagree, so a speed-over run of both steps
    const result = audit([0, 0, 0.9, 0.3, 0.3]);
    expect(kinds(result)).toEqual([["speed-over", "fault", 0, 2]]);
    expect(result.findings[0].endSample).toBe(3);
  });

  it("both steps must be speed faults: a spike whose steps are only cautions is a speed-over run", () => {
    // 0.12 rad away and back: 0.96 rad/s both ways
    const result = audit([0, 0, 0.12, 0, 0]);
    expect(kinds(result)).toEqual([["speed-over", "caution", 0, 2]]);
    expect(result.findings[0].endSample).toBe(3);
  });

  it("a spike in the first frame is a speed-over, not a glitch", () => {
    expect(kinds(audit([0.6, 0, 0, 0, 0]))).toEqual([["speed-over", "fault", 0, 1]]);
  });

  it("a spike in the last frame is a speed-over, not a glitch", () => {
    expect(kinds(audit([0, 0, 0, 0, 0.6]))).toEqual([["speed-over", "fault", 0, 4]]);
  });

  it("a glitch right after a speed-over run ends the run before it; the run keeps its own steps only", () => {
    // steps 1..3 of 0.12 rad (0.96 rad/s, cautions), frame 4 spikes to 0.96 and frame 5 comes back to 0.36
    const result = audit([0, 0.12, 0.24, 0.36, 0.96, 0.36, 0.36]);
    expect(kinds(result)).toEqual([
      ["speed-over", "caution", 0, 1],
      ["glitch", "fault", 0, 4],
    ]);
    expect(result.findings[0].endSample).toBe(3);
    expectClose(result.findings[0].value, 0.96);
  });

  it("a speed-over run right after a glitch starts after the glitch's second step", () => {
    const result = audit([0, 0, 0.6, 0, 0.12, 0.24, 0.24]);
    expect(kinds(result)).toEqual([
      ["glitch", "fault", 0, 2],
      ["speed-over", "caution", 0, 4],
    ]);
    expect(result.findings[1].endSample).toBe(5);
  });

  it("in an alternating 0, a, 0, a, 0 each step belongs to one glitch: frames 1 and 3", () => {
    expect(kinds(audit([0, 0.6, 0, 0.6, 0]))).toEqual([
      ["glitch", "fault", 0, 1],
      ["glitch", "fault", 0, 3],
    ]);
  });
});

describe("timed replay: gap", () => {
  it("a step above 1.5 × the median step is a caution at the later frame, no joint, with the frames missing", () => {
    const times = [0, 0.125, 0.25, 0.5, 0.625, 0.75];
    const result = audit([0, 0, 0, 0, 0, 0], times);
    expect(kinds(result)).toEqual([["gap", "caution", null, 3]]);
    expect(result.findings[0].missingFrames).toBe(1);
    expectClose(result.findings[0].value, 0.25);
    expectClose(result.findings[0].limit, 0.1875);
    expect(result.verdict).toBe("caution");
  });

  it("a step of exactly 1.5 × the median passes", () => {
    const times = [0, 0.125, 0.25, 0.4375, 0.5625, 0.6875];
    expect(audit([0, 0, 0, 0, 0, 0], times).verdict).toBe("pass");
  });

  it("counts the frames missing from the step and the median", () => {
    const times = [0, 0.125, 0.25, 0.875, 1.0];
    const result = audit([0, 0, 0, 0, 0], times);
    // 0.625 s at a median of 0.125 s: 5 steps, 4 frames missing
    expect(result.findings[0].missingFrames).toBe(4);
  });

  it("the median of the steps is the middle one, or the mean of the middle two", () => {
    expectClose(medianStepS(Float64Array.from([0, 1, 3, 6]), 4), 2);
    expectClose(medianStepS(Float64Array.from([0, 1, 3, 6, 10]), 5), 2.5);
  });
});

describe("timed replay: invalid episodes", () => {
  it("a non-finite value makes the episode invalid with a line naming the episode, frame and joint", () => {
    const result = audit([0, 0, Number.NaN, 0]);
    expect(result.verdict).toBe("invalid");
    expect(result.findings).toEqual([]);
    expect(result.problems).toEqual(['episode ep-1: frame 3, joint "lift": position is not a finite number (NaN)']);
  });

  it("time that does not strictly increase is invalid", () => {
    const result = audit([0, 0, 0, 0], [0, 0.125, 0.125, 0.25]);
    expect(result.verdict).toBe("invalid");
    expect(result.problems[0]).toMatch(/^episode ep-1: frame 3: time 0\.125 s is not after/);
  });

  it("fewer than 2 frames is invalid", () => {
    expect(audit([0]).problems).toEqual(["episode ep-1: has 1 frame; a timed replay needs at least 2"]);
  });

  it("the wrong number of joints is invalid", () => {
    const recording: Recording = {
      names: ["lift"],
      jointCount: 1,
      count: 2,
      timeS: Float64Array.from([0, 0.125]),
      position: Float64Array.from([0, 0]),
    };
    const result = auditEpisode(armOf(), { id: "7", recording });
    expect(result.verdict).toBe("invalid");
    expect(result.problems[0]).toBe('episode 7: has 1 joint values per frame; the arm "Replay arm" has 2 joints');
  });

  it("an invalid episode does not stop the audit of the others, and the summary counts each verdict and kind", () => {
    const episodes = [
      { id: "a", recording: episodeOf([0, 0, 0]) },
      { id: "b", recording: episodeOf([0, Number.POSITIVE_INFINITY, 0]) },
      { id: "c", recording: episodeOf([0, 0, 0.6, 0, 0]) },
      { id: "d", recording: episodeOf([0, 0, 0.115, 0.115]) },
    ];
    const audits = auditEpisodes(armOf(), episodes);
    expect(audits.map((a) => a.verdict)).toEqual(["pass", "invalid", "fault", "caution"]);
    expect(summarizeAudits(audits)).toEqual({
      episodes: 4,
      pass: 1,
      caution: 1,
      fault: 1,
      invalid: 1,
      byKind: { glitch: 1, "speed-over": 1 },
    });
  });
});

describe("timed replay: output shape", () => {
  it("the JSON form has exactly the documented fields in order", () => {
    const json = auditToJson(audit([0, 0, 0.6, 0, 0]));
    expect(Object.keys(json)).toEqual(["episode", "samples", "verdict", "findings", "problems"]);
    expect(Object.keys(json.findings[0])).toEqual([
      "kind",
      "severity",
      "joint",
      "sample",
      "timeS",
      "value",
      "limit",
      "message",
    ]);
    expect(json.episode).toBe("ep-1");
  });
});

describe("episode repair", () => {
  it("replaces a glitch by the mean of its neighbours, and the repaired episode passes", () => {
    const repair = repairEpisode(armOf(), episodeOf([0, 0.05, 0.6, 0.1, 0.1]));
    expect(repair.glitchesReplaced).toBe(1);
    // mean of 0.05 and 0.1, reached at 0.9 rad/s from 0.05: 0.075 rad needs 0.0833 s of the 0.125 s step
    expectClose(repair.recording.position[2 * 2], 0.075);
    const after = auditEpisode(armOf(), { id: "r", recording: repair.recording });
    expect(after.verdict).toBe("pass");
  });

  it("fills a gap with interpolated frames, marked as filled, at the recorded frames' spacing", () => {
    const repair = repairEpisode(armOf(), episodeOf([0, 0, 0.1, 0.1], [0, 0.125, 0.5, 0.625]));
    expect(repair.framesFilled).toBe(2);
    expect(Array.from(repair.filled)).toEqual([0, 0, 1, 1, 0, 0]);
    expect(Array.from(repair.recording.timeS)).toEqual([0, 0.125, 0.25, 0.375, 0.5, 0.625]);
    expectClose(repair.recording.position[2 * 2], 0.1 / 3);
    expect(auditEpisode(armOf(), { id: "r", recording: repair.recording }).verdict).toBe("pass");
  });

  it("clamps into the travel and rate-limits a speed-over run, reporting how far it departs", () => {
    const repair = repairEpisode(armOf(), episodeOf([0.9, 1.2, 1.2, 1.2, 1.2]));
    const after = auditEpisode(armOf(), { id: "r", recording: repair.recording });
    expect(after.verdict).toBe("pass");
    // first step limited to 0.9 rad/s × 0.125 s = 0.1125 rad: 1.0125 clamped to 1; the recorded 1.2 is 0.2 away
    expectClose(repair.maxDeviation[0], 0.2, 1e-6);
  });
});

/** A smooth episode within limits: steps at most 0.8 × maxVelocity × Δt, inside the travel. */
const cleanEpisode = fc
  .record({
    start: fc.double({ min: -0.5, max: 0.5, noNaN: true }),
    steps: fc.array(fc.double({ min: -0.8, max: 0.8, noNaN: true }), { minLength: 8, maxLength: 120 }),
  })
  .map(({ start, steps }) => {
    const lift = [start];
    for (const s of steps) lift.push(Math.min(0.95, Math.max(-0.95, lift[lift.length - 1] + s * dt)));
    return lift;
  });

describe("timed replay: properties", () => {
  it("the median step equals the middle of the sorted steps (mean of the two middle ones for an even count)", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 1e-4, max: 2, noNaN: true }), { minLength: 1, maxLength: 60 }), (steps) => {
        const times = [0];
        for (const s of steps) times.push(times[times.length - 1] + s);
        const t = Float64Array.from(times);
        const sorted = Array.from(t.subarray(1))
          .map((x, i) => x - t[i])
          .sort((a, b) => a - b);
        const m = sorted.length;
        const expected = m % 2 === 1 ? sorted[(m - 1) / 2] : 0.5 * (sorted[m / 2 - 1] + sorted[m / 2]);
        expect(medianStepS(t, t.length)).toBe(expected);
      }),
    );
  });

  it("a clean generated episode passes", () => {
    fc.assert(
      fc.property(cleanEpisode, (lift) => {
        expect(audit(lift).verdict).toBe("pass");
      }),
    );
  });

  it("a spike injected at an inner frame is found as a glitch at that frame, with no speed-over", () => {
    fc.assert(
      fc.property(
        cleanEpisode,
        fc.nat(),
        fc.double({ min: 0.3, max: 0.9, noNaN: true }),
        fc.boolean(),
        (lift, at, size, up) => {
          const k = 1 + (at % (lift.length - 2));
          // neighbours within 0.8 × limit: the spike steps are above 0.3 − 0.1 = 0.2 rad = 1.6 rad/s each way
          const spiked = [...lift];
          spiked[k] = lift[k] + (up ? size : -size);
          const result = audit(spiked);
          const glitches = result.findings.filter((f) => f.kind === "glitch");
          expect(glitches.map((f) => f.sample)).toEqual([k]);
          expect(result.findings.filter((f) => f.kind === "speed-over")).toEqual([]);
        },
      ),
    );
  });

  it("repair output of an episode with spikes, jumps, excursions and gaps audits clean", () => {
    fc.assert(
      fc.property(
        cleanEpisode,
        fc.array(fc.record({ at: fc.nat(), offset: fc.double({ min: -2, max: 2, noNaN: true }), hold: fc.boolean() }), {
          maxLength: 5,
        }),
        fc.array(fc.nat(), { maxLength: 3 }),
        (lift, defects, gaps) => {
          const q = [...lift];
          for (const d of defects) {
            const k = d.at % q.length;
            if (d.hold) for (let i = k; i < q.length; i++) q[i] += d.offset;
            else q[k] += d.offset;
          }
          const times = q.map((_, k) => k * dt);
          for (const g of gaps) {
            const k = 1 + (g % (q.length - 1));
            for (let i = k; i < times.length; i++) times[i] += 2 * dt;
          }
          const before = audit(q, times);
          expect(before.verdict).not.toBe("invalid");
          const repair = repairEpisode(armOf(), episodeOf(q, times));
          const after = auditEpisode(armOf(), { id: "r", recording: repair.recording });
          expect(after.findings).toEqual([]);
        },
      ),
    );
  });
});
