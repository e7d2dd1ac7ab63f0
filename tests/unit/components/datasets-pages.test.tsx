// @vitest-environment happy-dom
// The dataset pages' parts, rendered with the engine's own audits and replays of hand-made episodes
// (no fetch, no mocks of the engine): the episode table, the summary, the replay summary and the
// timed-replay panel of the recordings page.
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import armL from "@/kinematics/arm/presets/bench-arm-l.json";
import { EpisodeTable } from "@/components/datasets/episode-table";
import { DatasetSummary } from "@/components/datasets/dataset-summary";
import { ReplaySummary } from "@/components/datasets/episode-view";
import { TimedReplayPanel } from "@/components/datasets/timed-replay-panel";
import type { EpisodeRowDto, ReplayPlanDto } from "@/components/datasets/dataset-api";
import {
  auditEpisode,
  parseArm,
  replayOf,
  replayViewPlan,
  summarizeAudits,
  type Arm,
  type Recording,
} from "@/kinematics";

afterEach(cleanup);

function armOf(): Arm {
  const result = parseArm({
    name: "Replay arm",
    controlRateHz: 1000,
    joints: [
      { name: "lift", min: -1, max: 1, maxVelocity: 1 },
      { name: "grip", type: "prismatic", min: 0, max: 0.04, maxVelocity: 0.1 },
    ],
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

function recordingOf(lift: number[], t = lift.map((_, k) => k / 30)): Recording {
  return {
    names: ["lift", "grip"],
    jointCount: 2,
    count: lift.length,
    timeS: Float64Array.from(t),
    position: Float64Array.from(lift.flatMap((q) => [q, 0.02])),
  };
}

/** Four episodes: clean, a glitch at frame 3 (0-based 2), outside travel, and one with time going back (invalid). */
const episodes = [
  { id: "clean", recording: recordingOf([0, 0.01, 0.02, 0.03, 0.04]) },
  { id: "spike", recording: recordingOf([0, 0.01, 0.5, 0.03, 0.04]) },
  { id: "over", recording: recordingOf([0.98, 0.99, 1.0, 1.01, 1.02]) },
  { id: "backwards", recording: recordingOf([0, 0.01, 0.02], [0, 0.1, 0.05]) },
];

function rows(): EpisodeRowDto[] {
  const arm = armOf();
  return episodes.map((e, index) => {
    const audit = auditEpisode(arm, e);
    return {
      index,
      episode: e.id,
      samples: audit.samples,
      durationS: e.recording.timeS[e.recording.count - 1] - e.recording.timeS[0],
      verdict: audit.verdict,
      findingCount: audit.findings.length,
      faultCount: audit.findings.filter((f) => f.severity === "fault").length,
      worstKind: audit.verdict === "invalid" ? "invalid" : (audit.findings[0]?.kind ?? null),
      worstMessage: audit.findings[0]?.message ?? audit.problems[0] ?? null,
      repairedVerdict: null,
    };
  });
}

describe("dataset page: episode table", () => {
  it("lists the episodes worst first, an invalid episode as 'Not checked' and never as a pass", () => {
    render(<EpisodeTable episodes={rows()} selected={null} onOpen={() => undefined} />);
    const table = screen.getByTestId("episode-table");
    const bodyRows = within(table).getAllByRole("row").slice(1);
    const ids = bodyRows.map((r) => within(r).getAllByRole("cell")[1].textContent);
    // invalid (rank 3) first, then the two faults, then the pass
    expect(ids[0]).toBe("backwards");
    expect(ids.slice(1, 3).sort()).toEqual(["over", "spike"]);
    expect(ids[3]).toBe("clean");
    expect(within(bodyRows[0]).getByText(/Not checked/)).toBeTruthy();
    expect(within(bodyRows[0]).queryByText(/^Pass$/)).toBeNull();
  });

  it("shows only faults when the verdict filter says faults, and opens an episode by its number counted from 1", () => {
    const onOpen = vi.fn();
    render(<EpisodeTable episodes={rows()} selected={null} onOpen={onOpen} />);
    fireEvent.change(screen.getByLabelText("Show"), { target: { value: "fault" } });
    const table = screen.getByTestId("episode-table");
    const ids = within(table)
      .getAllByRole("row")
      .slice(1)
      .map((r) => within(r).getAllByRole("cell")[1].textContent);
    expect(ids.sort()).toEqual(["over", "spike"]);
    fireEvent.click(screen.getByRole("button", { name: "Open episode 2" }));
    expect(onOpen).toHaveBeenCalledWith(1);
  });
});

describe("dataset page: summary", () => {
  it("shows the engine's counts by verdict and by kind, outside travel in the product's words", () => {
    const arm = armOf();
    const summary = summarizeAudits(episodes.map((e) => auditEpisode(arm, e)));
    render(<DatasetSummary summary={{ ...summary, repaired: 0 }} episodes={rows()} onOpen={() => undefined} />);
    const counts = screen.getByTestId("verdict-counts");
    expect(counts.textContent).toContain(`${summary.episodes} episodes`);
    expect(counts.textContent).toContain(`Not checked · ${summary.invalid}`);
    expect(summary.invalid).toBe(1);
    const kinds = screen.getByTestId("kind-counts").textContent ?? "";
    expect(kinds).toContain(`glitch ${summary.byKind.glitch}`);
    expect(kinds).toContain("outside travel");
  });
});

function dto(arm: Arm, recording: Recording): ReplayPlanDto {
  const replay = replayOf(arm, recording);
  return {
    verdict: replay.verdict,
    easeInS: replay.easeInS,
    easeOutS: replay.easeOutS,
    easeIn: { plan: replay.easeIn, report: replay.easeInReport },
    easeOut: { plan: replay.easeOut, report: replay.easeOutReport },
    passThrough: {
      shape: "monotone cubic through every frame",
      verdict: replay.passThrough.verdict,
      findings: replay.passThrough.findings,
      notChecked: replay.passThrough.notChecked,
    },
    view: replayViewPlan(arm, replay, recording),
    document: {},
    repaired: false,
    caution: "caution",
  };
}

describe("episode view: replay summary", () => {
  it("a clean episode on an arm without a chain: the replay passes, each of the three parts with its verdict", () => {
    const arm = armOf();
    render(<ReplaySummary replay={dto(arm, episodes[0].recording)} />);
    const summary = screen.getByTestId("replay-summary");
    expect(within(screen.getByTestId("replay-verdict")).getByText("Pass")).toBeTruthy();
    expect(summary.textContent).toMatch(/Every frame passed through without stopping/);
    expect(screen.queryByTestId("replay-not-checked")).toBeNull();
  });

  it("on an arm with a chain the replay reads 'Not checked fully', lists what was not checked and shows no Pass verdict", () => {
    const parsed = parseArm(armL);
    if (!parsed.ok) throw new Error("arm");
    const arm = parsed.value;
    const t = Array.from({ length: 6 }, (_, k) => k / 30);
    const recording: Recording = {
      names: arm.joints.map((j) => j.name),
      jointCount: arm.joints.length,
      count: t.length,
      timeS: Float64Array.from(t),
      position: Float64Array.from(t.flatMap(() => arm.joints.map((j) => (j.min <= 0 && j.max >= 0 ? 0 : j.min)))),
    };
    render(<ReplaySummary replay={dto(arm, recording)} />);
    expect(screen.getByTestId("replay-verdict").textContent).toMatch(/Not checked fully/);
    expect(within(screen.getByTestId("replay-verdict")).queryByText("Pass")).toBeNull();
    expect(screen.getByTestId("replay-not-checked").textContent).toMatch(/Effort/);
  });

  it("a speed the arm cannot follow between frames shows the pass-through fault and its message", () => {
    const arm = armOf();
    render(<ReplaySummary replay={dto(arm, episodes[1].recording)} />);
    expect(within(screen.getByTestId("replay-verdict")).getByText("Fault")).toBeTruthy();
    expect(screen.getByRole("list", { name: "Replay findings" }).textContent).toMatch(/joint "lift"/i);
  });
});

describe("recordings page: timed-replay panel", () => {
  it("says it is a different check from the stream check and names the glitch's frame counted from 1", () => {
    render(<TimedReplayPanel arm={armOf()} recording={episodes[1].recording} name="spike" />);
    const panel = screen.getByTestId("timed-replay");
    expect(panel.textContent).toMatch(/different check from the stream check/);
    expect(panel.textContent).toMatch(/frame 3 \(t = /);
    expect(within(panel).getAllByText("Fault").length).toBeGreaterThan(0);
  });
});
