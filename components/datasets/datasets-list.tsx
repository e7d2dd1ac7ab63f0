"use client";
/** A project's datasets: the upload (with progress, whole or refused) and the list, each row opening its dataset page. */
import { ProgressBar } from "@/components/ui/progress-bar";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { EmptyState, ErrorNote, Panel } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { ApiError } from "@/lib/client/api-client";
import { uploadDataset } from "./dataset-api";

export interface DatasetListItem {
  id: string;
  name: string;
  fileKind: string;
  sizeBytes: number;
  status: string;
  episodeCount: number;
  createdAt: string;
}

/** Bytes as people read them: 1.5 MB, 2 GB. */
export function formatBytes(bytes: number): string {
  if (bytes >= 1e9) return `${(bytes / 1e9).toFixed(bytes >= 1e10 ? 0 : 1)} GB`;
  if (bytes >= 1e6) return `${(bytes / 1e6).toFixed(1)} MB`;
  if (bytes >= 1e3) return `${(bytes / 1e3).toFixed(1)} kB`;
  return `${bytes} B`;
}

export function DatasetsList({
  projectId,
  projectName,
  canEdit,
  limitBytes,
  datasets,
}: {
  projectId: string;
  projectName: string;
  canEdit: boolean;
  limitBytes: number;
  datasets: DatasetListItem[];
}) {
  const router = useRouter();
  const [file, setFile] = useState<File | null>(null);
  const [name, setName] = useState("");
  const [progress, setProgress] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);

  const upload = async () => {
    if (!file) return;
    if (file.size > limitBytes) {
      setError(`The file is ${formatBytes(file.size)}; the limit is ${formatBytes(limitBytes)}. Nothing was uploaded.`);
      return;
    }
    setError(null);
    setProgress(0);
    try {
      const dataset = await uploadDataset(
        projectId,
        file,
        name.trim() || file.name.replace(/\.(parquet|zip|csv)$/i, ""),
        setProgress,
      );
      router.push(`/projects/${projectId}/datasets/${dataset.id}`);
    } catch (err) {
      setProgress(null);
      setError(err instanceof ApiError ? err.message : "The upload failed; nothing was stored.");
    }
  };

  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-4 p-4">
      <header className="flex flex-wrap items-baseline gap-3">
        <h1 className="text-lg font-semibold">Datasets</h1>
        <Link href={`/projects/${projectId}`} className="text-sm text-brand-600 hover:underline">
          {projectName}
        </Link>
      </header>
      <p className="max-w-3xl text-sm text-ink-soft">
        A dataset is many recorded episodes uploaded together: one Parquet file, a zip of Parquet or CSV files, or one
        CSV. Each episode is audited as a timed replay (every frame reached in the time between frames) against the arm
        you choose, in the background.
      </p>
      {canEdit ? (
        <Panel className="flex flex-col gap-3 p-4" aria-label="Upload a dataset">
          <h2 className="text-sm font-semibold">Upload</h2>
          <div className="flex flex-wrap items-end gap-3">
            <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
              File (.parquet, .zip or .csv), up to {formatBytes(limitBytes)}
              <input
                type="file"
                accept=".parquet,.zip,.csv"
                aria-label="Dataset file"
                className="text-sm text-ink"
                onChange={(e) => setFile(e.target.files?.[0] ?? null)}
              />
            </label>
            <TextField
              label="Name"
              value={name}
              onChange={(e) => setName(e.target.value)}
              placeholder={file?.name ?? "Week 1 demonstrations"}
              maxLength={120}
            />
            <Button variant="primary" disabled={!file || progress !== null} onClick={() => void upload()}>
              Upload
            </Button>
          </div>
          {progress !== null ? (
            <div>
              <ProgressBar label="Uploading" value={progress} />
              <p className="tabular mt-1 text-[11px] text-ink-faint">
                {progress < 1 ? `Uploading… ${Math.round(progress * 100)}%` : "Stored; opening…"}
              </p>
            </div>
          ) : null}
          {error ? <ErrorNote title="The upload was refused">{error}</ErrorNote> : null}
        </Panel>
      ) : null}
      {datasets.length === 0 ? (
        <EmptyState title="No datasets yet">
          {canEdit ? "Upload a Parquet file, a zip or a CSV above." : "An editor of this project can upload one."}
        </EmptyState>
      ) : (
        <Table aria-label="Datasets">
          <thead>
            <tr>
              <Th>Name</Th>
              <Th>File</Th>
              <Th numeric>Size</Th>
              <Th numeric>Episodes</Th>
              <Th>Status</Th>
            </tr>
          </thead>
          <tbody>
            {datasets.map((d) => (
              <tr key={d.id} className="hover:bg-paper">
                <Td>
                  <Link href={`/projects/${projectId}/datasets/${d.id}`} className="text-brand-600 hover:underline">
                    {d.name}
                  </Link>
                </Td>
                <Td>{d.fileKind}</Td>
                <Td numeric>{formatBytes(d.sizeBytes)}</Td>
                <Td numeric>{d.episodeCount || "—"}</Td>
                <Td>{d.status === "uploaded" ? "not audited" : d.status}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </div>
  );
}
