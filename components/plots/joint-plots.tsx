"use client";
import { memo, useMemo, useRef, type PointerEvent } from "react";
import { CartesianGrid, LineChart, ResponsiveContainer, XAxis, YAxis } from "recharts";
import { cn } from "@/components/ui/cn";
import { verdictLook } from "@/components/ui/verdict-chip";
import type { Joint, Samples } from "@/kinematics";
import { hintFor } from "@/lib/shared/glossary";
import { displayFactor, unitLabel, type AngleUnit, type Quantity } from "@/lib/shared/units";
import { usePlayhead, usePlayheadStore } from "@/components/editor/playhead";
import { minMaxIndices } from "./downsample";
import type { EffortPending, EffortSeries } from "./effort";
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
  /**
   * Joint effort along the samples (arms with a chain); adds an effort chart. With `values: null` the
   * series is being computed (it comes from a worker): the chart shows its frame and says so.
   */
  effort?: EffortSeries | EffortPending | null;
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

// the charts' margins and axis sizes: the overlay and the playhead cursor lie over the plot area they leave
const Y_AXIS_WIDTH = 52;
const X_AXIS_HEIGHT = 16;
const TOP_MARGIN = 12;
/** About this many value ticks per chart. */
const Y_TICKS = 5;
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

  // the effort series once computed (null while pending, or for an arm without a chain)
  const series: EffortSeries | null = effort && effort.values !== null ? effort : null;

  const data = useMemo(() => {
    const cols = selectedJoints.filter((j) => j < n);
    const byQuantity: Partial<Record<Quantity, ChartData>> = {};
    for (const q of quantities) {
      const isEffort = q === "effort";
      if (isEffort && !effort) continue;
      // a pending effort series: no traces yet, the axis from the limits alone
      const pending = isEffort && !series;
      const arr = isEffort
        ? (series?.values ?? new Float64Array(0))
        : q === "position"
          ? samples.position
          : q === "velocity"
            ? samples.velocity
            : samples.acceleration;
      const stride = isEffort ? effort!.stride : n;
      const qCols = isEffort ? cols.filter((j) => j < stride) : cols;
      // the effort series has samples of its own (at most the motion's rate, effort.ts)
      const count = isEffort ? (series?.count ?? 0) : samples.count;
      const timeS = isEffort && series ? series.timeS : samples.timeS;
      const idx = pending ? new Uint32Array(0) : minMaxIndices(count, arr, stride, qCols, buckets);
      let lo = 0;
      let hi = 0;
      const traces = qCols.map((j) => {
        const f = isEffort ? 1 : displayFactor(joints[j].type, unit);
        const points = new Float64Array(2 * idx.length);
        for (let r = 0; r < idx.length; r++) {
          const k = idx[r];
          const v = arr[k * stride + j] * f;
          points[2 * r] = timeS[k];
          points[2 * r + 1] = v;
          if (v < lo) lo = v;
          if (v > hi) hi = v;
        }
        const lim = limitsOf(joints[j], q);
        if (lim) {
          lo = Math.min(lo, lim.lo * f);
          hi = Math.max(hi, lim.hi * f);
        }
        return { joint: j, points };
      });
      byQuantity[q] = { traces, pending, ...niceAxis(lo, hi, Y_TICKS) };
    }
    return byQuantity;
  }, [samples, n, selectedJoints, quantities, buckets, joints, unit, effort, series]);

  // the effort chart says its rate when it is sampled more coarsely than the motion charts
  const effortRateNote = series && series.rateHz < samples.rateHz - 1e-9 ? series.rateHz : undefined;

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
        quantities.map((q) =>
          !data[q] ? null : (
            <QuantityChart
              key={q}
              quantity={q}
              data={data[q]!}
              totalS={totalS}
              joints={joints}
              selectedJoints={q === "effort" ? chartJoints.effort : chartJoints.motion}
              sampledHz={q === "effort" ? effortRateNote : undefined}
              cautionRatio={cautionRatio}
              unit={unit}
              markers={markers}
            />
          ),
        )
      )}
    </div>
  );
}

/** One chart's traces (downsampled, in display units) and its value axis. */
interface ChartData {
  /** Per plotted joint: time and value pairs, interleaved. */
  traces: { joint: number; points: Float64Array }[];
  /** The series is still being computed: the frame is drawn, the traces are not. */
  pending: boolean;
  domain: [number, number];
  ticks: number[];
}

/**
 * A value axis that holds every trace and limit line (and zero): the span rounded out to a step of 1,
 * 2 or 5 times a power of ten, and the ticks at that step.
 */
