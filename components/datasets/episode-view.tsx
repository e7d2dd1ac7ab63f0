"use client";
/**
 * One episode: its timed-replay findings, the recording plot for a chosen joint (findings shaded,
 * the repaired trace dashed), the episode replayed on the arm in 3D through its replay plan, and the
 * repair and replay-plan actions.
 */
import { JointPicker } from "@/components/plots/joint-picker";
import dynamic from "next/dynamic";
import { useQuery } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { ErrorNote, EmptyState } from "@/components/ui/panel";
import { Skeleton } from "@/components/ui/skeleton";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { PauseIcon, PlayIcon } from "@/components/ui/icons";
import { Playhead, PlayheadContext, usePlayhead, useSyncTotal } from "@/components/editor/playhead";
import { StageErrorBoundary } from "@/components/viewer/error-boundary";
import { schematicChain } from "@/components/viewer/schematic-chain";
import { RecordingPlot } from "@/components/recordings/recording-plot";
import { timelineOf, type Recording, type StreamFinding } from "@/kinematics";
import { queryKeys } from "@/lib/client/query-keys";
import type { AngleUnit } from "@/lib/shared/units";
import { datasetApi, type EpisodeDto, type EpisodeFrames, type ReplayPlanDto } from "./dataset-api";

const Stage = dynamic(() => import("@/components/viewer/stage"), {
  ssr: false,
  loading: () => <Skeleton className="h-full w-full rounded-none" />,
});

function recordingOf(frames: EpisodeFrames, names: string[]): Recording {
  return {
    names,
    jointCount: frames.jointCount,
    count: frames.count,
    timeS: Float64Array.from(frames.timeS),
    position: Float64Array.from(frames.position),
  };
}

/** The timed-replay findings in the shape the recording plot draws (a gap on every joint). */
function plotFindings(episode: EpisodeDto["episode"], jointCount: number): StreamFinding[] {
  return episode.findings.flatMap((f) =>
    (f.joint === null ? Array.from({ length: jointCount }, (_, j) => j) : [f.joint]).map((joint) => ({
      kind: f.kind,
      severity: f.severity,
      joint,
      sample: f.sample,
      endSample: f.endSample,
      line: f.sample + 2,
      endLine: f.endSample + 2,
      time: f.timeS,
      value: f.value,
      limit: f.limit,
      message: f.message,
    })),
  );
}

function ReplayStage({ replay, arm }: { replay: ReplayPlanDto; arm: EpisodeDto["arm"] }) {
  const playhead = useMemo(() => new Playhead(), []);
  const timeline = useMemo(() => timelineOf(replay.view), [replay]);
  useSyncTotal(playhead, timeline.totalS);
  const chain = useMemo(() => arm.chain ?? schematicChain(arm.joints), [arm]);
  return (
    <PlayheadContext.Provider value={playhead}>
      <div className="relative h-72 overflow-hidden rounded-md bg-[#f3f1ea]" data-testid="episode-stage">
        <StageErrorBoundary>
          <Stage chain={chain} joints={arm.joints} timeline={timeline} ghosts={[]} linkSeverity={[]} />
        </StageErrorBoundary>
        {!arm.chain ? (
          <span className="absolute top-2 left-2 rounded bg-caution-tint px-1.5 py-0.5 text-[11px] text-caution">
            Schematic: this arm has no geometry
          </span>
        ) : null}
      </div>
      <PlayControls playhead={playhead} />
    </PlayheadContext.Provider>
  );
}

