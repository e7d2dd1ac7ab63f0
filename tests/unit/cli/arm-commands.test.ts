import { execFileSync } from "node:child_process";
import { writeFileSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { main } from "@/bin/cli";
import { repoPath } from "../kinematics/arm/helpers";
import { expectAllClose, expectClose } from "../kinematics/tolerance";

async function run(...argv: string[]) {
  let out = "",
    err = "";
  const code = await main(argv, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}
const file = (rel: string) => repoPath(rel);

describe("jointproof arm import", () => {
  it("prints the moving joints in chain order with limits, origin and axis, then links and the tool point", async () => {
    const r = await run("arm", "import", file("tests/fixtures/urdf/every-element.urdf"));
    expect(r.code).toBe(0);
    const d = JSON.parse(r.out);
    expect(d.joints.map((j: { name: string }) => j.name)).toEqual(["spin", "lift", "hinge"]);
    expect(d.joints[0]).toMatchObject({ type: "continuous", min: null, max: null, maxVelocity: 3, maxEffort: 20 });
    expect(Object.keys(d.joints[1])).toEqual(
      expect.arrayContaining(["name", "type", "min", "max", "maxVelocity", "maxEffort", "origin", "axis"]),
    );
    expect(d.links).toHaveLength(4);
    expectAllClose(d.tool.xyz, [0.25, 0, 0], 1e-12);
  });

  it("a bad file exits 2 with one line per problem naming the element", async () => {
    const dir = mkdtempSync(join(tmpdir(), "jp-urdf-"));
    const bad = join(dir, "bad.urdf");
    writeFileSync(
      bad,
      '<robot name="x"><link name="a"/><joint name="j" type="revolute"><parent link="a"/><child link="b"/></joint></robot>',
    );
    const r = await run("arm", "import", bad);
    expect(r.code).toBe(2);
    expect(r.out).toBe("");
    expect(r.err.trim().split("\n")).toEqual([
      `${bad}: joint "j" <limit>: is required on a revolute joint`,
      `${bad}: joint "j" <child>: names link "b", which is not defined`,
    ]);
  });
});

describe("jointproof fk", () => {
  it("prints the tool point of the demo arm held out horizontally: x = 0.28 + 0.25 + 0.06 + 0.05 + 0.10 m, z = shoulder height 0.16 m", async () => {
    // Demo arm L (invented): shoulder axis at 0.10 + 0.06 m; links and handle along the arm (kinematics/arm/presets/bench-arm-l.json).
    for (const arm of ["kinematics/arm/presets/bench-arm-l.json", "kinematics/arm/presets/bench-arm-l.urdf"]) {
      const r = await run("fk", file(arm), "--pose", `0,${Math.PI / 2},0,0,0,0`);
      expect(r.code).toBe(0);
      const t = JSON.parse(r.out);
      expectAllClose(t.position, [0.74, 0, 0.16], 1e-12);
      expectAllClose(t.rotation.flat(), [0, 0, 1, 0, 1, 0, -1, 0, 0], 1e-12); // Ry(π/2)
    }
  });

  it("refuses a pose of the wrong length with exit 2", async () => {
    const r = await run("fk", file("kinematics/arm/presets/bench-arm-l.json"), "--pose", "0,1");
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--pose: must have 6 \(the chain\) or 7 \(every joint\) values \(has 2\)/);
  });
});

describe("jointproof ik", () => {
  it("finds a pose whose tool point is at the goal (checked with fk), exit 0", async () => {
    const arm = file("kinematics/arm/presets/bench-arm-h.json");
    const r = await run("ik", arm, "--position", "0.35,-0.2,0.25", "--seed", "0,0.4,1.2,0.9,0,0,0");
    expect(r.code).toBe(0);
    const ik = JSON.parse(r.out);
    expect(ik.reachable).toBe(true);
    expect(ik.positionErrorM).toBeLessThan(1e-4);
    expect(ik.pose).toHaveLength(7);
    const fk = JSON.parse((await run("fk", arm, "--pose", ik.pose.join(","))).out);
    [0.35, -0.2, 0.25].forEach((v, k) => expectClose(fk.position[k], v, 1e-4, 0));
  });

  it("reports an unreachable goal with reachable: false and exit 1", async () => {
    const r = await run("ik", file("kinematics/arm/presets/bench-arm-h.json"), "--position", "2,0,0");
    expect(r.code).toBe(1);
    const ik = JSON.parse(r.out);
    expect(ik.reachable).toBe(false);
    expect(ik.positionErrorM).toBeGreaterThan(1);
  });
});

describe("bin/jointproof check end to end (the real launcher)", () => {
  it("a plan with Cartesian targets, a payload and a keep-out box gives effort-over, clearance and tool-speed findings, exit 1", () => {
    let stdout = "";
    let status = 0;
    try {
      stdout = execFileSync(
        file("bin/jointproof"),
        ["check", "--json", file("tests/fixtures/arm-plans/bench-e2e.json")],
        { encoding: "utf8" },
      );
    } catch (e) {
      const err = e as { status: number; stdout: string };
      status = err.status;
      stdout = err.stdout;
    }
    expect(status).toBe(1);
    const report = JSON.parse(stdout);
    const kinds = new Set(report.findings.map((f: { kind: string }) => f.kind));
    expect([...kinds].sort()).toEqual(["clearance", "effort-over", "tool-speed"]);
    expect(report.moves[0].peakEffort).toHaveLength(7);
    expect(typeof report.moves[0].peakToolSpeed).toBe("number");
  }, 60000);
});
