"use client";
import { memo, useMemo, useRef, type PointerEvent } from "react";
import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, XAxis, YAxis } from "recharts";
import { cn } from "@/components/ui/cn";
import { verdictLook } from "@/components/ui/verdict-chip";
import type { Joint, Samples } from "@/kinematics";
import { hintFor } from "@/lib/shared/glossary";
import { displayFactor, unitLabel, type AngleUnit, type Quantity } from "@/lib/shared/units";
import { usePlayhead, usePlayheadStore } from "@/components/editor/playhead";
import { minMaxIndices } from "./downsample";
import type { EffortSeries } from "./effort";
import { jointColor } from "./joint-colors";
import { LIMIT_LINE_OPACITY, LIMIT_LINE_WIDTH, PLOT_HEIGHT_PX, TRACE_WIDTH } from "./plot-style";

/** A vertical marker on the plots at the moment of a finding. */
export interface PlotMarker {
  timeS: number;
  joint: number | null;
  severity: "caution" | "fault";
}

export interface JointPlotsProps {
  samples: Samples;
  joints: readonly Joint[];
  cautionRatio: number;
  unit: AngleUnit;
  selectedJoints: readonly number[];
  onSelectedJointsChange: (joints: number[]) => void;
  markers: readonly PlotMarker[];
  /** Joint effort along the samples (arms with a chain); adds an effort chart. */
  effort?: EffortSeries | null;
  quantities?: readonly Quantity[];
  /**
   * Buckets for the min–max downsampling (points ≈ 2 × buckets × selected joints at most). 200 gives
   * about one point per 2 px of a wide chart; each bucket keeps its extremes, so no peak is lost.
   */
  buckets?: number;
  /** Moves in the plan, instant ones included: with moves but no time to plot, the plots say why. */
  moveCount?: number;
  className?: string;
}

/** What the plots say when there is no time span to draw. */
export function noMotionText(moveCount: number | undefined): string {
  if (moveCount === undefined || moveCount === 0)
    return "No moves yet: add a move with a duration to see positions, speeds and accelerations over time.";
  return (
    `${moveCount === 1 ? "The plan's one move is an instant move" : `All ${moveCount} moves are instant moves`}: the controller is asked to be at each goal ` +
    "at its next cycle, so there is no motion over time to plot. An instant move faults when its step exceeds what a joint travels in one control period; " +
    "give it a duration to see its positions, speeds and accelerations."
  );
}

const Y_AXIS_WIDTH = 52;
const RIGHT_MARGIN = 12;

const quantityWords: Record<Quantity, string> = {
  position: "Position",
  velocity: "Speed",
  acceleration: "Acceleration",
  effort: "Effort",
};

/** A chart's title: effort reads "Torque" for revolute joints and "Force" for prismatic ones. */
export function quantityTitle(quantity: Quantity, types: readonly Joint["type"][]): string {
  if (quantity !== "effort") return quantityWords[quantity];
  const kinds = new Set(types);
  if (kinds.size === 1) return kinds.has("prismatic") ? "Force" : "Torque";
  return "Torque and force";
}

function limitsOf(joint: Joint, q: Quantity): { lo: number; hi: number } | null {
  if (q === "position") return { lo: joint.min, hi: joint.max };
  if (q === "velocity") return { lo: -joint.maxVelocity, hi: joint.maxVelocity };
  if (q === "acceleration" && joint.maxAcceleration !== undefined)
    return { lo: -joint.maxAcceleration, hi: joint.maxAcceleration };
  if (q === "effort" && joint.maxEffort !== undefined) return { lo: -joint.maxEffort, hi: joint.maxEffort };
  return null;
}

/**
 * Position, speed and acceleration of the selected joints against time, one chart per quantity on a
 * shared time axis, with each joint's limit (solid) and caution (dashed) lines, markers at the findings,
 * and the playhead as a cursor line. Click or drag on a chart to move the playhead.
 */
