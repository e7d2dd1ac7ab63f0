import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { armFromDescription, compileChain, createChainBuffers, forwardKinematics } from "@/kinematics/arm/chain";
import { parseArm } from "@/kinematics";
import { parseUrdf } from "@/kinematics/arm/urdf";
import { readJson, repoPath } from "./helpers";
import { expectAllClose, expectClose } from "../tolerance";

const fixture = readFileSync(repoPath("tests/fixtures/urdf/every-element.urdf"), "utf8");

function parsed(xml: string) {
  const r = parseUrdf(xml);
  if (!r.ok) throw new Error(r.problems.map((p) => `${p.element}: ${p.message}`).join("\n"));
  return r.value;
}

describe("URDF import of a hand-written file using every element (URDF XML specification)", () => {
  const d = parsed(fixture);

  it("lists the moving joints in chain order with types, limits, origins and axes", () => {
    expect(d.name).toBe("fixture-arm");
    expect(d.joints.map((j) => [j.name, j.type])).toEqual([
      ["spin", "continuous"],
      ["lift", "prismatic"],
      ["hinge", "revolute"],
    ]);
    const [spin, lift, hinge] = d.joints;
    // Continuous: no travel. Fixed riser-mount (0, 0, 0.1) folded into spin's origin (0, 0, 0.2) ⇒ (0, 0, 0.3).
    expect([spin.min, spin.max]).toEqual([null, null]);
    expectAllClose(spin.origin.xyz, [0, 0, 0.3], 1e-12);
    expectAllClose(spin.axis, [0, 0, 1]);
    expect(spin.friction).toEqual({ coulomb: 0.1, viscous: 0.2 }); // <dynamics friction> → Coulomb, damping → viscous
    expect([spin.maxVelocity, spin.maxEffort]).toEqual([3, 20]);
    // Prismatic: axis (0, 0, 2) normalised; origin rpy kept.
    expect([lift.min, lift.max, lift.maxVelocity, lift.maxEffort]).toEqual([-0.1, 0.2, 0.5, 50]);
    expectAllClose(lift.origin.xyz, [0.3, 0, 0]);
    expectAllClose(lift.origin.rpy, [Math.PI / 2, 0, 0], 1e-12);
    expectAllClose(lift.axis, [0, 0, 1]);
    // Revolute without <origin> (identity) and <axis> (default 1 0 0); <limit lower> defaults to 0.
    expect([hinge.min, hinge.max]).toEqual([0, 1.2]);
    expectAllClose(hinge.origin.xyz, [0, 0, 0]);
    expectAllClose(hinge.axis, [1, 0, 0]);
    expect(hinge.friction).toEqual({ coulomb: 0, viscous: 0 }); // <dynamics> absent ⇒ 0
  });

  it("folds fixed links' mass into the moving link before them, by the parallel-axis theorem (worked by hand)", () => {
    // Base 3 kg at z = 0.05 plus riser 1 kg at z = 0.1: com z = (0.15 + 0.1)/4 = 0.0625;
    // ixx = 0.01 + 3·0.0125² + 0.001 + 1·0.0375² = 0.012875; izz = 0.02 + 0.001 (offsets along z only).
    const base = d.links[0].inertial!;
    expectClose(base.mass, 4, 1e-12);
    expectAllClose(base.com, [0, 0, 0.0625], 1e-12);
    expectClose(base.inertia.ixx, 0.012875, 1e-12);
    expectClose(base.inertia.izz, 0.021, 1e-12);
    // Turntable: inertia given in a frame turned 90° about z ⇒ ixx and iyy swap (R·I·Rᵀ).
    const tt = d.links[1].inertial!;
    expectAllClose(tt.com, [0.1, 0, 0], 1e-12);
    expectAllClose([tt.inertia.ixx, tt.inertia.iyy, tt.inertia.izz, tt.inertia.ixy], [0.02, 0.01, 0.03, 0], 1e-12);
    // Slider carries the fixed lamp: 0.5 kg at (0, 0.1, 0).
    const sl = d.links[2].inertial!;
    expectClose(sl.mass, 0.5, 1e-12);
    expectAllClose(sl.com, [0, 0.1, 0], 1e-12);
    expect(d.links[3].inertial).toBeUndefined();
  });

  it("turns primitive collision geometry into shapes (cylinder → capsule) and skips meshes", () => {
    expect(d.links[0].collision).toEqual([{ kind: "capsule", from: [0, 0, 0], to: [0, 0, 0.1], radius: 0.1 }]);
    expect(d.links[1].collision).toEqual([{ kind: "sphere", center: [0.1, 0, 0], radius: 0.05 }]);
    const box = d.links[2].collision[0];
    expect(box.kind).toBe("box");
    if (box.kind !== "box") return;
    expectAllClose(box.center, [0, 0, 0.1], 1e-12);
    expectAllClose(box.size, [0.1, 0.2, 0.3]);
    expectAllClose(box.rpy, [0, 0, 0.5], 1e-12);
  });

  it("puts the tool point at the trailing fixed joint's child", () => {
    expectAllClose(d.tool.xyz, [0.25, 0, 0], 1e-12);
    expectAllClose(d.tool.rpy, [0, Math.PI / 2, 0], 1e-9);
  });
});

