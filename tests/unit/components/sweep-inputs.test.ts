// The duration sweep is computed again only when what it depends on changes (sweepInputs): an edit of
// another move must leave the key, the engine's sweep and the move's shortest safe duration (which
// sets the sweep's range and is not in the key) unchanged; an edit of this move's path or of the arm
// must change the key. The engine's own sweep and check are the reference for "unchanged".
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { check, moveTimingSweep, parsePlan, type Plan } from "@/kinematics";
import { sweepInputs } from "@/components/plots/duration-sweep";
import { heavyPlan } from "@/bench/plans";

function parse(doc: unknown): Plan {
  const r = parsePlan(doc);
  if (!r.ok) throw new Error(r.problems.map((p) => p.message).join("; "));
  return r.value;
}

const base = heavyPlan(5);
const durations = [0.4, 0.9, 1.6, 2.5];

describe("sweepInputs", () => {
  it("an edit of a later move, or of the duration of an earlier one, keeps the key and the sweep of move 2", () => {
    fc.assert(
      fc.property(
        fc.constantFrom(0, 1, 3, 4),
        fc.double({ min: 0.3, max: 3, noNaN: true }),
        fc.double({ min: -0.2, max: 0.2, noNaN: true }),
        (other, duration, nudge) => {
          const plan = parse(base);
          const moves = base.moves.map((m, i) =>
            i !== other ? m : i > 2 ? { ...m, goal: m.goal.map((g) => g + nudge), duration } : { ...m, duration },
          );
          const edited = parse({ ...base, moves });
          const key = (p: Plan) => sweepInputs(p, 2, p.moves[2].duration);
          expect(key(edited)).toBe(key(plan));
          expect(moveTimingSweep(edited, 2, durations)).toEqual(moveTimingSweep(plan, 2, durations));
          expect(check(edited).moves[2].minSafeDuration).toBe(check(plan).moves[2].minSafeDuration);
        },
      ),
      { numRuns: 25, seed: 3 },
    );
  });

  it("an edit of the previous goal, this goal or shape, the payload or a joint limit changes the key (and the sweep)", () => {
    const plan = parse(base);
    const key = (p: Plan) => sweepInputs(p, 2, 2);
    const nudged = (i: number) => base.moves.map((m, k) => (k === i ? { ...m, goal: m.goal.map((g) => g + 0.05) } : m));
    const variants: Plan[] = [
      parse({ ...base, moves: nudged(1) }),
      parse({ ...base, moves: nudged(2) }),
      parse({ ...base, moves: base.moves.map((m, k) => (k === 2 ? { ...m, shape: "cubic" as const } : m)) }),
      parse({ ...base, payload: { mass: 0.3 } }),
      parse({
        ...base,
        arm: { ...base.arm, joints: base.arm.joints.map((j, k) => (k === 1 ? { ...j, maxEffort: 9 } : j)) },
      }),
    ];
    expect(sweepInputs(plan, 2, 2.5)).not.toBe(key(plan)); // the current duration sets the range
    for (const v of variants) {
      expect(key(v)).not.toBe(key(plan));
      expect(moveTimingSweep(v, 2, durations)).not.toEqual(moveTimingSweep(plan, 2, durations));
    }
  });
});