/** The replay's three parts, their verdicts, and what was not checked (the replay is then no pass). */
export function ReplaySummary({ replay }: { replay: ReplayPlanDto }) {
  const { passThrough } = replay;
  return (
    <div className="flex flex-col gap-1 text-xs" data-testid="replay-summary">
      <p className="flex flex-wrap items-center gap-1 text-ink-soft">
        Replay{replay.repaired ? " (repaired episode)" : ""}:{" "}
        {replay.verdict === "incomplete" ? (
          <span className="font-medium text-ink" data-testid="replay-verdict">
            ⊘ Not checked fully
          </span>
        ) : (
          <span data-testid="replay-verdict">
            <VerdictChip verdict={replay.verdict} size="sm" />
          </span>
        )}
      </p>
      <ol className="flex flex-col gap-0.5 text-ink-soft">
        <li className="flex items-center gap-1">
          1. Ease in from rest over {replay.easeInS} s <VerdictChip verdict={replay.easeIn.report.verdict} size="sm" />
        </li>
        <li className="flex items-center gap-1">
          2. Every frame passed through without stopping ({passThrough.shape}){" "}
          <VerdictChip verdict={passThrough.verdict} size="sm" />
        </li>
        <li className="flex items-center gap-1">
          3. Ease out to rest over {replay.easeOutS} s <VerdictChip verdict={replay.easeOut.report.verdict} size="sm" />
        </li>
      </ol>
      {passThrough.findings.length > 0 ? (
        <ul className="flex flex-col gap-0.5" aria-label="Replay findings">
          {passThrough.findings.map((f, i) => (
            <li key={i} className="flex gap-2">
              <VerdictChip verdict={f.severity} size="sm" />
              <span>{f.message}</span>
            </li>
          ))}
        </ul>
      ) : null}
      {passThrough.notChecked.length > 0 ? (
        <ul className="flex flex-col gap-0.5 text-caution" aria-label="Not checked" data-testid="replay-not-checked">
          {passThrough.notChecked.map((line, i) => (
            <li key={i}>{line}</li>
          ))}
        </ul>
      ) : null}
      {[...replay.easeIn.report.findings, ...replay.easeOut.report.findings].map((f, i) => (
        <p key={`ease-${i}`} className="flex gap-2">
          <VerdictChip verdict={f.severity} size="sm" />
          <span>{f.message}</span>
        </p>
      ))}
    </div>
  );
}

function PlayControls({ playhead }: { playhead: Playhead }) {
  const { timeS, totalS, playing } = usePlayhead();
  return (
    <div className="flex items-center gap-2">
      <Button size="sm" onClick={() => playhead.toggle()} aria-label={playing ? "Pause" : "Play the replay"}>
        {playing ? <PauseIcon size={14} /> : <PlayIcon size={14} />}
      </Button>
      <input
        type="range"
        min={0}
        max={totalS}
        step={0.01}
        value={timeS}
        onChange={(e) => playhead.seek(Number(e.target.value))}
        aria-label="Replay time"
        className="flex-1"
      />
      <span className="tabular w-28 text-right text-xs">
        {timeS.toFixed(2)} / {totalS.toFixed(2)} s
      </span>
    </div>
  );
}

