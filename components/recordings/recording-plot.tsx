"use client";
import { useMemo } from "react";
import {
  CartesianGrid,
  Legend,
  Line,
  LineChart,
  ReferenceArea,
  ReferenceLine,
  ResponsiveContainer,
  XAxis,
  YAxis,
} from "recharts";
import { verdictLook } from "@/components/ui/verdict-chip";
import type { Joint, Recording, StreamFinding } from "@/kinematics";
import { displayFactor, unitLabel, type AngleUnit } from "@/lib/shared/units";
import { minMaxIndices } from "@/components/plots/downsample";
import { LIMIT_LINE_OPACITY } from "@/components/plots/plot-style";

/** Floor of the speed chart's log axis, in display units per second. */
const SPEED_FLOOR = 0.01;

export interface RecordingPlotProps {
  original: Recording;
  repaired: Recording | null;
  joint: number;
  jointInfo: Joint;
  findings: readonly StreamFinding[];
  unit: AngleUnit;
}

/**
 * One joint of a recording against time: the original trace, the repaired one (dashed) when there is
 * one, the travel limits, and the stream findings as shaded spans (fault red, caution amber).
 */
export function RecordingPlot({ original, repaired, joint, jointInfo, findings, unit }: RecordingPlotProps) {
  const f = displayFactor(jointInfo.type, unit);
  const data = useMemo(() => {
    const n = original.jointCount;
    const idx = minMaxIndices(original.count, original.position, n, [joint], 600);
    const extra = repaired ? minMaxIndices(repaired.count, repaired.position, n, [joint], 600) : new Uint32Array(0);
    const keys = new Set<number>([...idx, ...extra]);
    const sameGrid = repaired && repaired.count === original.count;
    return [...keys]
      .sort((a, b) => a - b)
      .map((k) => ({
        t: original.timeS[Math.min(k, original.count - 1)],
        original: original.position[Math.min(k, original.count - 1) * n + joint] * f,
        ...(repaired && sameGrid ? { repaired: repaired.position[k * n + joint] * f } : {}),
      }));
  }, [original, repaired, joint, f]);
  const speed = useMemo(() => {
    // finite-difference speed |Δq|/Δt between samples, as the stream check computes it
    const n = original.jointCount;
    const series = (rec: Recording) => {
      const out = new Float64Array(rec.count * n);
      for (let k = 1; k < rec.count; k++) {
        const dt = rec.timeS[k] - rec.timeS[k - 1];
        out[k * n + joint] =
          dt > 0 ? Math.abs(rec.position[k * n + joint] - rec.position[(k - 1) * n + joint]) / dt : 0;
      }
      return out;
    };
    const a = series(original);
    const b = repaired && repaired.count === original.count ? series(repaired) : null;
    const idx = new Set<number>([
      ...minMaxIndices(original.count, a, n, [joint], 600),
      ...(b ? minMaxIndices(original.count, b, n, [joint], 600) : []),
    ]);
    return [...idx]
      .sort((x, y) => x - y)
      .map((k) => ({
        t: original.timeS[k],
        // a log axis cannot show 0: hold still samples at the axis floor
        original: Math.max(SPEED_FLOOR, a[k * n + joint] * f),
        ...(b ? { repaired: Math.max(SPEED_FLOOR, b[k * n + joint] * f) } : {}),
      }));
  }, [original, repaired, joint, f]);
  const mine = findings.filter((x) => x.joint === joint);
  const label = `${jointInfo.name} position (${unitLabel(jointInfo.type, unit)})`;
  const speedLabel = `${jointInfo.name} speed between samples (${unitLabel(jointInfo.type, unit, "velocity")})`;
  return (
    <div className="flex flex-col gap-6">
      <figure aria-label={`${label} against time, original${repaired ? " and repaired" : ""}`} className="h-64 w-full">
        <figcaption className="mb-1 text-xs font-medium text-ink-soft">{label}</figcaption>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 4, right: 12, bottom: 4, left: 0 }}>
            <CartesianGrid stroke="#e7e4da" strokeDasharray="2 3" />
            <XAxis
              dataKey="t"
              type="number"
              domain={["dataMin", "dataMax"]}
              tick={{ fontSize: 10, fill: "#6b7280" }}
              tickFormatter={(v: number) => `${Number(v.toFixed(2))}s`}
            />
            <YAxis
              width={52}
              tick={{ fontSize: 10, fill: "#6b7280" }}
              tickFormatter={(v: number) => `${Number(v.toFixed(1))}`}
              domain={["auto", "auto"]}
            />
            <ReferenceLine
              y={jointInfo.min * f}
              stroke={verdictLook.fault.stroke}
              strokeOpacity={LIMIT_LINE_OPACITY}
              ifOverflow="discard"
            />
            <ReferenceLine
              y={jointInfo.max * f}
              stroke={verdictLook.fault.stroke}
              strokeOpacity={LIMIT_LINE_OPACITY}
              ifOverflow="discard"
            />
            {mine.map((x, i) => (
              <ReferenceArea
                key={i}
                x1={original.timeS[Math.max(0, x.sample - 1)]}
                x2={original.timeS[Math.min(original.count - 1, x.endSample)]}
                fill={verdictLook[x.severity].stroke}
                fillOpacity={0.18}
                stroke={verdictLook[x.severity].stroke}
                strokeOpacity={0.6}
                ifOverflow="extendDomain"
              />
            ))}
            {traceLines(Boolean(repaired), 1.5)}
            <Legend verticalAlign="top" height={18} iconSize={10} wrapperStyle={{ fontSize: 11 }} />
          </LineChart>
        </ResponsiveContainer>
      </figure>
      <figure aria-label={`${speedLabel} against time`} className="h-48 w-full">
        <figcaption className="mb-1 text-xs font-medium text-ink-soft">{speedLabel}</figcaption>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={speed} margin={{ top: 4, right: 12, bottom: 4, left: 0 }}>
            <CartesianGrid stroke="#e7e4da" strokeDasharray="2 3" />
            <XAxis
              dataKey="t"
              type="number"
              domain={["dataMin", "dataMax"]}
              tick={{ fontSize: 10, fill: "#6b7280" }}
              tickFormatter={(v: number) => `${Number(v.toFixed(2))}s`}
            />
            <YAxis
              width={52}
              scale="log"
              domain={[SPEED_FLOOR, "auto"]}
              allowDataOverflow
              tick={{ fontSize: 10, fill: "#6b7280" }}
              tickFormatter={(v: number) => `${Number(v.toPrecision(2))}`}
            />
            <ReferenceLine
              y={jointInfo.maxVelocity * f}
              stroke={verdictLook.fault.stroke}
              strokeOpacity={LIMIT_LINE_OPACITY}
              label={{ value: "limit", position: "insideTopRight", fontSize: 10, fill: verdictLook.fault.stroke }}
            />
            {traceLines(Boolean(repaired), 1.25)}
          </LineChart>
        </ResponsiveContainer>
      </figure>
    </div>
  );
}

/** The recording's original trace and, once repaired, the repaired one dashed over it (called, not rendered: recharts reads its children). */
function traceLines(repaired: boolean, width: number) {
  return [
    <Line
      key="original"
      dataKey="original"
      name="original"
      stroke="#1f6f86"
      strokeWidth={width}
      dot={false}
      isAnimationActive={false}
    />,
    repaired ? (
      <Line
        key="repaired"
        dataKey="repaired"
        name="repaired"
        stroke="#b8612a"
        strokeWidth={width}
        strokeDasharray="5 3"
        dot={false}
        isAnimationActive={false}
      />
    ) : null,
  ];
}
