/**
 * 2,000 generated check documents (fast-check) against POST /api/v1/check on the running server:
 * plans for the light demo arm with poses inside and outside travel, instant and short moves,
 * unknown shapes and fields, wrong pose lengths and out-of-range numbers. Every document gets an
 * answer below 500, and a 2xx answer never says pass where the engine run in this process says
 * otherwise (or refuses the document). The slowest answer is printed as a figure, not asserted.
 */
import "./_env";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { check, parsePlan } from "@/kinematics";
import { demoArm, http, makeUser, tokenFor, type Auth } from "./_probe";

const RUNS = 2000;
const SEED = 20261202;
const arm = demoArm.description;
const n = arm.joints.length;
let auth: Auth;

const number = fc.oneof(
  { weight: 40, arbitrary: fc.double({ min: -3.5, max: 3.5, noNaN: true }) },
  { weight: 1, arbitrary: fc.constantFrom(0, -0, 1e-12, 1e6, -1e6, 1e308) },
);
const pose = fc.oneof(
  { weight: 40, arbitrary: fc.array(number, { minLength: n, maxLength: n }) },
  { weight: 1, arbitrary: fc.array(number, { minLength: 0, maxLength: n + 2 }) },
);
const duration = fc.oneof(
  { weight: 8, arbitrary: fc.constant(0) },
  { weight: 4, arbitrary: fc.double({ min: 1e-4, max: 0.01, noNaN: true }) },
  { weight: 24, arbitrary: fc.double({ min: 0.01, max: 2, noNaN: true }) },
  { weight: 4, arbitrary: fc.constantFrom(-1, 1e9, 0.001) },
  // long moves are slow to check (a 503 past the time limit is an honest answer); rare, to keep CI short
  { weight: 1, arbitrary: fc.constantFrom(5, 30) },
);
const shape = fc.oneof(
  { weight: 40, arbitrary: fc.constantFrom("cubic", "quintic", "trapezoid") },
  { weight: 1, arbitrary: fc.constantFrom("bogus", "", "CUBIC") },
);
const move = fc.record(
  {
    goal: pose,
    duration,
    shape,
    extra: fc.oneof(
      { weight: 40, arbitrary: fc.constant("none") },
      { weight: 1, arbitrary: fc.constantFrom("durationS", "speed", "note") },
    ),
  },
  { requiredKeys: ["goal", "duration", "extra"] },
);
const document = fc
  .record({
    moves: fc.array(move, { minLength: 0, maxLength: 4 }),
    start: pose,
    controlRateHz: fc.oneof(
      { weight: 40, arbitrary: fc.constantFrom(100, 500, 1000) },
      { weight: 1, arbitrary: fc.constantFrom(0, -5) },
    ),
    velocityScale: fc.constantFrom(1, 0.5, 0.05),
    unknownTop: fc.option(fc.constantFrom("arms", "startPose", "cautionRatio"), { nil: undefined, freq: 2 }),
    nearLimit: fc.option(
      fc.record({
        joint: fc.nat({ max: 5 }),
        ratio: fc.double({ min: 0.85, max: 1.05, noNaN: true }),
        travel: fc.double({ min: 0.2, max: 1, noNaN: true }),
      }),
      { nil: undefined, freq: 3 },
    ),
  })
  .map((g) => {
    const doc: Record<string, unknown> = {
      format: "jointproof.plan",
      version: 1,
      arm: {
        ...arm,
        controlRateHz: g.controlRateHz,
        joints: arm.joints.map((j) => ({ ...j, maxVelocity: j.maxVelocity * g.velocityScale })),
      },
      start: g.start,
      moves: g.moves.map(({ extra, ...m }) =>
        extra === "none" ? m : extra === "note" ? { ...m, note: "fuzz" } : { ...m, [extra]: 1 },
      ),
    };
    if (g.unknownTop) doc[g.unknownTop] = 1;
    if (g.nearLimit) {
      // one quintic move whose peak speed is `ratio` × the joint's (scaled) limit: peak = 1.875·D/T
      // (Lynch & Park, Modern Robotics, 2017, §9.2.1 — memory; REFERENCES.md), so T = 1.875·D / (ratio·v)
      const { joint, ratio, travel } = g.nearLimit;
      const limit = arm.joints[joint].maxVelocity * g.velocityScale;
      const start = arm.joints.map((j) => (j.min + j.max) / 2);
      const goal = start.slice();
      goal[joint] = Math.min(arm.joints[joint].max, start[joint] + travel);
      doc.start = start;
      doc.moves = [{ goal, duration: (1.875 * (goal[joint] - start[joint])) / (ratio * limit), shape: "quintic" }];
    }
    return doc;
  });