export function JointPlots(props: JointPlotsProps) {
  const {
    samples,
    joints,
    cautionRatio,
    unit,
    selectedJoints,
    onSelectedJointsChange,
    markers,
    effort,
    buckets = 200,
    className,
  } = props;
  const quantities = useMemo<readonly Quantity[]>(
    () =>
      props.quantities ??
      (effort ? ["position", "velocity", "acceleration", "effort"] : ["position", "velocity", "acceleration"]),
    [props.quantities, effort],
  );
  const n = samples.jointCount;
  const totalS = samples.count > 0 ? samples.timeS[samples.count - 1] : 0;

  const data = useMemo(() => {
    const cols = selectedJoints.filter((j) => j < n);
    const byQuantity: Record<string, Record<string, number>[]> = {};
    for (const q of quantities) {
      const isEffort = q === "effort";
      if (isEffort && !effort) continue;
      const arr = isEffort
        ? effort!.values
        : q === "position"
          ? samples.position
          : q === "velocity"
            ? samples.velocity
            : samples.acceleration;
      const stride = isEffort ? effort!.stride : n;
      const qCols = isEffort ? cols.filter((j) => j < stride) : cols;
      const idx = minMaxIndices(samples.count, arr, stride, qCols, buckets);
      const rows: Record<string, number>[] = new Array(idx.length);
      for (let r = 0; r < idx.length; r++) {
        const k = idx[r];
        const row: Record<string, number> = { t: samples.timeS[k] };
        for (const j of qCols)
          row[`j${j}`] = arr[k * stride + j] * (isEffort ? 1 : displayFactor(joints[j].type, unit));
        rows[r] = row;
      }
      byQuantity[q] = rows;
    }
    return byQuantity;
  }, [samples, n, selectedJoints, quantities, buckets, joints, unit, effort]);

  // the joints each chart draws, kept by identity so that an unchanged chart is not drawn again
  const chartJoints = useMemo(
    () => ({
      motion: selectedJoints.filter((j) => j < n),
      effort: selectedJoints.filter((j) => j < (effort ? effort.stride : n)),
    }),
    [selectedJoints, n, effort],
  );

  return (
    <div className={cn("flex flex-col gap-1", className)}>
      <div role="group" aria-label="Joints to plot" className="flex flex-wrap items-center gap-1 px-1">
        <span className="mr-1 text-[11px] font-semibold tracking-widest text-ink-faint uppercase">Joints</span>
        {joints.map((joint, j) => {
          const on = selectedJoints.includes(j);
          return (
            <button
              key={joint.name}
              type="button"
              aria-pressed={on}
              onClick={() =>
                onSelectedJointsChange(
                  on ? selectedJoints.filter((x) => x !== j) : [...selectedJoints, j].sort((a, b) => a - b),
                )
              }
              className={cn(
                "inline-flex items-center gap-1 rounded-full border px-2 py-px text-[11px]",
                on ? "border-ink/30 bg-panel text-ink" : "border-line text-ink-faint hover:text-ink",
              )}
            >
              <span
                aria-hidden="true"
                className="inline-block h-2 w-2 rounded-full"
                style={{ background: on ? jointColor(j) : "transparent", border: `1.5px solid ${jointColor(j)}` }}
              />
              {joint.name}
            </button>
          );
        })}
        <span className="ml-auto flex items-center gap-3 text-[10px] text-ink-faint" title={hintFor("cautionRatio")}>
          <span className="inline-flex items-center gap-1">
            <span className="inline-block h-0 w-4 border-t-2 border-fault/45" /> limit
          </span>
          <span className="inline-flex items-center gap-1">
            <span className="inline-block h-0 w-4 border-t-2 border-dashed border-caution/45" /> caution{" "}
            {Math.round(cautionRatio * 100)}%
          </span>
        </span>
      </div>
      {totalS <= 0 ? (
        <p className="px-2 py-6 text-center text-xs text-ink-soft" data-testid="plots-empty">
          {noMotionText(props.moveCount)}
        </p>
      ) : selectedJoints.length === 0 ? (
        <p className="px-2 py-6 text-center text-xs text-ink-soft">Pick a joint above to plot it.</p>
      ) : (
        quantities
          .filter((q) => data[q])
          .map((q) => (
            <QuantityChart
              key={q}
              quantity={q}
              rows={data[q]}
              totalS={totalS}
              joints={joints}
              selectedJoints={q === "effort" ? chartJoints.effort : chartJoints.motion}
              cautionRatio={cautionRatio}
              unit={unit}
              markers={markers}
            />
          ))
      )}
    </div>
  );
}

