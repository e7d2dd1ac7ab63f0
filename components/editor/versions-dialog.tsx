"use client";
import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { ErrorNote } from "@/components/ui/panel";
import { LoadingBlock } from "@/components/ui/skeleton";
import { Table, Td, Th } from "@/components/ui/table";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { api } from "@/lib/client/api-client";
import type { Change } from "@/lib/shared/plan-diff";
import { queryKeys } from "@/lib/client/query-keys";

/** "moves[2].duration" → "move 2 duration"; values shortened for reading. */
function describeChange(c: Change): string {
  const where = c.path
    .replace(/^moves\[(\d+)\]\.?/, "move $1 ")
    .replace(/^start\[(\d+)\]/, "start pose joint $1")
    .replace(/\.goal\[(\d+)\]|goal\[(\d+)\]/, "goal joint $1$2")
    .trim();
  const fmt = (v: unknown) =>
    typeof v === "number" ? String(Number(v.toPrecision(5))) : JSON.stringify(v)?.slice(0, 40);
  if (c.change === "added") return `${where}: added ${fmt(c.to)}`;
  if (c.change === "removed") return `${where}: removed (was ${fmt(c.from)})`;
  return `${where}: ${fmt(c.from)} → ${fmt(c.to)}`;
}

/** The plan's versions with verdict and author; pick two to compare, or load one into the bench. */
export function VersionsDialog({
  planId,
  onClose,
  onLoad,
}: {
  planId: string;
  onClose: () => void;
  onLoad: (n: number) => void;
}) {
  const versions = useQuery({ queryKey: queryKeys.versions(planId), queryFn: () => api.listVersions(planId) });
  const [picked, setPicked] = useState<number[]>([]);
  const [a, b] = [...picked].sort((x, y) => x - y);
  const diff = useQuery({
    queryKey: queryKeys.diff(planId, a ?? 0, b ?? 0),
    queryFn: () => api.diff(planId, a, b),
    enabled: picked.length === 2,
  });
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
          <Table aria-label="Saved versions">
            <thead>
              <tr>
                <Th className="w-8">
                  <span className="sr-only">Compare</span>
                </Th>
                <Th numeric>Version</Th>
                <Th>Verdict</Th>
                <Th>Author</Th>
                <Th>Note</Th>
                <Th>Saved</Th>
                <Th>
                  <span className="sr-only">Actions</span>
                </Th>
              </tr>
            </thead>
            <tbody>
              {versions.data.map((v) => (
                <tr key={v.id}>
                  <Td>
                    <input
                      type="checkbox"
                      aria-label={`Compare version ${v.number}`}
                      className="accent-brand-600"
                      checked={picked.includes(v.number)}
                      onChange={(e) =>
                        setPicked((p) =>
                          e.target.checked ? [...p, v.number].slice(-2) : p.filter((x) => x !== v.number),
                        )
                      }
                    />
                  </Td>
                  <Td numeric>{v.number}</Td>
                  <Td>
                    <VerdictChip verdict={v.verdict} size="sm" />
                  </Td>
                  <Td className="text-xs">{v.authorName}</Td>
                  <Td className="max-w-56 truncate text-xs text-ink-soft" title={v.note ?? ""}>
                    {v.note ?? "—"}
                  </Td>
                  <Td className="tabular text-xs text-ink-soft">
                    {new Date(v.createdAt).toISOString().slice(0, 16).replace("T", " ")} UTC
                  </Td>
                  <Td>
                    <Button size="sm" variant="ghost" onClick={() => onLoad(v.number)}>
                      Load
                    </Button>
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
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
                    <li key={i}>{describeChange(c)}</li>
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
