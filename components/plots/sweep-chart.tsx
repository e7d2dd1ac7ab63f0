"use client";
import { memo, useDeferredValue, useMemo } from "react";
import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, XAxis, YAxis } from "recharts";
import { verdictLook } from "@/components/ui/verdict-chip";
import { moveTimingSweep, type Plan } from "@/kinematics";
import { hintFor } from "@/lib/shared/glossary";
import { LIMIT_LINE_OPACITY, TRACE_WIDTH } from "./plot-style";

/** Durations the chart evaluates (each one a peak evaluation of the move's path). */
const sweepSteps = 48;

export interface SweepChartProps {
  /** The plan as it is checked (an assignment's tightened arm included). */
  plan: Plan;
  /** The move to sweep (0-based). */
  index: number;
  cautionRatio: number;
  /** The report's shortest passing duration (every timing check); `null` when no duration passes. */
  minSafeS: number | null;
  currentS: number;
}

/**
 * Everything the sweep of move `index` depends on, as one string: the arm, the plan-level limits,
 * the move's start (the previous goal), goal and shape, and the marks. Equal strings, equal sweeps.
 */
export function sweepInputs(plan: Plan, index: number, minSafeS: number | null, currentS: number): string {
  const move = plan.moves[index];
  return JSON.stringify([
    plan.arm,
    plan.payload,
    plan.keepOut,
    plan.surfaceMargin,
    plan.maxToolSpeed,
    index === 0 ? plan.start : plan.moves[index - 1]?.goal,
    move?.goal,
    move?.shape,
    minSafeS,
    currentS,
  ]);
}

/**
 * The duration sweep of one move as a chart: the engine's worst peak-to-limit ratio over every
 * timing-dependent check (speed, acceleration, effort, tool speed) against duration, the limit and
 * caution lines, the shortest safe and current durations marked. Ratio 1 is the limit.
 */
export function SweepChart(props: SweepChartProps) {
  // The sweep trails the edit (the findings and plots come first): it is drawn from deferred props,
  // all from the same render.
  const plan = useDeferredValue(props.plan);
  const index = useDeferredValue(props.index);
  const minSafeS = useDeferredValue(props.minSafeS);
  const currentS = useDeferredValue(props.currentS);
  const cautionRatio = props.cautionRatio;
  // The sweep depends on the arm, the plan-level limits and this move's path (its start, goal and
  // shape), not on the other moves: an edit elsewhere in the plan neither sweeps nor redraws it again.
  const inputs = sweepInputs(plan, index, minSafeS, currentS);
  const data = useMemo(() => {
    const safe = minSafeS ?? currentS;
    const hi = Math.max(safe * 3, currentS * 1.2, 0.2);
    const lo = Math.max(safe * 0.5, 0.01);
    const durations = Array.from({ length: sweepSteps + 1 }, (_, k) => lo + ((hi - lo) * k) / sweepSteps);
    return moveTimingSweep(plan, index, durations).map((p) => ({ d: p.durationS, r: Math.min(p.ratio, 2.5) }));
    // plan is read only through what `inputs` holds (see above)
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [inputs, index]);
  const checks = plan.arm.chain ? "speed, acceleration, effort, tool speed" : "speed and acceleration: no geometry";
  if (minSafeS === null) {
    return (
      <p className="text-xs text-fault" data-testid="sweep-no-duration">
        No duration of this move passes every check: the findings say what would fix it.
      </p>
    );
  }
  if (!(minSafeS > 0))
    return <p className="text-xs text-ink-soft">This move does not change any joint, so any duration passes.</p>;
  return (
    <SweepFigure data={data} checks={checks} cautionRatio={cautionRatio} minSafeS={minSafeS} currentS={currentS} />
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
