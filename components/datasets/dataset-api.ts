"use client";
/** The dataset API from the browser: typed calls over the one request helper, and the upload with progress. */
import { request, uploadWithProgress, type Jsonified } from "@/lib/client/api-client";
import type { Dataset } from "@/db/schema/datasets";
import type { ColumnMappingInput } from "@/lib/shared/schemas/datasets";
import type { Arm, PassThroughFinding, Plan, ReplayFinding, ReplayVerdict, Report, Verdict } from "@/kinematics";

export type DatasetDto = Jsonified<Dataset>;

export interface DatasetSummaryDto {
  dataset: DatasetDto;
  progress: { batchesDone: number; batches: number; episodesAudited: number; episodes: number };
  summary: {
    episodes: number;
    pass: number;
    caution: number;
    fault: number;
    invalid: number;
    byKind: Record<string, number>;
    repaired: number;
  };
  check: string;
}

export interface EpisodeRowDto {
  index: number;
  episode: string;
  samples: number;
  durationS: number;
  verdict: "pass" | "caution" | "fault" | "invalid";
  findingCount: number;
  faultCount: number;
  worstKind: string | null;
  worstMessage: string | null;
  repairedVerdict: string | null;
}

export interface PreviewDto {
  files: { name: string; rows: number; columns: { name: string; type: string }[] }[];
  fileCount: number;
  episodes: number;
  frames: number;
  firstEpisode: { episode: string; columns: string[]; rows: number[][] } | null;
  problems: string[];
}

export interface EpisodeFrames {
  timeS: number[];
  position: number[];
  jointCount: number;
  count: number;
}

export interface EpisodeDto {
  episode: EpisodeRowDto & { findings: ReplayFinding[]; problems: string[]; repairedFindings: ReplayFinding[] | null };
  arm: Arm;
  recorded: EpisodeFrames;
  repaired: (EpisodeFrames & { filled: number[] }) | null;
  check: string;
}

export interface RepairResultDto {
  index: number;
  episode: string;
  before: string;
  after: string | null;
  glitchesReplaced: number;
  framesFilled: number;
  maxDeviation: number[];
  note?: string;
}

export interface ReplayPlanDto {
  /** `fault` if any part faults, `incomplete` if a part could not be checked fully, else caution or pass. */
  verdict: ReplayVerdict;
  easeInS: number;
  easeOutS: number;
  easeIn: { plan: Plan; report: Report };
  easeOut: { plan: Plan; report: Report };
  passThrough: { shape: string; verdict: Verdict; findings: PassThroughFinding[]; notChecked: string[] };
  /** Poses for the 3D view only (not the checked motion). */
  view: Plan;
  /** The replay document offered for download (with the caution). */
  document: Record<string, unknown>;
  repaired: boolean;
  caution: string;
}

const post = (body: unknown): RequestInit => ({ method: "POST", body: JSON.stringify(body) });

export const datasetApi = {
  list: (projectId: string) =>
    request<{ datasets: DatasetDto[]; limitBytes: number }>(`/api/v1/projects/${projectId}/datasets`),
  get: (datasetId: string) => request<DatasetSummaryDto>(`/api/v1/datasets/${datasetId}`),
  preview: (datasetId: string, input: { armId: string; mapping: ColumnMappingInput }) =>
    request<{ preview: PreviewDto }>(`/api/v1/datasets/${datasetId}/preview`, post(input)).then((r) => r.preview),
  saveMapping: (datasetId: string, input: { armId: string; mapping: ColumnMappingInput }) =>
    request<{ dataset: DatasetDto; preview: PreviewDto }>(`/api/v1/datasets/${datasetId}/mapping`, post(input)),
  audit: (datasetId: string) =>
    request<{ dataset: DatasetDto }>(`/api/v1/datasets/${datasetId}/audit`, { method: "POST" }),
  episodes: (datasetId: string) =>
    request<{ episodes: EpisodeRowDto[] }>(`/api/v1/datasets/${datasetId}/episodes`).then((r) => r.episodes),
  episode: (datasetId: string, index: number) => request<EpisodeDto>(`/api/v1/datasets/${datasetId}/episodes/${index}`),
  repair: (datasetId: string, episodes?: number[]) =>
    request<{ repaired: RepairResultDto[] }>(
      `/api/v1/datasets/${datasetId}/repair`,
      post(episodes ? { episodes } : {}),
    ).then((r) => r.repaired),
  replayPlan: (datasetId: string, index: number) =>
    request<ReplayPlanDto>(`/api/v1/datasets/${datasetId}/episodes/${index}/replay-plan`),
  exportUrl: (datasetId: string) => `/api/v1/datasets/${datasetId}/export`,
};

/**
 * Uploads a dataset file as the request body with upload progress (0..1); the browser sends its
 * Content-Length, which the server requires. Errors arrive as {@link ApiError}.
 */
export async function uploadDataset(
  projectId: string,
  file: Blob,
  name: string,
  onProgress: (fraction: number) => void,
): Promise<DatasetDto> {
  const url = `/api/v1/projects/${projectId}/datasets?${new URLSearchParams({ name })}`;
  const body = await uploadWithProgress(
    url,
    file,
    "application/octet-stream",
    onProgress,
    "The upload did not reach the server; nothing was stored.",
  );
  return (body as { dataset: DatasetDto }).dataset;
}
