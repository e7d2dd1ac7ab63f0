import { describe, expect, it } from "vitest";
import { check, checkAcceleration, checkGoalRange, checkSpeed, checkStartRange } from "@/kinematics";
import { parsePlan, type Plan } from "@/kinematics";
import type { MoveReport } from "@/kinematics/check/report";
import { readJson } from "../arm/helpers";
import { expectClose } from "../tolerance";

function plan(doc: unknown): Plan {
  const r = parsePlan(doc);
  if (!r.ok) throw new Error(r.problems.map((p) => `${p.path}: ${p.message}`).join("\n"));
  return r.value;
}
const fixture = (name: string) => readJson(`tests/fixtures/arm-plans/${name}.json`) as Record<string, unknown>;
type ArmMoveReport = MoveReport & { peakEffort?: (number | null)[]; peakToolSpeed?: number };

describe("a version-1 document without the arm model means exactly the same", () => {
  it("with the chain removed, the report equals the joint checks alone and carries no arm figures", () => {
    const doc = fixture("reach-out-heavy");
    const { chain: _chain, ...armWithout } = doc.arm as Record<string, unknown>;
    const p = plan({ ...doc, arm: armWithout });
    const joint = check(p, {
      planCheckers: [checkStartRange],
      moveCheckers: [checkGoalRange, checkSpeed, checkAcceleration],
    });
    expect(check(p)).toEqual(joint);
    expect(Object.keys(check(p).moves[0])).not.toContain("peakEffort");
  });
});

describe("effort-over", () => {
  it("using the light arm's model for a plan run on the heavy gripper arm hides an effort fault (the wrong-variant mistake)", () => {
    // Common practice (no published source): the two tool variants weigh differently, so their effort verdicts differ.
    const light = check(plan(fixture("reach-out-light")));
    const heavy = check(plan(fixture("reach-out-heavy")));
    expect(light.verdict).toBe("pass");
    expect(heavy.verdict).toBe("fault");
    expect(heavy.findings.map((f) => [f.kind, f.move, f.joint, f.severity])).toEqual([
      ["effort-over", 0, 1, "fault"],
      ["effort-over", 1, 1, "caution"],
    ]);
  });

  it("reports peak effort per joint per move, null for the gripper outside the chain, and the finding's value is that peak", () => {
    const r = check(plan(fixture("reach-out-heavy")));
    const m0 = r.moves[0] as ArmMoveReport;
    expect(m0.peakEffort).toHaveLength(7);
    expect(m0.peakEffort![6]).toBeNull();
    expectClose(r.findings[0].value, m0.peakEffort![1]!, 1e-12);
    expect(r.findings[0].limit).toBe(14);
  });

  it("a caution that gravity alone causes says that no duration fixes it", () => {
    const r = check(plan(fixture("reach-out-heavy")));
    expect(r.findings[1].message).toMatch(/Gravity alone needs 13\.\d+ N·m .* no duration fixes it/);
  });

  it("a dynamic effort fault names a duration that passes, and 2% shorter than it still faults", () => {
    const doc = fixture("reach-out-heavy");
    const r = check(plan(doc));
    const m = /at least ([\d.]+) s/.exec(r.findings[0].message);
    expect(m).not.toBeNull();
    const fixS = Number(m![1]);
    const withDuration = (T: number) => {
      const moves = (doc.moves as Record<string, unknown>[]).map((mv, i) => (i === 0 ? { ...mv, duration: T } : mv));
      return check(plan({ ...doc, moves })).findings.filter(
        (f) => f.move === 0 && f.kind === "effort-over" && f.severity === "fault",
      );
    };
    expect(withDuration(fixS)).toEqual([]);
    expect(withDuration(fixS * 0.98)).toHaveLength(1);
  });

  it("a start pose the heavy arm cannot hold is an effort finding with move null", () => {
    const doc = fixture("reach-out-heavy");
    const r = check(plan({ ...doc, start: [0, 1.5, 0, 0, 0, 0, 0], payload: { mass: 0.5 } }));
    const start = r.findings.filter((f) => f.move === null && f.kind === "effort-over");
    expect(start.map((f) => [f.joint, f.severity])).toContainEqual([1, "fault"]);
    expect(start[0].message).toMatch(/no duration fixes it/);
  });

  it("a payload raises the shoulder's peak effort", () => {
    const doc = fixture("reach-out-light");
    const bare = check(plan(doc)).moves[0] as ArmMoveReport;
    const loaded = check(plan({ ...doc, payload: { mass: 0.5, com: [0, 0, 0.02] } })).moves[0] as ArmMoveReport;
    expect(loaded.peakEffort![1]! - bare.peakEffort![1]!).toBeGreaterThan(0.5 * 9.81 * 0.5); // lever ≥ 0.5 m at horizontal
  });
});