beforeAll(async () => {
  const u = await makeUser("researcher", "fuzz");
  auth = { bearer: await tokenFor(u.id) };
});

describe("fuzzed check documents", () => {
  it(`${RUNS} generated documents: an answer below 500 for each, and no pass the engine in-process does not give`, async () => {
    const docs = fc.sample(document, { numRuns: RUNS, seed: SEED });
    const failures: string[] = [];
    const statuses = new Map<number, number>();
    const verdicts = new Map<string, number>();
    let slowestMs = 0;
    let disagreements = 0;
    const pastTimeLimit: string[] = [];
    const started = performance.now();
    for (const [i, doc] of docs.entries()) {
      const res = await http("/api/v1/check", { auth, json: doc });
      slowestMs = Math.max(slowestMs, res.ms);
      statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
      if (res.status >= 500 && res.status !== 503) failures.push(`#${i}: ${res.status} ${res.text.slice(0, 160)}`);
      if (res.status === 503 && !res.headers.get("retry-after")) failures.push(`#${i}: 503 without Retry-After`);
      if (res.status === 503) {
        const d = doc as { arm: { controlRateHz: number }; moves: { duration: number; shape?: string }[] };
        const moves = d.moves.map((m) => `${m.duration} s ${m.shape ?? "(no shape)"}`).join(", ");
        pastTimeLimit.push(`#${i}: ${d.arm.controlRateHz} Hz; ${moves}; answered in ${res.ms.toFixed(0)} ms`);
      }
      if (res.status >= 200 && res.status < 300) {
        const verdict = (res.body as { report: { verdict: string } }).report.verdict;
        verdicts.set(verdict, (verdicts.get(verdict) ?? 0) + 1);
        const parsed = parsePlan(doc);
        if (!parsed.ok) {
          failures.push(
            `#${i}: the server checked a document the engine refuses: ${JSON.stringify(doc).slice(0, 200)}`,
          );
          continue;
        }
        const local = check(parsed.value).verdict;
        if (local !== verdict) disagreements++;
        if (verdict === "pass" && local !== "pass")
          failures.push(`#${i}: the server says pass, the engine in-process says ${local}`);
      }
    }
    console.log(
      `[fuzz] ${RUNS} documents (seed ${SEED}) in ${((performance.now() - started) / 1000).toFixed(1)} s; ` +
        `slowest answer ${slowestMs.toFixed(0)} ms; statuses ${JSON.stringify(Object.fromEntries(statuses))}; ` +
        `verdicts ${JSON.stringify(Object.fromEntries(verdicts))}; ${disagreements} verdicts differ from the in-process engine`,
    );
    if (pastTimeLimit.length) console.log(`[fuzz] stopped at the check time limit (503):\n${pastTimeLimit.join("\n")}`);
    expect(failures).toEqual([]);
    // the generator must reach the engine, and every verdict, or the run proves little
    expect([...verdicts.keys()].sort()).toEqual(["caution", "fault", "pass"]);
    expect(statuses.get(400) ?? 0).toBeGreaterThan(0);
  }, 300_000);
});
