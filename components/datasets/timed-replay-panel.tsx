"use client";
/**
 * The timed-replay audit of one recording, beside the stream check on the recordings page: the same
 * rules as a dataset's episodes (each sample reached in the time between samples: range, speed-over,
 * glitch, gap), run in the browser by the engine. Says which check a result comes from.
 */
import { useMemo } from "react";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { auditEpisode, type Arm, type Recording } from "@/kinematics";

export function TimedReplayPanel({ arm, recording, name }: { arm: Arm; recording: Recording; name: string }) {
  const audit = useMemo(() => auditEpisode(arm, { id: name, recording }), [arm, recording, name]);
  return (
    <section aria-label="Timed replay" className="flex flex-col gap-2" data-testid="timed-replay">
      <div className="flex items-center gap-2">
        <h2 className="text-sm font-semibold">Timed replay</h2>
        {audit.verdict === "invalid" ? (
          <span className="text-xs text-ink-soft">⊘ Not checked</span>
        ) : (
          <VerdictChip verdict={audit.verdict} />
        )}
      </div>
      <p className="text-xs text-ink-soft">
        A different check from the stream check above: each sample reached in the time between samples (as a dataset
        episode is audited), not streamed as instant moves.
      </p>
      {audit.problems.length > 0 ? (
        <ul className="text-xs">
          {audit.problems.map((p, i) => (
            <li key={i}>{p}</li>
          ))}
        </ul>
      ) : null}
      {audit.findings.length > 0 ? (
        <ol className="flex max-h-40 flex-col gap-1 overflow-auto text-xs">
          {audit.findings.slice(0, 100).map((f, i) => (
            <li key={i} className="flex gap-1.5">
              <VerdictChip verdict={f.severity} size="sm" />
              <span>{f.message}</span>
            </li>
          ))}
          {audit.findings.length > 100 ? (
            <li className="text-ink-faint">… and {audit.findings.length - 100} more</li>
          ) : null}
        </ol>
      ) : audit.verdict === "pass" ? (
        <p className="text-xs text-ink-soft">No findings.</p>
      ) : null}
    </section>
  );
}