describe("clearance", () => {
  it("a move that lowers the handle into the bench is a clearance fault naming the link, time and depth", () => {
    const r = check(plan(fixture("clip-surface")));
    expect(r.verdict).toBe("fault");
    const f = r.findings.find((x) => x.kind === "clearance") as (typeof r.findings)[number] & {
      link: string;
      time: number;
      zone: string;
    };
    expect(f.link).toBe("handle");
    expect(f.zone).toBe("work surface");
    expect(f.value).toBeGreaterThan(0.1);
    expect(f.joint).toBeNull();
    expect(f.message).toMatch(/does not depend on the duration/);
  });

  it("the intrusion depth does not change with the duration (path geometry), while its time scales", () => {
    const doc = fixture("clip-surface");
    const at = (T: number) => {
      const moves = (doc.moves as Record<string, unknown>[]).map((mv) => ({ ...mv, duration: T }));
      return check(plan({ ...doc, moves })).findings.filter((f) => f.kind === "clearance");
    };
    const a = at(2),
      b = at(8);
    expect(b.map((f) => f.value)).toHaveLength(a.length);
    a.forEach((f, i) => expectClose(b[i].value, f.value, 1e-9, 1e-9));
  });
});

describe("end to end: Cartesian targets, a payload and a keep-out box (tests/fixtures/arm-plans/bench-e2e.json)", () => {
  const r = check(plan(fixture("bench-e2e")));

  it("finds the tray intrusion, the tool-speed faults and the effort faults where they belong", () => {
    const kinds = (move: number) => [...new Set(r.findings.filter((f) => f.move === move).map((f) => f.kind))];
    expect(kinds(0)).toEqual(["effort-over", "clearance", "tool-speed"]);
    const tray = r.findings.find((f) => f.kind === "clearance") as (typeof r.findings)[number] & { zone: string };
    expect(tray.zone).toBe("parts tray");
    expect(kinds(2)).toContain("effort-over");
  });

  it("tool-speed: the reported peak is the move's peakToolSpeed and the suggested duration passes", () => {
    const f = r.findings.find((x) => x.kind === "tool-speed" && x.move === 0)!;
    expectClose(f.value, (r.moves[0] as ArmMoveReport).peakToolSpeed!, 1e-12);
    expect(f.limit).toBe(0.25);
    // Tool speed scales as 1/T on the same path, so T' = T·peak/limit brings it to the limit (derived).
    const doc = fixture("bench-e2e");
    const fixS = Number(/at least ([\d.]+) s/.exec(f.message)![1]);
    const moves = (doc.moves as Record<string, unknown>[]).map((mv, i) => (i === 0 ? { ...mv, duration: fixS } : mv));
    const again = check(plan({ ...doc, moves })).findings.filter(
      (x) => x.kind === "tool-speed" && x.move === 0 && x.severity === "fault",
    );
    expect(again).toEqual([]);
  });
});

describe("tool-speed on an instant move", () => {
  it("is the tool's straight-line step times the control rate (the step is covered in one control period, derived)", () => {
    const doc = fixture("reach-out-light");
    const goal = [0, 0.3, 0, 0, 0, 0, 0];
    const r = check(plan({ ...doc, maxToolSpeed: 0.25, moves: [{ goal, duration: 0 }] }));
    // Shoulder 0.3 rad with everything above it straight: the tool point (0.74 m from the shoulder axis along the
    // arm, demo arm L) moves on a circle; chord = 2·0.74·sin(0.15) m (derived), at 1000 Hz.
    const chordM = 2 * 0.74 * Math.sin(0.15);
    const f = r.findings.find((x) => x.kind === "tool-speed")!;
    expectClose(f.value, chordM * 1000, 1e-9, 1e-9);
    expect(f.message).toMatch(/would jump 221\.\d mm in one control period/);
  });
});
