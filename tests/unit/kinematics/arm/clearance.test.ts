import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { armChainSchema } from "@/kinematics/plan/arm-model";
import { compileChain } from "@/kinematics/arm/chain";
import {
  boxSignedDistance,
  capsuleBoxDepth,
  clearanceZones,
  compileCollision,
  createClearanceScanner,
  orientedBoxIntrusion,
  scanClearance,
  segmentBoxSignedDistance,
} from "@/kinematics/arm/clearance";
import * as mat4 from "@/kinematics/arm/mat4";
import { expectClose } from "../tolerance";

const unitMin = [-0.5, -0.5, -0.5],
  unitMax = [0.5, 0.5, 0.5];

describe("distance and intrusion primitives", () => {
  it("box signed distance: outside a corner region by (0.3, 0.4, 0) is 0.5 (3-4-5 triangle); inside it is minus the nearest face distance", () => {
    expectClose(boxSignedDistance(0.8, 0.9, 0, unitMin, unitMax), 0.5, 1e-12);
    expectClose(boxSignedDistance(0.1, 0, 0, unitMin, unitMax), -0.4, 1e-12);
    expectClose(boxSignedDistance(0.5, 0, 0, unitMin, unitMax), 0, 1e-12); // on the face
  });

  it("segment-to-box distance equals the minimum over densely sampled points of the segment (within the sampling step)", () => {
    const v = fc.tuple(
      fc.double({ min: -2, max: 2, noNaN: true }),
      fc.double({ min: -2, max: 2, noNaN: true }),
      fc.double({ min: -2, max: 2, noNaN: true }),
    );
    fc.assert(
      fc.property(v, v, (a, b) => {
        let brute = Infinity;
        for (let k = 0; k <= 1000; k++) {
          const t = k / 1000;
          brute = Math.min(
            brute,
            boxSignedDistance(
              a[0] + t * (b[0] - a[0]),
              a[1] + t * (b[1] - a[1]),
              a[2] + t * (b[2] - a[2]),
              unitMin,
              unitMax,
            ),
          );
        }
        const d = segmentBoxSignedDistance(a, b, unitMin, unitMax);
        // The sampled minimum is an upper bound; the true one is at most (segment length / 1000) × slope 1 below it.
        expect(d).toBeLessThanOrEqual(brute + 1e-6);
        expect(d).toBeGreaterThanOrEqual(brute - Math.hypot(b[0] - a[0], b[1] - a[1], b[2] - a[2]) / 1000 - 1e-9);
      }),
      { numRuns: 200 },
    );
  });

  it("capsule depth into a box is never below the true depth r − distance, also where the quick bounding-box test answers (it once answered −r, claiming a separation of a whole radius for a capsule that nearly touches)", () => {
    // spread evenly over the cube (fast-check's doubles favour the ends and zero, which line up with the box)
    const c = fc.integer({ min: -1500, max: 1500 }).map((x) => x / 1000 + 1e-4);
    const v = fc.tuple(c, c, c);
    let quick = 0;
    fc.assert(
      fc.property(v, v, fc.double({ min: 0.005, max: 0.3, noNaN: true }), (a, b, r) => {
        const exact = r - segmentBoxSignedDistance(a, b, unitMin, unitMax);
        const depth = capsuleBoxDepth(a, b, r, unitMin, unitMax);
        expect(depth).toBeGreaterThanOrEqual(exact - 1e-6); // the golden-section search's own tolerance
        if (depth < 0 && Math.abs(depth - exact) > 1e-6) quick++;
        if (exact > 1e-6) expect(depth).toBeGreaterThan(0); // an intrusion is never hidden
      }),
      { numRuns: 2000, seed: 5 },
    );
    expect(quick).toBeGreaterThan(100); // the bounding-box answer was exercised
    // nearly touching along x: the capsule x ∈ [0.51, 0.61] (radius 0.05 round a segment at x = 0.56) is 0.01 from the box
    expectClose(capsuleBoxDepth([0.56, 0, 0], [0.56, 0.2, 0], 0.05, unitMin, unitMax), -0.01, 1e-12);
  });

  it("oriented box into an axis-aligned box: overlap along x for a box turned 45° about z (worked by hand)", () => {
    // Unit cube turned 45° about z at x = 1: its x half-extent is 0.5·√2, so the overlap with the unit cube at the
    // origin is 0.5·√2 + 0.5 − 1 ≈ 0.2071; the other separating axes give larger overlaps (0.5 along the turned axes).
    const w = mat4.fromXyzRpy(new Float64Array(16), [1, 0, 0], [0, 0, Math.PI / 4]);
    expectClose(orientedBoxIntrusion(w, 0, [0.5, 0.5, 0.5], 0, unitMin, unitMax), 0.5 * Math.SQRT2 - 0.5, 1e-12);
    const far = mat4.fromXyzRpy(new Float64Array(16), [3, 0, 0], [0, 0, Math.PI / 4]);
    expect(orientedBoxIntrusion(far, 0, [0.5, 0.5, 0.5], 0, unitMin, unitMax)).toBeLessThan(0);
  });
});

