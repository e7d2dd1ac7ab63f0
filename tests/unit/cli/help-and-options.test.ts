import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { main } from "@/bin/cli";
import { repoPath } from "../kinematics/arm/helpers";

// The command line's help and options (the project's own wording; no outside source). The jump
// limit below is the project's common practice: a joint may travel maxVelocity / control rate in one
// control period (REFERENCES.md, "Common practice").

async function run(...argv: string[]) {
  let out = "",
    err = "";
  const code = await main(argv, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

const urdf = repoPath("kinematics/arm/presets/bench-arm-l.urdf");
let log: string;

beforeAll(() => {
  // six joints as in the light arm's URDF, 1000 samples per second; base steps 0.02 rad once at line 7
  const dir = mkdtempSync(join(tmpdir(), "jp-help-"));
  const rows = ["t,base,shoulder,elbow,wrist-pitch,wrist-roll,wrist-yaw"];
  for (let k = 0; k < 20; k++)
    rows.push([(k / 1000).toFixed(3), k >= 5 ? "0.02" : "0", "0", "0", "0", "0", "0"].join(","));
  log = join(dir, "six-joints.csv");
  writeFileSync(log, rows.join("\n") + "\n");
});

describe("jointproof --help", () => {
  it("lists every command before the exit codes, and --json for verify", async () => {
    const { code, out } = await run("--help");
    expect(code).toBe(0);
    const exitCodes = out.indexOf("Exit codes:");
    expect(exitCodes).toBeGreaterThan(0);
    for (const command of [
      "jointproof check ",
      "jointproof scan ",
      "jointproof verify ",
      "jointproof arm import ",
      "jointproof fk ",
      "jointproof ik ",
      "jointproof audit ",
    ]) {
      const at = out.indexOf(command);
      expect(at, command).toBeGreaterThanOrEqual(0);
      expect(at, command).toBeLessThan(exitCodes);
    }
    expect(out).toMatch(/jointproof verify EXPORT\.json\|EXPORT\.csv \[--json\]/);
    expect(out).toContain('"Move 1" is the first move');
  });

  it("fk --help, ik --help and arm import --help print their own usage and exit 0", async () => {
    for (const [argv, expected] of [
      [["fk", "--help"], "jointproof fk ARM --pose"],
      [["ik", "-h"], "jointproof ik ARM --position"],
      [["arm", "import", "--help"], "jointproof arm import FILE.urdf"],
    ] as const) {
      const r = await run(...argv);
      expect(r.code, argv.join(" ")).toBe(0);
      expect(r.err).toBe("");
      expect(r.out).toContain(expected);
    }
  });
});

describe("options a command does not take", () => {
  it("check and verify refuse scan's options instead of ignoring them", async () => {
    const plan = repoPath("tests/fixtures/plans/gentle-pass.json");
    const r = await run("check", plan, "--control-rate", "500", "--arm", plan);
    expect(r.code).toBe(2);
    expect(r.out).toBe("");
    expect(r.err.trim().split("\n")).toEqual([
      "--arm: is an option of scan, not of check (check reads everything from its file)",
      "--control-rate: is an option of scan, not of check (check reads everything from its file)",
    ]);
    expect((await run("verify", plan, "--repair", "out.csv")).code).toBe(2);
  });
});

describe("jointproof ik", () => {
  it("names its error fields with their units: positionErrorM, and orientationErrorRad with --rpy", async () => {
    const arm = repoPath("kinematics/arm/presets/bench-arm-h.json");
    const plain = JSON.parse((await run("ik", arm, "--position", "0.35,-0.2,0.25")).out);
    expect(Object.keys(plain).sort()).toEqual(["pose", "positionErrorM", "reachable"]);
    const oriented = JSON.parse((await run("ik", arm, "--position", "0.35,-0.2,0.25", "--rpy", "0,3.14159,0")).out);
    expect(Object.keys(oriented).sort()).toEqual(["orientationErrorRad", "pose", "positionErrorM", "reachable"]);
  });
});

describe("jointproof scan --arm with a URDF", () => {
  it("refuses a URDF without --control-rate, since a URDF carries no control rate", async () => {
    const r = await run("scan", log, "--arm", urdf);
    expect(r.code).toBe(2);
    expect(r.out).toBe("");
    expect(r.err).toMatch(/^--control-rate: is required with a URDF/);
  });

  it("checks against a URDF with the given control rate: the 0.02 rad step is a jump at 1000 Hz, not at 100 Hz", async () => {
    // jump limit = maxVelocity / rate: 3.2 / 1000 = 0.0032 rad (exceeded), 3.2 / 100 = 0.032 rad (not)
    const fast = await run("scan", log, "--arm", urdf, "--control-rate", "1000", "--json");
    expect(fast.code).toBe(1);
    const fastJumps = JSON.parse(fast.out).findings.filter((f: { kind: string }) => f.kind === "jump");
    expect(fastJumps.map((f: { joint: number; line: number }) => [f.joint, f.line])).toEqual([[0, 7]]);
    const slow = await run("scan", log, "--arm", urdf, "--control-rate", "100", "--json");
    expect(JSON.parse(slow.out).findings.filter((f: { kind: string }) => f.kind === "jump")).toEqual([]);
  });

  it("refuses a --control-rate that differs from a plan arm's own rate", async () => {
    const r = await run(
      "scan",
      repoPath("tests/fixtures/recordings/guided-with-jumps.csv"),
      "--arm",
      repoPath("tests/fixtures/recordings/demo-arm.json"),
      "--control-rate",
      "500",
    );
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^--control-rate: 500 Hz differs from the arm's own 1000 Hz/);
  });
});