export function niceAxis(lo: number, hi: number, tickCount: number): { domain: [number, number]; ticks: number[] } {
  if (!(hi > lo)) {
    const pad = Math.abs(hi) > 0 ? Math.abs(hi) * 0.1 : 1;
    return niceAxis(lo - pad, hi + pad, tickCount);
  }
  const raw = (hi - lo) / Math.max(1, tickCount - 1);
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? 10 * power;
  const first = Math.floor(lo / step);
  const last = Math.ceil(hi / step);
  // rounded to the step's decimals, so that 0.1 × 3 does not print as 0.30000000000000004
  const decimals = Math.min(100, Math.max(0, 1 - Math.floor(Math.log10(step))));
  const tick = (k: number) => Number((k * step).toFixed(decimals));
  const ticks: number[] = [];
  for (let k = first; k <= last; k++) ticks.push(tick(k));
  // that rounding may move an end tick inside the span by a hair: add a tick rather than cut a trace
  if (ticks[0] > lo) ticks.unshift(tick(first - 1));
  if (ticks[ticks.length - 1] < hi) ticks.push(tick(last + 1));
  return { domain: [ticks[0], ticks[ticks.length - 1]], ticks };
}

/** A limit (solid) or caution (dashed) line across a chart. */
interface Guide {
  y: number;
  caution: boolean;
}

/** The overlay's drawing units across the plot area (it is stretched to the area, strokes are not). */
const SPAN = 1000;

/**
 * What a chart draws over the frame, in an SVG laid exactly over recharts' plot area (the same margins
 * and axis sizes) and mapped by the same domains: the limit and caution lines, a band at each
 * finding, and the traces, one path per joint. Drawn by us rather than as recharts lines and
 * reference lines: recharts then holds no data rows and no items, and an edit redraws a few paths
 * instead of recomputing every chart, which cost tens of milliseconds per edit (bench page profile).
 */
function Overlay({
  guides,
  markers,
  traces,
  totalS,
  domain,
}: {
  guides: readonly Guide[];
  markers: readonly PlotMarker[];
  traces: ChartData["traces"];
  totalS: number;
  domain: readonly [number, number];
}) {
  const [lo, hi] = domain;
  const x = (t: number) => (t / totalS) * SPAN;
  const y = (v: number) => ((hi - v) / (hi - lo)) * SPAN;
  return (
    <div
      aria-hidden="true"
      className="pointer-events-none absolute"
      style={{ left: Y_AXIS_WIDTH, right: RIGHT_MARGIN, top: TOP_MARGIN, bottom: X_AXIS_HEIGHT }}
    >
      <svg
        className="plot-overlay block h-full w-full overflow-visible"
        viewBox={`0 0 ${SPAN} ${SPAN}`}
        preserveAspectRatio="none"
      >
        {guides.map((g, i) => (
          <line
            key={`g${i}`}
            x1={0}
            x2={SPAN}
            y1={y(g.y)}
            y2={y(g.y)}
            stroke={g.caution ? verdictLook.caution.stroke : verdictLook.fault.stroke}
            strokeDasharray={g.caution ? "4 3" : undefined}
            strokeWidth={LIMIT_LINE_WIDTH}
            strokeOpacity={LIMIT_LINE_OPACITY}
            vectorEffect="non-scaling-stroke"
          />
        ))}
        {markers.map((m, i) => (
          <line
            key={`m${i}`}
            x1={x(m.timeS)}
            x2={x(m.timeS)}
            y1={0}
            y2={SPAN}
            stroke={verdictLook[m.severity].stroke}
            strokeOpacity={0.5}
            strokeWidth={6}
            vectorEffect="non-scaling-stroke"
            data-marker={m.severity}
          />
        ))}
        {traces.map(({ joint, points }) => {
          if (points.length < 4) return null; // no trace yet (a pending series) or a single point
          let d = "";
          for (let r = 0; r < points.length; r += 2)
            d += `${r === 0 ? "M" : "L"}${x(points[r]).toFixed(2)},${y(points[r + 1]).toFixed(2)}`;
          return (
            <path
              key={joint}
              d={d}
              fill="none"
              stroke={jointColor(joint)}
              strokeWidth={TRACE_WIDTH}
              strokeLinejoin="round"
              vectorEffect="non-scaling-stroke"
              data-joint={joint}
            />
          );
        })}
      </svg>
    </div>
  );
}