export function EpisodeView({
  datasetId,
  index,
  canEdit,
  unit,
  onRepaired,
  caution,
}: {
  datasetId: string;
  index: number;
  canEdit: boolean;
  unit: AngleUnit;
  onRepaired: () => void;
  caution: string;
}) {
  const [joint, setJoint] = useState(0);
  const [repairing, setRepairing] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const episode = useQuery({
    queryKey: queryKeys.datasetEpisode(datasetId, index),
    queryFn: () => datasetApi.episode(datasetId, index),
  });
  const replay = useQuery({
    queryKey: [...queryKeys.datasetEpisode(datasetId, index), "replay-plan"],
    queryFn: () => datasetApi.replayPlan(datasetId, index),
    enabled: episode.data?.episode.verdict !== "invalid" && episode.isSuccess,
    retry: false,
  });
  const data = episode.data;
  const original = useMemo(
    () =>
      data
        ? recordingOf(
            data.recorded,
            data.arm.joints.map((j) => j.name),
          )
        : null,
    [data],
  );
  const repaired = useMemo(
    () =>
      data?.repaired
        ? recordingOf(
            data.repaired,
            data.arm.joints.map((j) => j.name),
          )
        : null,
    [data],
  );
  if (episode.isPending) return <Skeleton className="h-64 w-full" />;
  if (episode.isError) return <ErrorNote>{episode.error.message}</ErrorNote>;
  const { episode: audit, arm } = episode.data;
  const findings = plotFindings(audit, arm.joints.length);

  const repair = async () => {
    setRepairing(true);
    setError(null);
    try {
      await datasetApi.repair(datasetId, [index]);
      await episode.refetch();
      await replay.refetch();
      onRepaired();
    } catch (err) {
      setError(err instanceof Error ? err.message : "The repair failed.");
    } finally {
      setRepairing(false);
    }
  };

  const downloadPlan = () => {
    if (!replay.data) return;
    const blob = new Blob([JSON.stringify(replay.data.document, null, 2) + "\n"], { type: "application/json" });
    const a = document.createElement("a");
    a.href = URL.createObjectURL(blob);
    a.download = `episode-${index + 1}-replay.json`;
    a.click();
    URL.revokeObjectURL(a.href);
  };

  return (
    <section aria-label={`Episode ${index + 1}`} className="flex flex-col gap-3" data-testid="episode-view">
      <header className="flex flex-wrap items-center gap-2">
        <h2 className="text-sm font-semibold">
          Episode {index + 1} <span className="font-mono text-xs text-ink-soft">{audit.episode}</span>
        </h2>
        {audit.verdict === "invalid" ? (
          <span className="text-xs text-ink-soft">⊘ Not checked</span>
        ) : (
          <VerdictChip verdict={audit.verdict} />
        )}
        <span className="text-xs text-ink-soft">
          timed replay · {audit.samples} frames · {audit.durationS.toFixed(2)} s
        </span>
        {audit.repairedVerdict ? (
          <span className="flex items-center gap-1 text-xs text-ink-soft">
            repaired:{" "}
            {audit.repairedVerdict === "invalid" ? (
              "not checked"
            ) : (
              <VerdictChip verdict={audit.repairedVerdict as "pass" | "caution" | "fault"} size="sm" />
            )}
          </span>
        ) : null}
        <span className="flex-1" />
        {canEdit && audit.verdict !== "invalid" && audit.findingCount > 0 ? (
          <Button size="sm" variant="primary" disabled={repairing} onClick={() => void repair()}>
            {repairing ? "Repairing…" : "Repair this episode"}
          </Button>
        ) : null}
        <Button size="sm" disabled={!replay.data} onClick={downloadPlan}>
          Download replay
        </Button>
      </header>
      {error ? <ErrorNote>{error}</ErrorNote> : null}
      {audit.problems.length > 0 ? (
        <ErrorNote title="This episode could not be checked">
          <ul className="text-xs">
            {audit.problems.map((p, i) => (
              <li key={i}>{p}</li>
            ))}
          </ul>
        </ErrorNote>
      ) : null}
      {audit.findings.length > 0 ? (
        <ol
          className="flex max-h-40 flex-col gap-1 overflow-auto text-xs"
          aria-label="Findings"
          data-testid="episode-findings"
        >
          {audit.findings.map((f, i) => (
            <li key={i} className="flex gap-2">
              <VerdictChip verdict={f.severity} size="sm" />
              <span className="font-mono">{f.kind}</span>
              <span>{f.message}</span>
            </li>
          ))}
        </ol>
      ) : audit.verdict !== "invalid" ? (
        <p className="text-xs text-ink-soft">
          No findings: every frame is within travel and reachable in the time between frames.
        </p>
      ) : null}
      {original && audit.verdict !== "invalid" ? (
        <>
          <JointPicker
            joints={arm.joints}
            selected={joint}
            onSelect={setJoint}
            findingsOf={(i) => audit.findings.filter((f) => f.joint === i).length}
          />
          <div data-testid="episode-plot">
            <RecordingPlot
              original={original}
              repaired={repaired}
              joint={joint}
              jointInfo={arm.joints[joint]}
              findings={findings}
              unit={unit}
            />
          </div>
        </>
      ) : null}
      {replay.data ? (
        <div className="flex flex-col gap-2">
          <ReplaySummary replay={replay.data} />
          <ReplayStage replay={replay.data} arm={arm} />
          <p className="text-[11px] text-ink-faint" data-testid="replay-caution">
            {caution}
          </p>
        </div>
      ) : replay.isError ? (
        <EmptyState title="No replay plan">{replay.error.message}</EmptyState>
      ) : null}
    </section>
  );
}