describe("the demo arms' URDF files describe the same arms as their JSON", () => {
  for (const key of ["bench-arm-l", "bench-arm-h"]) {
    it(`${key}: same joints, limits and masses, and the same tool pose for random poses`, () => {
      const fromUrdf = armFromDescription(parsed(readFileSync(repoPath(`kinematics/arm/presets/${key}.urdf`), "utf8")));
      const json = parseArm(readJson(`kinematics/arm/presets/${key}.json`));
      expect(json.ok).toBe(true);
      if (!json.ok) return;
      const arm = json.value;
      expect(fromUrdf.joints.map((j) => [j.name, j.min, j.max, j.maxVelocity, j.maxEffort])).toEqual(
        arm.joints.slice(0, 6).map((j) => [j.name, j.min, j.max, j.maxVelocity, j.maxEffort]),
      );
      const a = compileChain(
        arm.chain!,
        arm.joints.map((j) => j.type),
      );
      const b = compileChain(
        fromUrdf.chain,
        fromUrdf.joints.map((j) => j.type),
      );
      expectAllClose(b.mass, a.mass, 1e-12);
      expectAllClose(b.com, a.com, 1e-12);
      fc.assert(
        fc.property(fc.array(fc.double({ min: -3, max: 3, noNaN: true }), { minLength: 6, maxLength: 6 }), (q) => {
          expectAllClose(
            forwardKinematics(b, q, createChainBuffers(b)),
            forwardKinematics(a, q, createChainBuffers(a)),
            1e-12,
            1e-12,
          );
        }),
      );
    });
  }
});

describe("bad URDF files give problems naming the element, never a crash", () => {
  const problemsOf = (xml: string) => {
    const r = parseUrdf(xml);
    expect(r.ok).toBe(false);
    return r.ok ? [] : r.problems;
  };
  const edit = (from: string, to: string) => {
    expect(fixture.includes(from), from).toBe(true);
    return fixture.replace(from, to);
  };

  it("a joint naming a parent link that does not exist", () => {
    const p = problemsOf(edit('<parent link="riser"/>', '<parent link="nowhere"/>'));
    expect(p).toEqual([{ element: 'joint "spin" <parent>', message: 'names link "nowhere", which is not defined' }]);
  });

  it("a cycle of joints", () => {
    const xml = edit(
      "</robot>",
      '<link name="a"/><link name="b"/><joint name="ab" type="fixed"><parent link="a"/><child link="b"/></joint>' +
        '<joint name="ba" type="fixed"><parent link="b"/><child link="a"/></joint></robot>',
    );
    expect(problemsOf(xml)).toEqual([{ element: 'joints "ab", "ba"', message: "form a cycle; a URDF must be a tree" }]);
  });

  it("an unknown joint type, and a floating joint", () => {
    expect(problemsOf(edit('name="spin" type="continuous"', 'name="spin" type="spinning"'))[0]).toEqual({
      element: 'joint "spin" type',
      message: '"spinning" is not a URDF joint type (revolute, continuous, prismatic, fixed, floating, planar)',
    });
    expect(problemsOf(edit('name="spin" type="continuous"', 'name="spin" type="floating"'))[0].message).toMatch(
      /not supported/,
    );
  });

  it("non-numbers in an origin, a limit and a mass", () => {
    expect(problemsOf(edit('xyz="0.3 0 0"', 'xyz="0.3 zero 0"'))).toEqual([
      { element: 'joint "lift" <origin xyz>', message: '"0.3 zero 0" is not 3 numbers' },
    ]);
    expect(problemsOf(edit('effort="50"', 'effort="lots"'))).toEqual([
      { element: 'joint "lift" <limit effort>', message: '"lots" is not a number' },
    ]);
    expect(problemsOf(edit('<mass value="2"/>', '<mass value="NaN"/>'))).toEqual([
      { element: 'link "turntable" <inertial><mass value>', message: '"NaN" is not a number' },
    ]);
  });

  it("a revolute joint without <limit>, and a limit without velocity", () => {
    expect(problemsOf(edit('<limit upper="1.2" effort="5" velocity="2"/>', ""))).toEqual([
      { element: 'joint "hinge" <limit>', message: "is required on a revolute joint" },
    ]);
    expect(problemsOf(edit('<limit upper="1.2" effort="5" velocity="2"/>', '<limit upper="1.2" effort="5"/>'))).toEqual(
      [{ element: 'joint "hinge" <limit velocity>', message: "is required" }],
    );
  });

  it("two root links, a second moving branch, XML that does not parse, and no <robot>", () => {
    expect(problemsOf(edit("</robot>", '<link name="stray"/></robot>'))[0]).toEqual({
      element: "<robot>",
      message: 'must have one root link, has 2 ("base", "stray")',
    });
    const branch = edit(
      '<joint name="lamp-mount" type="fixed">',
      '<joint name="lamp-mount" type="revolute"><limit effort="1" velocity="1"/>',
    );
    expect(problemsOf(branch)[0]).toEqual({
      element: 'joint "lamp-mount"',
      message: 'starts a second moving branch at link "slider"; only serial chains are supported',
    });
    expect(problemsOf(fixture.slice(0, 800))[0].element).toMatch(/^\(XML line \d+\)$/);
    expect(problemsOf("<model/>")).toEqual([
      { element: "<robot>", message: "missing: a URDF file has one <robot> element" },
    ]);
  });

  it("random cuts through the file give a result or problems, never an exception", () => {
    fc.assert(
      fc.property(fc.nat(fixture.length), fc.nat(400), (at, len) => {
        const xml = fixture.slice(0, at) + fixture.slice(at + len);
        const r = parseUrdf(xml);
        expect(r.ok || r.problems.length > 0).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