/** One chart; memoised, so a chart whose rows and markers did not change is not drawn again. */
const QuantityChart = memo(function QuantityChart({
  quantity,
  rows,
  totalS,
  joints,
  selectedJoints,
  cautionRatio,
  unit,
  markers,
}: {
  quantity: Quantity;
  rows: Record<string, number>[];
  totalS: number;
  joints: readonly Joint[];
  selectedJoints: readonly number[];
  cautionRatio: number;
  unit: AngleUnit;
  markers: readonly PlotMarker[];
}) {
  const units = [...new Set(selectedJoints.map((j) => unitLabel(joints[j].type, unit, quantity)))].join(", ");
  const label = `${quantityTitle(
    quantity,
    selectedJoints.map((j) => joints[j].type),
  )} (${units})`;
  return (
    <figure className="relative" aria-label={`${label} against time`}>
      <figcaption className="absolute top-0 left-14 z-10 text-[10px] font-medium text-ink-soft">{label}</figcaption>
      <div className="w-full" style={{ height: PLOT_HEIGHT_PX }} data-testid="plot-box">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={rows} margin={{ top: 12, right: RIGHT_MARGIN, bottom: 0, left: 0 }}>
            <CartesianGrid stroke="#e7e4da" strokeDasharray="2 3" vertical={false} />
            <XAxis
              dataKey="t"
              type="number"
              domain={[0, totalS || 1]}
              tick={{ fontSize: 10, fill: "#6b7280" }}
              tickCount={8}
              tickFormatter={(v: number) => `${Number(v.toFixed(2))}`}
              height={16}
              allowDataOverflow
            />
            <YAxis
              width={Y_AXIS_WIDTH}
              tick={{ fontSize: 10, fill: "#6b7280" }}
              tickCount={4}
              tickFormatter={(v: number) => `${Math.abs(v) >= 100 ? v.toFixed(0) : Number(v.toFixed(1))}`}
            />
            {selectedJoints.map((j) => {
              const lim = limitsOf(joints[j], quantity);
              if (!lim) return null;
              const f = quantity === "effort" ? 1 : displayFactor(joints[j].type, unit);
              const lines = [
                { y: lim.hi * f, dash: undefined, color: verdictLook.fault.stroke, key: "hi" },
                { y: lim.lo * f, dash: undefined, color: verdictLook.fault.stroke, key: "lo" },
              ];
              if (quantity !== "position") {
                lines.push({
                  y: lim.hi * f * cautionRatio,
                  dash: "4 3",
                  color: verdictLook.caution.stroke,
                  key: "chi",
                } as never);
                lines.push({
                  y: lim.lo * f * cautionRatio,
                  dash: "4 3",
                  color: verdictLook.caution.stroke,
                  key: "clo",
                } as never);
              }
              return lines.map((l) => (
                <ReferenceLine
                  key={`${j}-${l.key}`}
                  y={l.y}
                  stroke={l.color}
                  strokeDasharray={l.dash}
                  strokeWidth={LIMIT_LINE_WIDTH}
                  strokeOpacity={LIMIT_LINE_OPACITY}
                  ifOverflow="extendDomain"
                />
              ));
            })}
            {markers
              .filter((m) => m.joint === null || selectedJoints.includes(m.joint))
              .map((m, i) => (
                <ReferenceLine
                  key={`m${i}`}
                  x={m.timeS}
                  stroke={verdictLook[m.severity].stroke}
                  strokeOpacity={0.5}
                  strokeWidth={6}
                />
              ))}
            {selectedJoints.map((j) => (
              <Line
                key={j}
                dataKey={`j${j}`}
                stroke={jointColor(j)}
                strokeWidth={TRACE_WIDTH}
                dot={false}
                isAnimationActive={false}
                type="linear"
                name={joints[j].name}
              />
            ))}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <PlotCursor totalS={totalS} />
    </figure>
  );
});

/** The playhead over a chart's plot area; pointer down/drag on it moves the playhead. */
function PlotCursor({ totalS }: { totalS: number }) {
  const p = usePlayheadStore();
  const { timeS } = usePlayhead();
  const area = useRef<HTMLDivElement>(null);
  const frac = totalS > 0 ? Math.min(1, Math.max(0, timeS / totalS)) : 0;
  const seekFrom = (e: PointerEvent<HTMLDivElement>) => {
    const box = area.current?.getBoundingClientRect();
    if (!box || box.width <= 0) return;
    p.seek(((e.clientX - box.left) / box.width) * totalS);
  };
  return (
    <div
      ref={area}
      aria-hidden="true"
      className="absolute top-3 bottom-4 cursor-crosshair"
      style={{ left: Y_AXIS_WIDTH, right: RIGHT_MARGIN }}
      onPointerDown={(e) => {
        e.currentTarget.setPointerCapture(e.pointerId);
        seekFrom(e);
      }}
      onPointerMove={(e) => {
        if (e.buttons & 1) seekFrom(e);
      }}
    >
      <div
        className="pointer-events-none absolute top-0 bottom-0 w-px bg-copper-500"
        style={{ left: `${frac * 100}%` }}
      />
    </div>
  );
}
