"use client";
/**
 * The dataset page: the arm and column mapping (with a preview), the audit's live progress, the
 * summary and chart, the episode table and the open episode; repair all and export.
 */
import { ProgressBar } from "@/components/ui/progress-bar";
import Link from "next/link";
import { QueryClient, QueryClientProvider, useQuery, useQueryClient } from "@tanstack/react-query";
import { useCallback, useState } from "react";
import { Button } from "@/components/ui/button";
import { ErrorNote, Panel } from "@/components/ui/panel";
import type { Arm } from "@/kinematics";
import { queryKeys } from "@/lib/client/query-keys";
import type { ColumnMappingInput } from "@/lib/shared/schemas/datasets";
import { datasetApi } from "./dataset-api";
import { formatBytes } from "./datasets-list";
import { DatasetSummary } from "./dataset-summary";
import { EpisodeTable } from "./episode-table";
import { EpisodeView } from "./episode-view";
import { MappingPanel } from "./mapping-panel";

export interface DatasetArm {
  id: string;
  name: string;
  revision: number;
  revisionId: string;
  arm: Arm;
}

export interface DatasetPageData {
  id: string;
  name: string;
  fileKind: string;
  sizeBytes: number;
  status: string;
  armRevisionId: string | null;
  mapping: Record<string, unknown>;
}

interface Props {
  projectId: string;
  dataset: DatasetPageData;
  arms: DatasetArm[];
  canEdit: boolean;
  caution: string;
}

export function DatasetWorkbench(props: Props) {
  const [client] = useState(
    () => new QueryClient({ defaultOptions: { queries: { staleTime: 5_000, refetchOnWindowFocus: false } } }),
  );
  return (
    <QueryClientProvider client={client}>
      <Workbench {...props} />
    </QueryClientProvider>
  );
}

function Workbench({ projectId, dataset, arms, canEdit, caution }: Props) {
  const queryClient = useQueryClient();
  const [open, setOpen] = useState<number | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [repairingAll, setRepairingAll] = useState(false);
  const summary = useQuery({
    queryKey: queryKeys.dataset(dataset.id),
    queryFn: () => datasetApi.get(dataset.id),
    refetchInterval: (q) => (q.state.data?.dataset.status === "auditing" ? 1000 : false),
  });
  const status = summary.data?.dataset.status ?? dataset.status;
  const audited = status === "audited";
  const episodes = useQuery({
    queryKey: queryKeys.datasetEpisodes(dataset.id),
    queryFn: () => datasetApi.episodes(dataset.id),
    enabled: audited,
  });
  const initialArm = arms.find((a) => a.revisionId === dataset.armRevisionId)?.id ?? arms[0]?.id ?? "";
  const refresh = useCallback(async () => {
    await queryClient.invalidateQueries({ queryKey: queryKeys.dataset(dataset.id) });
    await queryClient.invalidateQueries({ queryKey: queryKeys.datasetEpisodes(dataset.id) });
  }, [queryClient, dataset.id]);

  const startAudit = async (armId: string, mapping: ColumnMappingInput) => {
    await datasetApi.saveMapping(dataset.id, { armId, mapping });
    await datasetApi.audit(dataset.id);
    setOpen(null);
    setMessage(null);
    await refresh();
  };

  const repairAll = async () => {
    setRepairingAll(true);
    try {
      const results = await datasetApi.repair(dataset.id);
      const passed = results.filter((r) => r.after === "pass").length;
      const skipped = results.filter((r) => r.after === null).length;
      setMessage(
        `Repaired ${results.length - skipped} episodes: ${passed} pass after repair${skipped ? `; ${skipped} not checked, not repaired` : ""}.`,
      );
      await refresh();
      if (open !== null) await queryClient.invalidateQueries({ queryKey: queryKeys.datasetEpisode(dataset.id, open) });
    } catch (err) {
      setMessage(err instanceof Error ? err.message : "The repair failed.");
    } finally {
      setRepairingAll(false);
    }
  };

  const progress = summary.data?.progress;
  return (
    <div className="mx-auto flex max-w-7xl flex-col gap-4 p-4">
      <header className="flex flex-wrap items-baseline gap-3">
        <h1 className="text-lg font-semibold">{dataset.name}</h1>
        <span className="text-xs text-ink-soft">
          {dataset.fileKind} · {formatBytes(dataset.sizeBytes)}
        </span>
        <Link href={`/projects/${projectId}/datasets`} className="text-sm text-brand-600 hover:underline">
          All datasets
        </Link>
        <span className="flex-1" />
        {audited && canEdit ? (
          <Button onClick={() => void repairAll()} disabled={repairingAll}>
            {repairingAll ? "Repairing…" : "Repair all episodes with findings"}
          </Button>
        ) : null}
        {audited ? (
          <a
            href={datasetApi.exportUrl(dataset.id)}
            className="rounded-md border border-line px-3 py-1.5 text-sm hover:bg-paper"
            data-testid="export-link"
            download
          >
            Export checked dataset (zip)
          </a>
        ) : null}
      </header>
      {audited ? (
        <p className="text-[11px] text-ink-faint" data-testid="export-caution">
          {caution}
        </p>
      ) : null}
      {message ? (
        <p className="text-sm" role="status" data-testid="repair-message">
          {message}
        </p>
      ) : null}
      <Panel className="p-4">
        <h2 className="mb-2 text-sm font-semibold">Arm and columns</h2>
        {arms.length === 0 ? (
          <ErrorNote title="No arm">
            Add an arm to this project first; the audit checks every episode against its limits.
          </ErrorNote>
        ) : (
          <MappingPanel
            datasetId={dataset.id}
            arms={arms}
            initialArmId={initialArm}
            initialMapping={dataset.mapping as ColumnMappingInput}
            canEdit={canEdit}
            busy={status === "auditing"}
            onAudit={startAudit}
          />
        )}
      </Panel>
      {status === "auditing" && progress ? (
        <Panel className="p-4" aria-label="Audit progress">
          <ProgressBar label="Audit progress" value={progress.batchesDone} max={progress.batches} />
          <p className="tabular mt-1 text-xs text-ink-soft" data-testid="audit-progress">
            Auditing in the background: {progress.episodesAudited} of {progress.episodes} episodes (
            {progress.batchesDone} of {progress.batches} batches).
          </p>
        </Panel>
      ) : null}
      {status === "uploaded" ? (
        <p className="text-sm text-ink-soft">Not audited yet: choose the arm and columns, preview, then audit.</p>
      ) : null}
      {audited && summary.data ? (
        <Panel className="p-4">
          <DatasetSummary summary={summary.data.summary} episodes={episodes.data ?? []} onOpen={setOpen} />
        </Panel>
      ) : null}
      {audited && episodes.data ? (
        <div className="grid gap-4 xl:grid-cols-2">
          <Panel className="p-4">
            <EpisodeTable episodes={episodes.data} selected={open} onOpen={setOpen} />
          </Panel>
          <Panel className="p-4">
            {open === null ? (
              <p className="text-sm text-ink-soft">
                Open an episode from the table or the chart to see its findings, plots and replay.
              </p>
            ) : (
              <EpisodeView
                key={open}
                datasetId={dataset.id}
                index={open}
                canEdit={canEdit}
                unit="deg"
                onRepaired={() => void refresh()}
                caution={caution}
              />
            )}
          </Panel>
        </div>
      ) : null}
    </div>
  );
}
