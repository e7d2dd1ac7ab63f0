"use client";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { verdictLook, VerdictChip } from "@/components/ui/verdict-chip";
import { moveNumber, type Joint, type Finding, type Verdict } from "@/kinematics";
import { kindWords } from "./finding-time";

/** A one-click fix the bench checked before offering it. */
export interface PanelFix {
  label: string;
  /** `move`: this move only; `plan`: the whole plan by one factor; `pose`: one joint value. */
  scope: "move" | "plan" | "pose";
  apply: () => void;
}

/** A finding with what the panel needs to place it in time and offer its fixes. */
export interface PanelFinding {
  finding: Finding;
  /** Seconds on the plan's timeline where the value occurs. */
  timeS: number;
  /** Verified one-click fixes, in the order to offer them (this move only, then the whole plan). */
  fixes?: readonly PanelFix[];
  /** What would fix it, in words, when no fix says it all (e.g. "No duration fixes this: …"). */
  remedy?: string | null;
}

export interface FindingsPanelProps {
  /** The verdict to show beside the heading; `null` shows none (no moves yet, or not fully checked). */
  verdict: Verdict | null;
  /** Replaces the count line under the heading (e.g. "No moves yet"). */
  summary?: string;
  /** Findings, already in the order to show them (worst first). */
  items: readonly PanelFinding[];
  joints: readonly Joint[];
  /** Jump the stage and plots to this time and select the move. */
  onJump: (timeS: number, move: number | null) => void;
  className?: string;
}

/**
 * The count beside a verdict chip: the findings of the verdict's own severity (faults beside Fault,
 * cautions beside Caution), the same number the panel's "2 faults, 1 caution" line starts with for
 * that severity; none beside Pass.
 */
export function verdictCount(findings: readonly Pick<Finding, "severity">[], verdict: Verdict): string | undefined {
  if (verdict === "pass") return undefined;
  const n = findings.filter((f) => f.severity === verdict).length;
  return n > 0 ? `${n} ${verdict}${n === 1 ? "" : "s"}` : undefined;
}

/**
 * The findings, worst first, each in plain language: what, which joint, which move, when, by how much,
 * and the fix. Clicking a finding moves the stage and the plots to the moment it happens.
 */
export function FindingsPanel({ verdict, summary, items, joints, onJump, className }: FindingsPanelProps) {
  const faults = items.filter((i) => i.finding.severity === "fault").length;
  const cautions = items.length - faults;
  return (
    <section aria-labelledby="findings-heading" className={cn("flex min-h-0 flex-col", className)}>
      <div className="flex items-center justify-between gap-2 px-3 pt-3 pb-2">
        <h2 id="findings-heading" className="text-[11px] font-semibold tracking-widest text-ink-faint uppercase">
          Findings
        </h2>
        {verdict ? <VerdictChip verdict={verdict} /> : null}
      </div>
      <p className="px-3 pb-2 text-xs text-ink-soft" aria-live="polite" data-testid="findings-summary">
        {summary ??
          (items.length === 0
            ? "No findings: every check passes."
            : `${faults} fault${faults === 1 ? "" : "s"}, ${cautions} caution${cautions === 1 ? "" : "s"}.`)}
      </p>
      <ol className="flex min-h-0 flex-1 flex-col gap-2 overflow-y-auto px-3 pb-3">
        {items.map(({ finding, timeS, fixes, remedy }, k) => {
          const look = verdictLook[finding.severity];
          const joint = finding.joint === null ? undefined : joints[finding.joint];
          const ratio = finding.kind !== "range" && finding.limit > 0 ? finding.value / finding.limit : null;
          return (
            <li
              key={`${finding.kind}-${finding.move}-${finding.joint}-${k}`}
              className={cn("rounded-md border bg-panel", look.border)}
            >
              <button
                type="button"
                onClick={() => onJump(timeS, finding.move)}
                className="w-full rounded-t-md px-2.5 pt-2 pb-1.5 text-left hover:bg-paper"
                aria-label={`${look.word}: ${kindWords[finding.kind]}${joint ? `, ${joint.name}` : ""}${finding.link ? `, link ${finding.link}` : ""}${finding.move !== null ? `, move ${moveNumber(finding.move)}` : ", start pose"}. Show at ${timeS.toFixed(3)} s`}
              >
                <div className="flex flex-wrap items-center gap-1.5">
                  <VerdictChip verdict={finding.severity} size="sm" />
                  <span className="text-xs font-semibold">{kindWords[finding.kind]}</span>
                  {ratio !== null ? (
                    <span className={cn("tabular ml-auto font-mono text-[11px]", look.text)}>
                      {(ratio * 100).toFixed(ratio < 10 ? 1 : 0)}% of limit
                    </span>
                  ) : finding.kind === "clearance" ? (
                    <span className={cn("tabular ml-auto font-mono text-[11px]", look.text)}>
                      {(finding.value * 1000).toFixed(1)} mm deep
                    </span>
                  ) : null}
                </div>
                <dl className="tabular mt-1 flex flex-wrap gap-x-3 font-mono text-[11px] text-ink-soft">
                  {joint ? (
                    <>
                      <dt className="sr-only">Joint</dt>
                      <dd>{joint.name}</dd>
                    </>
                  ) : null}
                  <dt className="sr-only">Move</dt>
                  <dd>{finding.move === null ? "start pose" : `move ${moveNumber(finding.move)}`}</dd>
                  {finding.link ? (
                    <>
                      <dt className="sr-only">Link</dt>
                      <dd>link {finding.link}</dd>
                    </>
                  ) : null}
                  {finding.zone ? (
                    <>
                      <dt className="sr-only">Zone</dt>
                      <dd>into {finding.zone}</dd>
                    </>
                  ) : null}
                  <dt className="sr-only">Time</dt>
                  <dd>t = {timeS.toFixed(3)} s</dd>
                </dl>
                <p className="mt-1 text-xs leading-snug text-ink">{finding.message}</p>
              </button>
              {remedy || (fixes && fixes.length > 0) ? (
                <div className="flex flex-col gap-1.5 border-t border-line/70 px-2.5 py-1.5">
                  {remedy ? (
                    <p className="text-xs leading-snug text-ink-soft" data-testid="finding-remedy">
                      {remedy}
                    </p>
                  ) : null}
                  {fixes && fixes.length > 0 ? (
                    <div className="flex flex-wrap gap-1.5">
                      {fixes.map((fix) => (
                        <Button
                          key={fix.label}
                          size="sm"
                          variant={fix.scope === "plan" ? "ghost" : "secondary"}
                          onClick={fix.apply}
                        >
                          {fix.label}
                        </Button>
                      ))}
                    </div>
                  ) : null}
                </div>
              ) : null}
            </li>
          );
        })}
      </ol>
    </section>
  );
}
