// @vitest-environment happy-dom
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { MoveList } from "@/components/editor/move-list";
import { FindingsPanel } from "@/components/findings/findings-panel";
import { check, moveLabel, moveNumber, samplePlan } from "@/kinematics";
import { buildCsvExport } from "@/lib/shared/export-format";
import { demoPlan, pose } from "../components/helpers";

// Numbering people expect (DEVELOPERS.md, Glossary: "Move 1, line 12 — not move 0"): the project's
// own rule, no outside source. Moves are counted from 1 on screens, in CLI lines and in messages;
// JSON fields stay 0-based.

afterEach(cleanup);

const root = join(__dirname, "..", "..", "..");

/** A plan whose first move (`moves[0]`) is too short for the base: 0.5 rad quintic in 0.2 s. */
const firstMoveFaults = () =>
  demoPlan([
    { goal: pose(0.5), duration: 0.2 },
    { goal: pose(0.5, 0.4), duration: 2 },
  ]);

describe("moves are counted from 1 for people, 0-based in JSON", () => {
  it("names the move at index 0 'Move 1', and an instant one 'Instant move 1'", () => {
    expect(moveNumber(0)).toBe(1);
    expect(moveLabel(0)).toBe("Move 1");
    expect(moveLabel(0, true)).toBe("Instant move 1");
    expect(moveLabel(4, false)).toBe("Move 5");
  });

  it("the report's message for the first move says Move 1 while its JSON field says move: 0", () => {
    const report = check(firstMoveFaults());
    const first = report.findings.filter((f) => f.move === 0);
    expect(first.length).toBeGreaterThan(0);
    for (const f of first) {
      expect(f.message).toMatch(/^Move 1, joint "base"/);
      expect(f.message).not.toMatch(/Move 0/);
    }
    expect(report.moves[0].index).toBe(0);
  });

  it("an instant first move's jump message says Instant move 1", () => {
    const report = check(demoPlan([{ goal: pose(0.6), duration: 0 }]));
    const jump = report.findings.find((f) => f.kind === "jump");
    expect(jump?.move).toBe(0);
    expect(jump?.message).toMatch(/^Instant move 1, joint "base"/);
  });

  it("the move list renders the first move as Move 1 (label, duration field and verdict row)", () => {
    const plan = firstMoveFaults();
    const report = check(plan);
    render(
      <MoveList
        joints={plan.arm.joints}
        startPose={plan.start}
        moves={plan.moves}
        reports={report.moves}
        unit="deg"
        selected={0}
        onSelect={() => {}}
        dispatch={() => {}}
        startVerdict="pass"
        fixes={null}
      />,
    );
    expect(screen.getByText("Move 1")).toBeTruthy();
    expect(screen.getByText("Move 2")).toBeTruthy();
    expect(screen.queryByText("Move 0")).toBeNull();
    expect(screen.getByLabelText("Move 1 duration (s)")).toBeTruthy();
    expect(screen.getByTestId("move-row-0").getAttribute("aria-label")).toBe("Move 1: fault");
  });

  it("the findings rail names the first move 'move 1'", () => {
    const plan = firstMoveFaults();
    const report = check(plan);
    const items = report.findings.map((finding) => ({ finding, timeS: finding.timeS ?? 0, fixes: [], remedy: null }));
    render(<FindingsPanel verdict={report.verdict} items={items} joints={plan.arm.joints} onJump={() => {}} />);
    const buttons = screen.getAllByRole("button", { name: /^Fault: .*, base, move 1\./ });
    expect(buttons.length).toBeGreaterThan(0);
    expect(screen.queryAllByRole("button", { name: /move 0\./ })).toEqual([]);
  });

  it("the CSV export's finding comment lines count moves from 1 and name the joint", async () => {
    const plan = firstMoveFaults();
    const report = check(plan);
    const csv = await buildCsvExport(plan, report, samplePlan(plan, { rateHz: 100 }), {
      plan: { id: "6a4b1c2d-0000-4000-8000-000000000001", name: "Too fast" },
      planVersion: 1,
      savedAt: "2026-12-02T14:05:00.000Z",
      armRevision: { armId: "6a4b1c2d-0000-4000-8000-000000000002", name: "Bench arm · guide handle", revision: 1 },
    });
    const findingLines = csv.split("\n").filter((l) => l.startsWith("# finding: "));
    expect(findingLines).toHaveLength(report.findings.length);
    for (const l of findingLines) expect(l).toMatch(/^# finding: fault \S+ move 1 joint base: Move 1, joint "base"/);
  });

  it("the command line's table and finding lines say move 1 for the first move, its --json says move: 0", () => {
    const plan = firstMoveFaults();
    const bin = join(root, "bin", "jointproof");
    const text = spawnSync(process.execPath, [bin, "check", "-"], {
      cwd: root,
      input: JSON.stringify(plan),
      encoding: "utf8",
    });
    expect(text.status).toBe(1);
    const findingLines = text.stdout.split("\n").filter((l) => /^\s+fault\s/.test(l));
    expect(findingLines.length).toBeGreaterThan(0);
    for (const l of findingLines) expect(l).toMatch(/^\s+fault\s+\S+\s+1\s+base\s+Move 1, joint "base"/);
    expect(text.stdout).toMatch(/^\s+1\s+quintic\s+0\.200 s\s.*fault$/m);
    const json = spawnSync(process.execPath, [bin, "check", "-", "--json"], {
      cwd: root,
      input: JSON.stringify(plan),
      encoding: "utf8",
    });
    const report = JSON.parse(json.stdout) as { findings: { move: number | null; message: string }[] };
    expect(report.findings.filter((f) => f.message.startsWith("Move 1,")).every((f) => f.move === 0)).toBe(true);
  }, 60_000);
});
