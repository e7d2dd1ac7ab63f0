// The `jointproof audit` text tables keep their columns aligned whatever the values (the project's own
// layout rule, as tests/unit/cli/table-alignment.test.ts pins it for `check` and `scan`; no outside source).
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { runAuditCommand } from "@/bin/audit-command";

const arm = {
  name: "Audit arm",
  controlRateHz: 1000,
  joints: [
    { name: "lift", min: -1, max: 1, maxVelocity: 1 },
    { name: "grip", type: "prismatic", min: 0, max: 0.04, maxVelocity: 0.1 },
  ],
};

async function audit(...argv: string[]) {
  let out = "",
    err = "";
  const code = await runAuditCommand(argv, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

/** CSV of one episode: `t` in the given times, lift positions as given, grip at 0.02 m. */
function csv(timeS: number[], lift: number[]): string {
  return "t,lift,grip\n" + lift.map((q, k) => `${timeS[k]},${q},0.02`).join("\n") + "\n";
}

/**
 * Checks that each row's cells sit under the header's words: a left-aligned cell starts where its
 * header word starts, a right-aligned one ends where its header word ends.
 */
function expectUnderHeader(header: string, names: string[], right: boolean[], rows: string[][], lines: string[]) {
  let from = 0;
  const spans = names.map((name) => {
    const at = header.indexOf(name, from);
    expect(at, `${name} in "${header}"`).toBeGreaterThanOrEqual(0);
    from = at + name.length;
    return { start: at, end: at + name.length };
  });
  rows.forEach((cells, r) => {
    const line = lines[r];
    let at = 0;
    cells.forEach((cell, c) => {
      const found = line.indexOf(cell, at);
      expect(found, `"${cell}" in "${line}"`).toBeGreaterThanOrEqual(0);
      if (right[c]) expect(found + cell.length, `"${cell}" ends under "${names[c]}" in "${line}"`).toBe(spans[c].end);
      else expect(found, `"${cell}" starts under "${names[c]}" in "${line}"`).toBe(spans[c].start);
      if (c > 0) expect(line[found - 1], `a space before "${cell}"`).toBe(" ");
      at = found + cell.length;
    });
  });
}

let dir: string;
let armPath: string;

beforeAll(() => {
  const scratch = mkdtempSync(join(tmpdir(), "jointproof-audit-table-"));
  armPath = join(scratch, "arm.json");
  writeFileSync(armPath, JSON.stringify(arm));
  dir = join(scratch, "episodes");
  mkdirSync(dir);
  // Both spike at frame 2 (0.6 rad and back in 0.125 s: a glitch fault). The first ends 1.2e10 s after
  // it starts, as a time column in nanoseconds read as seconds would: an 11-digit duration, wider
  // than the 10 characters the old fixed-width table gave the column.
  writeFileSync(join(dir, "nanosecond-clock.csv"), csv([0, 0.125, 0.25, 1.2e10], [0, 0.6, 0, 0]));
  writeFileSync(join(dir, "short.csv"), csv([0, 0.125, 0.25], [0, 0.6, 0]));
});

describe("jointproof audit text tables", () => {
  it("keeps the worst-episodes columns aligned when a duration is wider than the old fixed width", async () => {
    const { code, out, err } = await audit(dir, "--arm", armPath);
    expect(err).toBe("");
    expect(code).toBe(1);
    const lines = out.split("\n");
    const head = lines.findIndex((l) =>
      /^\s+episode\s+verdict\s+frames\s+duration\s+findings\s+first finding$/.test(l),
    );
    expect(head, out).toBeGreaterThan(0);
    const body = lines.slice(head + 1, head + 3);
    const spike = /^Joint "lift", frame 2 \(t = 0\.125 s\): a single-frame spike/;
    const messages = body.map((l) => l.slice(l.indexOf('Joint "lift"')));
    for (const m of messages) expect(m).toMatch(spike);
    expectUnderHeader(
      lines[head],
      ["episode", "verdict", "frames", "duration", "findings", "first finding"],
      [false, false, true, true, true, false],
      [
        ["nanosecond-clock", "FAULT", "4", "12000000000 s", "2", messages[0]],
        ["short", "FAULT", "3", "0.25 s", "1", messages[1]],
      ],
      body,
    );
  });

  it("right-aligns the episode counts under their header in the verdict summary", async () => {
    const { out } = await audit(dir, "--arm", armPath);
    const lines = out.split("\n");
    const head = lines.findIndex((l) => /^verdict\s+episodes$/.test(l));
    expect(head, out).toBeGreaterThan(0);
    expectUnderHeader(
      lines[head],
      ["verdict", "episodes"],
      [false, true],
      [
        ["PASS", "0"],
        ["CAUTION", "0"],
        ["FAULT", "2"],
        ["INVALID", "0"],
      ],
      lines.slice(head + 1, head + 5),
    );
  });
});
