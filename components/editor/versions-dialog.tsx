"use client";
import { useQuery } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { Dialog } from "@/components/ui/dialog";
import { TextField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { LoadingBlock } from "@/components/ui/skeleton";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { moveLabel } from "@/kinematics";
import { api, type VersionDto } from "@/lib/client/api-client";
import type { Change } from "@/lib/shared/plan-diff";
import { queryKeys } from "@/lib/client/query-keys";

/**
 * `moves[2].duration` → "Move 3 duration": people count moves from 1, and a joint is named by its
 * name when the caller knows the arm's joints ("goal shoulder"), else counted from 1 too.
 */
export function describeChange(c: Change, jointNames: readonly string[] = []): string {
  const joint = (i: string) => jointNames[Number(i)] ?? `joint ${Number(i) + 1}`;
  const where = c.path
    .replace(/^moves\[(\d+)\]\.?/, (_, i: string) => `${moveLabel(Number(i))} `)
    .replace(/^start\[(\d+)\]/, (_, i: string) => `start pose ${joint(i)}`)
    .replace(/\.?goal\[(\d+)\]/, (_, i: string) => `goal ${joint(i)}`)
    .trim();
  const fmt = (v: unknown) =>
    typeof v === "number" ? String(Number(v.toPrecision(5))) : JSON.stringify(v)?.slice(0, 40);
  if (c.change === "added") return `${where}: added ${fmt(c.to)}`;
  if (c.change === "removed") return `${where}: removed (was ${fmt(c.from)})`;
  return `${where}: ${fmt(c.from)} → ${fmt(c.to)}`;
}

const col = columnsFor<VersionDto>();

/** The plan's versions with verdict and author; pick two to compare, or load one into the bench. */
export function VersionsDialog({
  planId,
  onClose,
  onLoad,
  jointNames,
}: {
  planId: string;
  onClose: () => void;
  onLoad: (n: number) => void;
  /** The arm's joint names, so a change reads "goal shoulder" rather than a number. */
  jointNames?: readonly string[];
}) {
  const versions = useQuery({ queryKey: queryKeys.versions(planId), queryFn: () => api.listVersions(planId) });
  const [picked, setPicked] = useState<number[]>([]);
  const [a, b] = [...picked].sort((x, y) => x - y);
  const diff = useQuery({
    queryKey: queryKeys.diff(planId, a ?? 0, b ?? 0),
    queryFn: () => api.diff(planId, a, b),
    enabled: picked.length === 2,
  });
  const [filter, setFilter] = useState("");
  const columns = useMemo(
    () =>
      col.columns([
        col.display({
          id: "compare",
          header: () => <span className="sr-only">Compare</span>,
          meta: { headerClassName: "w-8" },
          cell: (c) => {
            const n = c.row.original.number;
            return (
              <input
                type="checkbox"
                aria-label={`Compare version ${n}`}
                className="accent-brand-600"
                checked={picked.includes(n)}
                onChange={(e) => setPicked((p) => (e.target.checked ? [...p, n].slice(-2) : p.filter((x) => x !== n)))}
              />
            );
          },
        }),
        col.accessor("number", { header: "Version", sortFn: "basic", meta: { numeric: true } }),
        col.accessor("verdict", {
          header: "Verdict",
          sortFn: "text",
          cell: (c) => <VerdictChip verdict={c.getValue()} size="sm" />,
        }),
        col.accessor("authorName", { header: "Author", sortFn: "text", meta: { cellClassName: "text-xs" } }),
        col.accessor((v) => v.note ?? "", {
          id: "note",
          header: "Note",
          enableSorting: false,
          meta: { cellClassName: "max-w-56 truncate text-xs text-ink-soft" },
          cell: (c) => <span title={c.getValue()}>{c.getValue() || "—"}</span>,
        }),
        col.accessor("createdAt", {
          header: "Saved",
          sortFn: "basic",
          enableGlobalFilter: false,
          meta: { cellClassName: "tabular text-xs text-ink-soft whitespace-nowrap" },
          cell: (c) => <DateTime value={c.getValue()} />,
        }),
        col.display({
          id: "actions",
          header: () => <span className="sr-only">Actions</span>,
          cell: (c) => (
            <Button size="sm" variant="ghost" onClick={() => onLoad(c.row.original.number)}>
              Load
            </Button>
          ),
        }),
      ]),
    [picked, onLoad],
  );
  return (
    <Dialog
      open
      title="Versions"
      onClose={onClose}
      className="max-w-3xl"
      actions={<Button onClick={onClose}>Close</Button>}
    >
      {versions.isPending ? <LoadingBlock label="Loading versions" lines={4} /> : null}
      {versions.error ? <ErrorNote title="Versions could not be loaded">{versions.error.message}</ErrorNote> : null}
      {versions.data ? (
        <>
          <p className="mb-2 text-xs text-ink-soft">Tick two versions to compare them.</p>
          <div className="mb-2 flex flex-wrap items-end gap-3">
            <TextField
              label="Filter versions"
              type="search"
              placeholder="Author, note or verdict"
              fieldClassName="w-64"
              value={filter}
              onChange={(e) => setFilter(e.target.value)}
            />
          </div>
          <DataTable
            label="Saved versions"
            data={versions.data}
            columns={columns}
            getRowId={(v) => v.id}
            filter={filter}
            initialSorting={[{ id: "number", desc: true }]}
            maxHeightPx={420}
            testId="versions-table"
          />
        </>
      ) : null}
      {picked.length === 2 ? (
        <section aria-label="Comparison" className="mt-4 rounded-md border border-line p-3">
          {diff.isPending ? <LoadingBlock label="Comparing" lines={2} /> : null}
          {diff.error ? <ErrorNote title="The comparison failed">{diff.error.message}</ErrorNote> : null}
          {diff.data ? (
            <>
              <p className="flex flex-wrap items-center gap-2 text-sm">
                Version {diff.data.from.number} <VerdictChip verdict={diff.data.from.verdict} size="sm" /> → version{" "}
                {diff.data.to.number} <VerdictChip verdict={diff.data.to.verdict} size="sm" />
                <span className="text-xs text-ink-soft">
                  {diff.data.from.verdict === diff.data.to.verdict ? "verdict unchanged" : "verdict changed"}
                  {diff.data.from.armRevision !== diff.data.to.armRevision
                    ? ` · arm revision ${diff.data.from.armRevision} → ${diff.data.to.armRevision}`
                    : ""}
                </span>
              </p>
              {diff.data.changes.length === 0 ? (
                <p className="mt-2 text-xs text-ink-soft">The two documents are identical.</p>
              ) : (
                <ul className="tabular mt-2 max-h-48 overflow-auto font-mono text-xs">
                  {diff.data.changes.map((c, i) => (
                    <li key={i}>{describeChange(c, jointNames)}</li>
                  ))}
                </ul>
              )}
            </>
          ) : null}
        </section>
      ) : null}
    </Dialog>
  );
}
