import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { parseRecordingCsv } from "@/kinematics/recordings/csv";
import { parseArm } from "@/kinematics";
import { streamCheck } from "@/kinematics";

const root = join(__dirname, "..", "..", "..");
const bin = join(root, "bin", "jointproof");
const plans = join(root, "tests", "fixtures", "plans");
const recordings = join(root, "tests", "fixtures", "recordings");

function run(args: string[], input?: string) {
  const result = spawnSync(process.execPath, [bin, ...args], { cwd: root, input, encoding: "utf8" });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

let scratch: string;

beforeAll(() => {
  scratch = mkdtempSync(join(tmpdir(), "jointproof-cli-"));
  run(["--help"]); // builds the cached bundle once, so the tests below time nothing but the checker
}, 60_000);

describe("jointproof check", () => {
  it("prints only the report JSON on stdout with --json and exits 0 on a pass", () => {
    const { code, stdout, stderr } = run(["check", join(plans, "gentle-pass.json"), "--json"]);
    expect(code).toBe(0);
    expect(stderr).toBe("");
    const report = JSON.parse(stdout);
    expect(report.verdict).toBe("pass");
    expect(report.moves).toHaveLength(2);
    expect(Object.keys(report.moves[0]).sort()).toEqual(
      ["duration", "findings", "index", "minSafeDuration", "peakAcceleration", "peakVelocity", "shape"].sort(),
    );
  });

  it("exits 0 on a caution", () => {
    const { code, stdout } = run(["check", join(plans, "just-long-enough.json"), "--json"]);
    expect(code).toBe(0);
    expect(JSON.parse(stdout).verdict).toBe("caution");
  });

  it("exits 1 on a fault and names the jump in the readable table", () => {
    const { code, stdout } = run(["check", join(plans, "instant-jump.json")]);
    expect(code).toBe(1);
    expect(stdout).toContain("Verdict: FAULT");
    expect(stdout).toMatch(/jump\s+1\s+elbow\s+Instant move 1, joint "elbow"/);
  });

  it("the table's move numbers, the finding lines and the messages agree, counted from 1 (JSON stays 0-based)", () => {
    const doc = JSON.parse(readFileSync(join(plans, "instant-jump.json"), "utf8"));
    // a passing move first, then the same jump one place later: the second move, moves[1], is Move 2
    const shifted = { ...doc, moves: [{ goal: doc.start, duration: 1 }, ...doc.moves] };
    const { code, stdout } = run(["check", "-"], JSON.stringify(shifted));
    expect(code).toBe(1);
    const lines = stdout.split("\n");
    const findingLines = lines.filter((l) => /^\s+(fault|caution)\s/.test(l));
    expect(findingLines.length).toBeGreaterThan(0);
    for (const l of findingLines) {
      const listed = /^\s+\S+\s+\S+\s+(\d+)\s/.exec(l)![1];
      const said = /(?:Instant move|Move) (\d+)/.exec(l)![1];
      expect(said, l).toBe(listed);
      expect(listed).toBe("2");
    }
    expect(lines.some((l) => /^\s+2\s.*fault/i.test(l))).toBe(true);
    expect(lines.some((l) => /^\s+1\s.*fault/i.test(l))).toBe(false);
    const json = run(["check", "-", "--json"], JSON.stringify(shifted));
    expect(JSON.parse(json.stdout).findings[0].move).toBe(1);
  });

  it("reads the plan from stdin with -", () => {
    const { code, stdout } = run(["check", "-", "--json"], readFileSync(join(plans, "instant-jump.json"), "utf8"));
    expect(code).toBe(1);
    expect(JSON.parse(stdout).findings[0].kind).toBe("jump");
  });

  it("exits 2 with one path: message line per problem on stderr for an invalid document", () => {
    const { code, stdout, stderr } = run(["check", join(plans, "invalid.json"), "--json"]);
    expect(code).toBe(2);
    expect(stdout).toBe("");
    expect(stderr.trim().split("\n").sort()).toEqual(
      [
        "arm.joints[1].maxVelocity: must be greater than 0",
        "arm.joints[2].max: must not be below min (3)",
        "moves[0].duration: must be 0 or greater",
        'moves[0].shape: must be one of "cubic", "quintic", "trapezoid"',
        "moves[0].goal: must have 7 values, one per joint (has 6)",
        "start[4]: must be a number",
      ].sort(),
    );
  });

  it("exits 2 for text that is not JSON and for a missing file", () => {
    const notJson = run(["check", "-"], "{ nope");
    expect(notJson.code).toBe(2);
    expect(notJson.stderr).toMatch(/^\(stdin\): not valid JSON/);
    const missing = run(["check", join(scratch, "absent.json")]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain("no such file");
  });

  it("exits 2 for an unknown command", () => {
    expect(run(["frobnicate"]).code).toBe(2);
  });
});

describe("jointproof scan", () => {
  const log = join(recordings, "guided-with-jumps.csv");
  const arm = join(recordings, "demo-arm.json");

  it("prints the stream report JSON and exits 1 on jumps", () => {
    const { code, stdout } = run(["scan", log, "--arm", arm, "--json"]);
    expect(code).toBe(1);
    const report = JSON.parse(stdout);
    expect(Object.keys(report).sort()).toEqual(["findings", "rateHz", "samples", "verdict"]);
    expect(report.samples).toBe(400);
    expect(Object.keys(report.findings[0]).sort()).toEqual(
      [
        "endLine",
        "endSample",
        "joint",
        "kind",
        "limit",
        "line",
        "message",
        "sample",
        "severity",
        "time",
        "value",
      ].sort(),
    );
    // the jump at row 120 lasts two steps (in and out of the glitch); rows 250–252 are shifted: in at 250, out at 253
    const jumps = report.findings.filter((f: { kind: string }) => f.kind === "jump");
    expect(
      jumps.map((f: { joint: number; sample: number; endSample: number }) => [f.joint, f.sample, f.endSample]),
    ).toEqual([
      [2, 120, 121],
      [0, 250, 250],
      [0, 253, 253],
    ]);
    // the same runs named by the file's lines (the header is line 1)
    expect(jumps.map((f: { line: number; endLine: number }) => [f.line, f.endLine])).toEqual([
      [122, 123],
      [252, 252],
      [255, 255],
    ]);
  });

  it("writes a repaired log that passes the stream check", () => {
    const out = join(scratch, "repaired.csv");
    const { code } = run(["scan", log, "--arm", arm, "--repair", out]);
    expect(code).toBe(1); // the exit code is the original recording's verdict
    const parsed = parseRecordingCsv(readFileSync(out));
    const armResult = parseArm(JSON.parse(readFileSync(arm, "utf8")));
    if (!armResult.ok) throw new Error("arm fixture");
    expect(streamCheck(armResult.value, parsed.recording!).verdict).toBe("pass");
    const again = run(["scan", out, "--arm", arm, "--json"]);
    expect(again.code).toBe(0);
    expect(JSON.parse(again.stdout).verdict).toBe("pass");
  });

  it("exits 2 with the line number for a broken recording", () => {
    const broken = join(scratch, "broken.csv");
    const lines = readFileSync(log, "utf8").split("\n");
    lines[5] = lines[5].split(",").slice(0, 3).join(",");
    lines[9] = lines[8];
    writeFileSync(broken, lines.join("\n"));
    const { code, stderr } = run(["scan", broken, "--arm", arm]);
    expect(code).toBe(2);
    expect(stderr).toBe("line 6: has 3 values; the header has 8 columns\n");
    lines[5] = lines[4];
    writeFileSync(broken, lines.join("\n"));
    const times = run(["scan", broken, "--arm", arm]);
    expect(times.code).toBe(2);
    expect(times.stderr).toContain('line 6, column "t": time');
  });

  it("exits 2 naming the arm field path for an invalid arm file", () => {
    const badArm = join(scratch, "bad-arm.json");
    const raw = JSON.parse(readFileSync(arm, "utf8"));
    raw.joints[1].maxVelocity = 0;
    writeFileSync(badArm, JSON.stringify(raw));
    const { code, stderr } = run(["scan", log, "--arm", badArm]);
    expect(code).toBe(2);
    expect(stderr).toBe(`${badArm}: joints[1].maxVelocity: must be greater than 0\n`);
  });

  it("exits 2 when --arm is missing", () => {
    const { code, stderr } = run(["scan", log]);
    expect(code).toBe(2);
    expect(stderr).toContain("--arm");
  });
});