/** One chart; memoised, so a chart whose rows and markers did not change is not drawn again. */
const QuantityChart = memo(function QuantityChart({
  quantity,
  data,
  totalS,
  joints,
  selectedJoints,
  cautionRatio,
  unit,
  markers,
  sampledHz,
}: {
  quantity: Quantity;
  data: ChartData;
  totalS: number;
  joints: readonly Joint[];
  selectedJoints: readonly number[];
  cautionRatio: number;
  unit: AngleUnit;
  markers: readonly PlotMarker[];
  /** The chart's samples per second, when lower than the motion charts' (effort). */
  sampledHz?: number;
}) {
  const units = [...new Set(selectedJoints.map((j) => unitLabel(joints[j].type, unit, quantity)))].join(", ");
  const label = `${quantityTitle(
    quantity,
    selectedJoints.map((j) => joints[j].type),
  )} (${units})${sampledHz ? ` · drawn from ${Math.round(sampledHz)} samples/s; the check uses every control period` : ""}`;
  // the time axis ends at the plan's end: its nice ticks that fall inside
  const timeTicks = niceAxis(0, totalS || 1, 8).ticks.filter((t) => t <= (totalS || 1));
  const guides: Guide[] = [];
  for (const j of selectedJoints) {
    const lim = limitsOf(joints[j], quantity);
    if (!lim) continue;
    const f = quantity === "effort" ? 1 : displayFactor(joints[j].type, unit);
    guides.push({ y: lim.hi * f, caution: false }, { y: lim.lo * f, caution: false });
    if (quantity !== "position")
      guides.push({ y: lim.hi * f * cautionRatio, caution: true }, { y: lim.lo * f * cautionRatio, caution: true });
  }
  const shownMarkers = markers.filter(
    (m) => (m.joint === null || selectedJoints.includes(m.joint)) && m.timeS >= 0 && m.timeS <= totalS,
  );
  return (
    <figure className="relative" aria-label={`${label} against time`}>
      <figcaption className="absolute top-0 left-14 z-10 text-[10px] font-medium text-ink-soft">{label}</figcaption>
      <div className="relative w-full" style={{ height: PLOT_HEIGHT_PX }} data-testid="plot-box">
        <ChartFrame domain={data.domain} ticks={data.ticks} />
        <TimeAxis totalS={totalS || 1} ticks={timeTicks} />
        {data.pending ? (
          <p
            className="absolute inset-0 flex items-center justify-center text-xs text-ink-soft"
            data-pending={quantity}
          >
            <span className="rounded bg-panel/85 px-1.5 py-0.5">Computing the series for this plan…</span>
          </p>
        ) : null}
        <Overlay
          guides={guides}
          markers={shownMarkers}
          traces={data.traces}
          totalS={totalS || 1}
          domain={data.domain}
        />
      </div>
      <PlotCursor totalS={totalS} />
    </figure>
  );
});

const TICK_STYLE = { fontSize: 10, fill: "#6b7280" };
const CHART_MARGIN = { top: TOP_MARGIN, right: RIGHT_MARGIN, bottom: X_AXIS_HEIGHT, left: 0 };
const UNIT_DOMAIN: [number, number] = [0, 1];
const valueLabel = (v: number) => `${Math.abs(v) >= 100 ? v.toFixed(0) : Number(v.toFixed(1))}`;

/**
 * The chart's frame from recharts: grid, time axis and value axis. Memoised on its domains and
 * ticks, so an edit that leaves the axes alone does not draw it again.
 */
const ChartFrame = memo(function ChartFrame({
  domain,
  ticks,
}: {
  domain: readonly [number, number];
  ticks: readonly number[];
}) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart margin={CHART_MARGIN}>
        <CartesianGrid stroke="#e7e4da" strokeDasharray="2 3" vertical={false} />
        {/* the time axis is ours (TimeAxis): a new plan length then leaves this frame alone */}
        <XAxis hide type="number" domain={UNIT_DOMAIN} allowDataOverflow />
        <YAxis
          type="number"
          width={Y_AXIS_WIDTH}
          tick={TICK_STYLE}
          domain={domain as [number, number]}
          ticks={ticks as number[]}
          tickFormatter={valueLabel}
          allowDataOverflow
        />
      </LineChart>
    </ResponsiveContainer>
  );
}, sameAxes);

function sameAxes(
  a: { domain: readonly [number, number]; ticks: readonly number[] },
  b: { domain: readonly [number, number]; ticks: readonly number[] },
): boolean {
  const same = (x: readonly number[], y: readonly number[]) => x.length === y.length && x.every((v, i) => v === y[i]);
  return same(a.domain, b.domain) && same(a.ticks, b.ticks);
}

/** The time axis under the plot area: a line, and a label at each tick (s). */
function TimeAxis({ totalS, ticks }: { totalS: number; ticks: readonly number[] }) {
  return (
    <div
      aria-hidden="true"
      className="absolute bottom-0 border-t border-[#666] text-[10px] text-[#6b7280]"
      style={{ left: Y_AXIS_WIDTH, right: RIGHT_MARGIN, height: X_AXIS_HEIGHT }}
    >
      {ticks.map((t) => (
        <span
          key={t}
          data-testid="time-tick"
          className="tabular absolute top-0 -translate-x-1/2 pt-1 leading-none"
          style={{ left: `${(t / totalS) * 100}%` }}
        >
          <span className="absolute top-0 left-1/2 h-[3px] w-px bg-[#666]" />
          {Number(t.toFixed(2))}
        </span>
      ))}
    </div>
  );
}

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
      className="absolute cursor-crosshair"
      style={{ left: Y_AXIS_WIDTH, right: RIGHT_MARGIN, top: TOP_MARGIN, bottom: X_AXIS_HEIGHT }}
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
