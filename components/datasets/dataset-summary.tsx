"use client";
/** A dataset's audit summary: episodes by verdict, findings by kind, and findings per episode as a chart. */
import { Bar, BarChart, CartesianGrid, Cell, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { VerdictChip, verdictLook } from "@/components/ui/verdict-chip";
import type { DatasetSummaryDto, EpisodeRowDto } from "./dataset-api";

const kindWords: Record<string, string> = {
  range: "outside travel",
  "speed-over": "speed-over",
  glitch: "glitch",
  gap: "gap",
};

export function DatasetSummary({
  summary,
  episodes,
  onOpen,
}: {
  summary: DatasetSummaryDto["summary"];
  episodes: EpisodeRowDto[];
  onOpen: (index: number) => void;
}) {
  const data = episodes.map((e) => ({ index: e.index, n: e.index + 1, findings: e.findingCount, verdict: e.verdict }));
  return (
    <section aria-label="Audit summary" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-2" data-testid="verdict-counts">
        <span className="tabular text-sm">{summary.episodes.toLocaleString("en")} episodes:</span>
        <VerdictChip verdict="pass" detail={String(summary.pass)} />
        <VerdictChip verdict="caution" detail={String(summary.caution)} />
        <VerdictChip verdict="fault" detail={String(summary.fault)} />
        <span
          data-verdict="invalid"
          className="inline-flex items-center gap-1 rounded-full border border-line px-2 py-0.5 text-xs font-medium text-ink-soft"
        >
          <span aria-hidden>⊘</span> Not checked · {summary.invalid}
        </span>
        {summary.repaired > 0 ? <span className="text-xs text-ink-soft">{summary.repaired} repaired</span> : null}
      </div>
      <p className="text-xs text-ink-soft" data-testid="kind-counts">
        Findings by kind:{" "}
        {Object.keys(summary.byKind).length === 0
          ? "none"
          : Object.entries(summary.byKind)
              .map(([k, c]) => `${kindWords[k] ?? k} ${c}`)
              .join(" · ")}
      </p>
      {data.length > 0 ? (
        <div className="h-40" aria-label="Findings per episode" role="img">
          <ResponsiveContainer>
            <BarChart
              data={data}
              margin={{ top: 4, right: 8, bottom: 4, left: 0 }}
              onClick={(s) => {
                const i = (s as { activePayload?: { payload: { index: number } }[] } | null)?.activePayload?.[0]
                  ?.payload.index;
                if (i !== undefined) onOpen(i);
              }}
            >
              <CartesianGrid strokeDasharray="3 3" vertical={false} />
              <XAxis
                dataKey="n"
                tick={{ fontSize: 10 }}
                interval="preserveStartEnd"
                label={{ value: "episode", position: "insideBottomRight", fontSize: 10 }}
              />
              <YAxis allowDecimals={false} tick={{ fontSize: 10 }} width={28} />
              <Tooltip formatter={(v) => [String(v), "findings"]} labelFormatter={(n) => `Episode ${n}`} />
              <Bar dataKey="findings" isAnimationActive={false}>
                {data.map((d) => (
                  <Cell
                    key={d.index}
                    fill={
                      d.verdict === "invalid"
                        ? "#8b8f98"
                        : d.verdict === "pass"
                          ? verdictLook.pass.stroke
                          : verdictLook[d.verdict].stroke
                    }
                  />
                ))}
              </Bar>
            </BarChart>
          </ResponsiveContainer>
        </div>
      ) : null}
    </section>
  );
}
