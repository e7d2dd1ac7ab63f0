import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { main } from "@/bin/cli";
import { formatTable } from "@/bin/table";
import { check, parsePlan, type Finding } from "@/kinematics";
import { repoPath } from "../kinematics/arm/helpers";

// The command line's readable tables (the project's own layout rule, no outside source): every
// column starts at the same place in every row, whatever the finding kind, so `effort-over` never
// runs into the move column.

async function run(...argv: string[]) {
  let out = "",
    err = "";
  const code = await main(argv, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

/** Where each header word starts: the column starts of the table under it. */
function columnStarts(header: string, names: string[]): number[] {
  let from = 0;
  return names.map((name) => {
    const at = header.indexOf(name, from);
    expect(at, `${name} in ${header}`).toBeGreaterThanOrEqual(0);
    from = at + name.length;
    return at;
  });
}

/** A row cut at the column starts, each cell trimmed; the cell before a start must end in a space. */
function cells(line: string, starts: number[]): string[] {
  return starts.map((start, c) => {
    if (c > 0) expect(line[start - 1], `column ${c} of "${line}" starts after a space`).toBe(" ");
    expect(line[start], `column ${c} of "${line}" starts with its value`).not.toBe(" ");
    return line.slice(start, starts[c + 1] ?? line.length).trim();
  });
}

let dir: string;
/** The demo arm plan with effort, clearance and tool-speed findings, plus moves for the joint checks. */
let planPath: string;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "jp-table-"));
  const doc = JSON.parse(readFileSync(repoPath("tests/fixtures/arm-plans/bench-e2e.json"), "utf8"));
  doc.moves.push(
    { goal: [0, 1.5, 0, 0, 3.3, 0, 0.02], duration: 4 }, // wrist-roll beyond its travel max 3.05 rad
    { goal: [0.5, 1.5, 0, 0, 0, 0, 0.02], duration: 0.15 }, // 0.5 rad of base in 0.15 s: speed and acceleration
    { goal: [0.9, 1.5, 0, 0, 0, 0, 0.02], duration: 0 }, // an instant 0.4 rad step of base
  );
  planPath = join(dir, "every-kind.json");
  writeFileSync(planPath, JSON.stringify(doc));
});

describe("the check table", () => {
  it("keeps every column aligned for every finding kind (range, speed-over, accel-over, jump, effort-over, clearance, tool-speed)", async () => {
    const parsed = parsePlan(JSON.parse(readFileSync(planPath, "utf8")));
    if (!parsed.ok) throw new Error("fixture");
    const report = check(parsed.value);
    const kinds = new Set(report.findings.map((f) => f.kind));
    for (const kind of ["range", "speed-over", "accel-over", "jump", "effort-over", "clearance", "tool-speed"])
      expect(kinds.has(kind as Finding["kind"]), kind).toBe(true);

    const { code, out } = await run("check", planPath);
    expect(code).toBe(1);
    const lines = out.split("\n");
    const head = lines.findIndex((l) => /^\s+severity\s+kind\s+move\s+joint\s+message$/.test(l));
    expect(head).toBeGreaterThan(0);
    const starts = columnStarts(lines[head], ["severity", "kind", "move", "joint", "message"]);
    const rows = lines.slice(head + 1, head + 1 + report.findings.length);
    expect(rows).toHaveLength(report.findings.length);
    rows.forEach((line, k) => {
      const f = report.findings[k];
      expect(cells(line, starts)).toEqual([
        f.severity,
        f.kind,
        f.move === null ? "start" : String(f.move + 1),
        f.joint === null ? "-" : parsed.value.arm.joints[f.joint].name,
        f.message,
      ]);
    });
  });

  it("keeps the moves table aligned, numbering moves from 1", async () => {
    const { out } = await run("check", planPath);
    const lines = out.split("\n");
    const head = lines.findIndex((l) => /^\s+move\s+shape\s+duration\s+shortest safe\s+result$/.test(l));
    expect(head).toBeGreaterThan(0);
    const moveRows = lines.slice(head + 1, head + 7);
    expect(moveRows.map((l) => l.trim().split(/\s+/)[0])).toEqual(["1", "2", "3", "4", "5", "6"]);
    // right-aligned numbers: every row ends its move number and its duration where the header ends them
    const header = lines[head];
    const moveEnd = header.indexOf("move") + "move".length;
    const durationEnd = header.indexOf("duration") + "duration".length;
    for (const row of moveRows) {
      expect(row[moveEnd - 1], row).not.toBe(" ");
      expect(row[moveEnd], row).toBe(" ");
      expect(row[durationEnd - 1], row).not.toBe(" ");
    }
  });
});

describe("the scan table", () => {
  it("keeps every column aligned for range, speed-over and jump findings, naming the file's lines and the gripper in mm", async () => {
    // 2000 samples per second on a 1000 Hz controller: base steps 2 mrad per sample (4 rad/s, over its
    // 3.1 rad/s but within one control period's 3.1 mrad), elbow jumps 0.1 rad once, the gripper sits at
    // 50 mm, beyond its 45 mm travel.
    const arm = repoPath("tests/fixtures/recordings/demo-arm.json");
    const rows = ["t,base,shoulder,elbow,wrist-pitch,wrist-roll,tool-roll,gripper"];
    for (let k = 0; k < 60; k++) {
      const base = k >= 10 && k < 30 ? (k - 9) * 0.002 : k >= 30 ? 0.042 : 0;
      const elbow = k >= 45 ? 0.1 : 0;
      rows.push([(k / 2000).toFixed(4), base.toFixed(6), "0", elbow.toFixed(6), "0", "0", "0", "0.05"].join(","));
    }
    const log = join(dir, "every-kind.csv");
    writeFileSync(log, rows.join("\n") + "\n");
    const { code, out } = await run("scan", log, "--arm", arm);
    expect(code).toBe(1);
    const lines = out.split("\n");
    const head = lines.findIndex((l) => /^\s+severity\s+kind\s+joint\s+lines\s+message$/.test(l));
    expect(head).toBeGreaterThan(0);
    const starts = columnStarts(lines[head], ["severity", "kind", "joint", "lines", "message"]);
    const found = lines.slice(head + 1).filter((l) => l.trim() !== "");
    const kinds = new Set<string>();
    const speedJoints = new Set<string>();
    for (const line of found) {
      const [severity, kind, joint, where, message] = cells(line, starts);
      kinds.add(kind);
      expect(["fault", "caution"]).toContain(severity);
      expect(where).toMatch(/^\d+(–\d+)?$/);
      expect(message.length).toBeGreaterThan(0);
      if (kind === "range") {
        expect(joint).toBe("gripper");
        expect(message).toContain("50 mm");
        expect(message).toContain("0 mm to 45 mm");
      }
      if (kind === "jump") expect(joint).toBe("elbow");
      if (kind === "speed-over") speedJoints.add(joint);
    }
    expect([...kinds].sort()).toEqual(["jump", "range", "speed-over"]);
    // base only over speed; the elbow's jump is also over speed between the two samples
    expect([...speedJoints].sort()).toEqual(["base", "elbow"]);
  });
});

describe("formatTable", () => {
  it("pads every column to its widest cell plus two spaces and leaves the last column unpadded", () => {
    expect(
      formatTable(
        [
          ["a", "effort-over", "x"],
          ["bbb", "jump", "longer text"],
        ],
        ["right", "left", "left"],
      ),
    ).toEqual(["  a  effort-over  x", "bbb  jump         longer text"]);
  });
});
