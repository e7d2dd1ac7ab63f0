"use client";
/** The episodes of an audited dataset in one sortable, filterable table (TanStack Table through the one DataTable). */
import { useMemo, useState } from "react";
import { DataTable, columnsFor } from "@/components/ui/data-table";
import { SelectField, TextField } from "@/components/ui/field";
import { VerdictChip } from "@/components/ui/verdict-chip";
import type { EpisodeRowDto } from "./dataset-api";

const verdictRank = { pass: 0, caution: 1, fault: 2, invalid: 3 } as const;

function VerdictCell({ verdict }: { verdict: EpisodeRowDto["verdict"] }) {
  if (verdict === "invalid")
    return (
      <span data-verdict="invalid" className="text-xs text-ink-soft">
        ⊘ Not checked
      </span>
    );
  return <VerdictChip verdict={verdict} size="sm" />;
}

export function EpisodeTable({
  episodes,
  selected,
  onOpen,
}: {
  episodes: EpisodeRowDto[];
  selected: number | null;
  onOpen: (index: number) => void;
}) {
  const [filter, setFilter] = useState("");
  const [verdict, setVerdict] = useState<"all" | EpisodeRowDto["verdict"]>("all");
  const rows = useMemo(
    () =>
      (verdict === "all" ? episodes : episodes.filter((e) => e.verdict === verdict)).map((e) => ({
        ...e,
        number: e.index + 1,
        rank: verdictRank[e.verdict],
      })),
    [episodes, verdict],
  );
  const columns = useMemo(() => {
    const c = columnsFor<(typeof rows)[number]>();
    return c.columns([
      c.accessor("number", {
        header: "#",
        meta: { numeric: true },
        cell: (info) => (
          <button
            type="button"
            className="text-brand-600 hover:underline"
            onClick={() => onOpen(info.row.original.index)}
            aria-label={`Open episode ${info.getValue()}`}
          >
            {info.getValue()}
          </button>
        ),
      }),
      c.accessor("episode", {
        header: "Episode",
        cell: (info) => <span className="font-mono text-xs">{info.getValue()}</span>,
      }),
      c.accessor("rank", { header: "Verdict", cell: (info) => <VerdictCell verdict={info.row.original.verdict} /> }),
      c.accessor("samples", { header: "Frames", meta: { numeric: true } }),
      c.accessor("durationS", {
        header: "Duration (s)",
        meta: { numeric: true },
        cell: (info) => info.getValue().toFixed(2),
      }),
      c.accessor("findingCount", { header: "Findings", meta: { numeric: true } }),
      c.accessor("worstKind", {
        header: "Worst",
        cell: (info) => <span title={info.row.original.worstMessage ?? undefined}>{info.getValue() ?? "—"}</span>,
      }),
      c.accessor("repairedVerdict", {
        header: "Repaired",
        cell: (info) => (info.getValue() ? <VerdictCell verdict={info.getValue() as EpisodeRowDto["verdict"]} /> : "—"),
      }),
    ]);
  }, [onOpen]);
  return (
    <section aria-label="Episodes" className="flex flex-col gap-2">
      <div className="flex flex-wrap items-end gap-3">
        <SelectField label="Show" value={verdict} onChange={(e) => setVerdict(e.target.value as typeof verdict)}>
          <option value="all">every episode</option>
          <option value="fault">faults</option>
          <option value="caution">cautions</option>
          <option value="pass">passes</option>
          <option value="invalid">not checked</option>
        </SelectField>
        <TextField
          label="Filter"
          placeholder="episode id or kind"
          value={filter}
          onChange={(e) => setFilter(e.target.value)}
        />
        <span className="tabular pb-2 text-xs text-ink-faint">
          {rows.length} shown{selected !== null ? ` · episode ${selected + 1} open` : ""}
        </span>
      </div>
      <DataTable
        data={rows}
        columns={columns}
        label="Episodes"
        getRowId={(r) => String(r.index)}
        filter={filter}
        initialSorting={[{ id: "rank", desc: true }]}
        testId="episode-table"
        maxHeightPx={420}
      />
    </section>
  );
}