describe("scanning a move for clearance", () => {
  // One revolute joint about y at height 0.2 m carrying a capsule 0.5 m long along x, radius 0.02 m.
  const chain = armChainSchema.parse({
    base: { name: "post", collision: [{ kind: "capsule", from: [0, 0, 0], to: [0, 0, 0.2], radius: 0.05 }] },
    joints: [
      {
        origin: { xyz: [0, 0, 0.2] },
        axis: [0, 1, 0],
        link: { name: "boom", collision: [{ kind: "capsule", from: [0, 0, 0], to: [0.5, 0, 0], radius: 0.02 }] },
      },
    ],
  });
  const compiled = compileChain(chain, ["revolute"]);
  const model = compileCollision(chain);

  function sweep(fromRad: number, toRad: number, zones = clearanceZones()) {
    const count = 101;
    const q = new Float64Array(count),
      t = new Float64Array(count);
    for (let k = 0; k < count; k++) {
      t[k] = k / 100;
      q[k] = fromRad + ((toRad - fromRad) * k) / 100;
    }
    return scanClearance(createClearanceScanner(compiled, model, zones), q, 1, t, count);
  }

  it("a boom swung down until its tip is 0.5·sin(q) − 0.2 below the table reports that depth plus its radius, at the end", () => {
    // Rotation +q about y lowers the tip to z = 0.2 − 0.5·sin q; intrusion = r − (z_tip) (derived).
    const hits = sweep(0, 0.7);
    expect(hits).toHaveLength(1);
    expect(hits[0].linkName).toBe("boom");
    expect(hits[0].zoneName).toBe("the work surface");
    expectClose(hits[0].depthM, 0.02 - (0.2 - 0.5 * Math.sin(0.7)), 1e-12);
    expectClose(hits[0].timeS, 1, 1e-12);
    // First contact when 0.2 − 0.5·sin q = 0.02 ⇒ q = asin(0.36) ≈ 0.3683 rad, i.e. t ≈ 0.526 s; first sample after is 0.53 s.
    expectClose(hits[0].firstTimeS, 0.53, 1e-12);
  });

  it("a surface margin counts as part of the intrusion, and the base standing on the table is never reported", () => {
    const hits = sweep(0, 0.3, clearanceZones(0.05));
    // Tip at 0.2 − 0.5·sin 0.3 = 0.05224 m; lowest point 0.03224 m; margin 0.05 ⇒ 17.76 mm into the margin.
    expect(hits.map((h) => h.linkName)).toEqual(["boom"]);
    expectClose(hits[0].depthM, 0.05 - (0.2 - 0.5 * Math.sin(0.3) - 0.02), 1e-12);
  });

  it("a keep-out box in the boom's path is reported by name; the same path clear of it is not", () => {
    const zones = clearanceZones(0, [{ name: "fixture", min: [0.3, -0.1, 0.1], max: [0.6, 0.1, 0.15] }]);
    const hits = sweep(-0.5, 0.2, zones);
    expect(hits.map((h) => h.zoneName)).toEqual(["fixture"]);
    expect(hits[0].depthM).toBeGreaterThan(0);
    expect(sweep(-0.5, -0.3, zones)).toEqual([]);
  });
});
