// `jointproof audit` through the real launcher (bin/jointproof). Datasets are written in the test: Parquet
// by hyparquet-writer, zip by fflate, CSV as text. The rules are the project's own (timed replay).
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { parquetWriteBuffer } from "hyparquet-writer";
import { zipSync } from "fflate";

const root = join(__dirname, "..", "..", "..");
const bin = join(root, "bin", "jointproof");

function run(args: string[]) {
  const result = spawnSync(process.execPath, [bin, ...args], { cwd: root, encoding: "utf8" });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

const arm = {
  name: "Audit arm",
  controlRateHz: 1000,
  joints: [
    { name: "lift", min: -1, max: 1, maxVelocity: 1 },
    { name: "grip", type: "prismatic", min: 0, max: 0.04, maxVelocity: 0.1 },
  ],
};

let scratch: string;
let armPath: string;

/** CSV of one episode at 8 Hz with the given lift positions (grip 0.02 m). */
function csv(lift: number[]): string {
  return "t,lift,grip\n" + lift.map((q, k) => `${k * 0.125},${q},0.02`).join("\n") + "\n";
}

/** A Parquet file with an episode column: episode "a" clean, "b" with a glitch at its frame 2. */
function twoEpisodes(): Uint8Array {
  const lift = [0, 0.01, 0.02, 0.03, 0, 0, 0.6, 0, 0];
  return new Uint8Array(
    parquetWriteBuffer({
      columnData: [
        { name: "episode", data: ["a", "a", "a", "a", "b", "b", "b", "b", "b"], type: "STRING" },
        { name: "t", data: Float64Array.from([0, 1, 2, 3, 0, 1, 2, 3, 4].map((k) => k * 0.125)), type: "DOUBLE" },
        { name: "lift", data: Float64Array.from(lift), type: "DOUBLE" },
        { name: "grip", data: Float64Array.from(lift.map(() => 0.02)), type: "DOUBLE" },
      ],
    }),
  );
}

beforeAll(() => {
  scratch = mkdtempSync(join(tmpdir(), "jointproof-audit-"));
  armPath = join(scratch, "arm.json");
  writeFileSync(armPath, JSON.stringify(arm));
  run(["--help"]); // builds the cached bundle once
}, 60_000);

describe("jointproof audit", () => {
  it("--json prints exactly the documented shape and exits 1 when an episode faults", () => {
    const path = join(scratch, "two.parquet");
    writeFileSync(path, twoEpisodes());
    const { code, stdout, stderr } = run(["audit", path, "--arm", armPath, "--json"]);
    expect(stderr).toBe("");
    expect(code).toBe(1);
    const out = JSON.parse(stdout);
    expect(Object.keys(out)).toEqual(["episodes", "summary", "caution"]);
    // the safety caution travels with the output (PRODUCT.md: wherever a result leaves the tool)
    expect(out.caution).toMatch(/emergency stop/i);
    expect(out.caution).toMatch(/ISO 10218/);
    expect(out.summary).toEqual({ episodes: 2, pass: 1, caution: 0, fault: 1, invalid: 0, byKind: { glitch: 1 } });
    expect(out.episodes[0]).toEqual({ episode: "a", samples: 4, verdict: "pass", findings: [], problems: [] });
    const b = out.episodes[1];
    expect(Object.keys(b)).toEqual(["episode", "samples", "verdict", "findings", "problems"]);
    expect(b).toMatchObject({ episode: "b", samples: 5, verdict: "fault" });
    expect(Object.keys(b.findings[0])).toEqual([
      "kind",
      "severity",
      "joint",
      "sample",
      "timeS",
      "value",
      "limit",
      "message",
    ]);
    // 0.6 rad in 0.125 s = 4.8 rad/s against 1 rad/s, at frame 2 (0-based), t = 0.25 s
    expect(b.findings[0]).toMatchObject({
      kind: "glitch",
      severity: "fault",
      joint: 0,
      sample: 2,
      timeS: 0.25,
      limit: 1,
    });
    expect(Math.abs(b.findings[0].value - 4.8)).toBeLessThan(1e-9);
  });

  it("prints a summary table with the worst episodes and exits 0 for a folder of clean CSV episodes", () => {
    const dir = join(scratch, "folder");
    mkdirSync(join(dir, "day-2"), { recursive: true });
    writeFileSync(join(dir, "take-1.csv"), csv([0, 0.01, 0.02]));
    writeFileSync(join(dir, "day-2", "take-2.csv"), csv([0, 0.115, 0.115]));
    writeFileSync(join(dir, "notes.txt"), "not data");
    const { code, stdout } = run(["audit", dir, "--arm", armPath]);
    expect(code).toBe(0);
    expect(stdout).toContain('Timed-replay audit for arm "Audit arm": 2 episodes, 6 frames');
    expect(stdout).toMatch(/PASS\s+1\n/);
    expect(stdout).toMatch(/CAUTION\s+1\n/);
    expect(stdout).toMatch(/take-2\s+CAUTION\s+3/);
    expect(stdout).toContain("does not make a replay safe");
    expect(stdout).toMatch(/ISO 10218/);
  });

  it("reads a zip of Parquet files, one episode per file, with a list column and a frame rate", () => {
    const one = (lift: number[]) =>
      new Uint8Array(
        parquetWriteBuffer({
          columnData: [
            { name: "frame_index", data: Int32Array.from(lift.map((_, k) => k)) },
            { name: "state", data: lift.map((q) => [q, 0.02]) },
          ],
          schema: [
            { name: "root", num_children: 2 },
            { name: "frame_index", type: "INT32", repetition_type: "REQUIRED" },
            { name: "state", repetition_type: "OPTIONAL", converted_type: "LIST", num_children: 1 },
            { name: "list", repetition_type: "REPEATED", num_children: 1 },
            { name: "element", type: "FLOAT", repetition_type: "REQUIRED" },
          ],
        }),
      );
    const path = join(scratch, "set.zip");
    writeFileSync(path, zipSync({ "ep_0.parquet": one([0, 0.01, 0.02]), "ep_1.parquet": one([0, 0.5, 0.5]) }));
    const { code, stdout } = run([
      "audit",
      path,
      "--arm",
      armPath,
      "--rate",
      "8",
      "--joints-column",
      "state",
      "--json",
    ]);
    expect(code).toBe(1);
    const out = JSON.parse(stdout);
    expect(out.episodes.map((e: { episode: string; verdict: string }) => [e.episode, e.verdict])).toEqual([
      ["ep_0", "pass"],
      ["ep_1", "fault"],
    ]);
    expect(out.episodes[1].findings[0]).toMatchObject({ kind: "speed-over", sample: 1, timeS: 0.125 });
  });

  it("refuses a file it cannot map with exit 2, listing the columns and types and the option to set", () => {
    const path = join(scratch, "unmapped.parquet");
    writeFileSync(
      path,
      new Uint8Array(
        parquetWriteBuffer({
          columnData: [
            { name: "t", data: Float64Array.from([0, 1]), type: "DOUBLE" },
            { name: "q0", data: Float32Array.from([0, 1]), type: "FLOAT" },
          ],
        }),
      ),
    );
    const { code, stdout, stderr } = run(["audit", path, "--arm", armPath]);
    expect(code).toBe(2);
    expect(stdout).toBe("");
    expect(stderr).toContain(
      'unmapped.parquet: has no column named like the arm\'s joints "lift", "grip". Its columns: t (DOUBLE), q0 (FLOAT).',
    );
    expect(stderr).toContain("--joints-column NAME");
  });

  it("exits 2 when, without a fault, an episode is invalid, and names the episode and frame", () => {
    const dir = join(scratch, "invalid");
    mkdirSync(dir, { recursive: true });
    writeFileSync(join(dir, "ok.csv"), csv([0, 0.01, 0.02]));
    writeFileSync(join(dir, "short.csv"), csv([0]));
    const { code, stdout } = run(["audit", dir, "--arm", armPath, "--json"]);
    expect(code).toBe(2);
    const out = JSON.parse(stdout);
    expect(out.summary).toMatchObject({ pass: 1, invalid: 1 });
    expect(out.episodes[1].problems).toEqual(["episode short: has 1 frame; a timed replay needs at least 2"]);
  });

  it("usage errors exit 2: both --time-column and --rate, a missing --arm, a bad rate", () => {
    const path = join(scratch, "two.parquet");
    writeFileSync(path, twoEpisodes());
    expect(run(["audit", path, "--arm", armPath, "--time-column", "t", "--rate", "30"]).stderr).toBe(
      "--time-column and --rate: set one or the other\n",
    );
    expect(run(["audit", path]).code).toBe(2);
    expect(run(["audit", path, "--arm", armPath, "--rate", "0"]).stderr).toMatch(/^--rate: must be a frame rate/);
  });

  it("takes the arm from a plan document", () => {
    const path = join(scratch, "two.parquet");
    writeFileSync(path, twoEpisodes());
    const planPath = join(scratch, "plan.json");
    writeFileSync(
      planPath,
      JSON.stringify({ format: "jointproof.plan", version: 1, name: "p", arm, start: [0, 0.02], moves: [] }),
    );
    const { code, stdout } = run(["audit", path, "--arm", planPath, "--json"]);
    expect(code).toBe(1);
    expect(JSON.parse(stdout).summary.fault).toBe(1);
  });

  it("--help lists the audit command", () => {
    expect(run(["--help"]).stdout).toContain("jointproof audit DATASET --arm ARM");
  });
});
