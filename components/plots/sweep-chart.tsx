"use client";
import { memo, useMemo } from "react";
import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, XAxis, YAxis } from "recharts";
import { verdictLook } from "@/components/ui/verdict-chip";
import type { Plan } from "@/kinematics";
import { hintFor } from "@/lib/shared/glossary";
import { LIMIT_LINE_OPACITY, TRACE_WIDTH } from "./plot-style";
import type { LastSweep } from "@/components/editor/use-full-check";
import { sweepInputs } from "./duration-sweep";

export { sweepInputs } from "./duration-sweep";

export interface SweepChartProps {
  /** The plan as it is checked (an assignment's tightened arm included). */
  plan: Plan;
  /** The move to sweep (0-based). */
  index: number;
  cautionRatio: number;
  /** The report's shortest passing duration (every timing check); `null` when no duration passes. */
  minSafeS: number | null;
  currentS: number;
  /** Whether `minSafeS` comes from the full report of this plan (not the joint checks alone). */
  ready: boolean;
  /** The latest sweep the check worker answered (use-full-check.ts), of this plan or an earlier one. */
  sweep: LastSweep | null;
}

/**
 * The duration sweep of one move as a chart: the engine's worst peak-to-limit ratio over every
 * timing-dependent check (speed, acceleration, effort, tool speed) against duration, the limit and
 * caution lines, the shortest safe and current durations marked. Ratio 1 is the limit. The check
 * worker sweeps the selected move after each report (duration-sweep.ts); a sweep of an earlier plan
 * is still this move's when the arm, the plan-level limits and this move's path are the same (an edit
 * of another move), and is otherwise shown faded, marked pending, until the new one arrives.
 */
export function SweepChart({ plan, index, cautionRatio, minSafeS, currentS, ready, sweep }: SweepChartProps) {
  const ofThisMove = sweep !== null && sweep.index === index;
  const current =
    ofThisMove &&
    sweepInputs(sweep.plan, index, sweep.plan.moves[index]?.duration ?? NaN) === sweepInputs(plan, index, currentS);
  const shown = ofThisMove ? sweep.sweep : null;
  const data = useMemo(() => shown?.points.map((p) => ({ d: p.d, r: Math.min(p.r, 2.5) })) ?? null, [shown]);
  const checks = plan.arm.chain ? "speed, acceleration, effort, tool speed" : "speed and acceleration: no geometry";
  if (ready && minSafeS === null) {
    return (
      <p className="text-xs text-fault" data-testid="sweep-no-duration">
        No duration of this move passes every check: the findings say what would fix it.
      </p>
    );
  }
  if (ready && !(minSafeS !== null && minSafeS > 0))
    return <p className="text-xs text-ink-soft">This move does not change any joint, so any duration passes.</p>;
  if (current && sweep.error)
    return (
      <p role="alert" className="text-xs text-fault">
        The duration sweep could not be computed ({sweep.error}). The findings and the shortest safe duration still
        hold.
      </p>
    );
  if (!shown || !data)
    return (
      <p className="flex h-36 items-center justify-center text-xs text-ink-soft" data-pending="sweep">
        Sweeping the durations of this move…
      </p>
    );
  return (
    <div data-pending={current ? undefined : "sweep"} className={current ? undefined : "opacity-60"}>
      <SweepFigure
        data={data}
        checks={checks}
        cautionRatio={cautionRatio}
        minSafeS={shown.minSafeS}
        currentS={shown.currentS}
      />
    </div>
  );
}

/** The chart itself, drawn again only when its data or marks change. */
const SweepFigure = memo(function SweepFigure({
  data,
  checks,
  cautionRatio,
  minSafeS,
  currentS,
}: {
  data: { d: number; r: number }[];
  checks: string;
  cautionRatio: number;
  minSafeS: number;
  currentS: number;
}) {
  // rounded up to the millisecond, as the move list's "Shortest safe" fix offers it
  const safeText = (Math.ceil(minSafeS * 1000 - 1e-9) / 1000).toFixed(3);
  return (
    <figure
      aria-label={`Duration sweep: worst peak-to-limit ratio of ${checks} against duration; shortest safe duration ${safeText} s`}
    >
      <figcaption className="mb-1 flex justify-between text-[11px] text-ink-soft">
        <span title={hintFor("durationSweep")}>Duration sweep (worst of {checks}; peak ÷ limit)</span>
        <span className="tabular font-mono">safe ≥ {safeText} s</span>
      </figcaption>
      <div className="h-32 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 4, right: 8, bottom: 0, left: 0 }}>
            <CartesianGrid stroke="#e7e4da" strokeDasharray="2 3" />
            <XAxis
              dataKey="d"
              type="number"
              domain={["dataMin", "dataMax"]}
              tick={{ fontSize: 10, fill: "#6b7280" }}
              tickFormatter={(v: number) => `${Number(v.toFixed(2))}s`}
              height={16}
            />
            <YAxis
              width={34}
              domain={[0, 2.5]}
              ticks={[0, 0.5, 1, 1.5, 2, 2.5]}
              tick={{ fontSize: 10, fill: "#6b7280" }}
            />
            <ReferenceLine y={1} stroke={verdictLook.fault.stroke} strokeOpacity={LIMIT_LINE_OPACITY} />
            <ReferenceLine
              y={cautionRatio}
              stroke={verdictLook.caution.stroke}
              strokeOpacity={LIMIT_LINE_OPACITY}
              strokeDasharray="4 3"
            />
            <ReferenceLine
              x={minSafeS}
              stroke={verdictLook.pass.stroke}
              strokeDasharray="3 2"
              label={{
                value: "shortest safe",
                position: "insideTopRight",
                fontSize: 10,
                fill: verdictLook.pass.stroke,
              }}
            />
            <ReferenceLine
              x={currentS}
              stroke="#b8612a"
              label={{ value: "now", position: "insideTopLeft", fontSize: 10, fill: "#9a4f21" }}
            />
            <Line dataKey="r" stroke="#1f6f86" strokeWidth={TRACE_WIDTH} dot={false} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
});
