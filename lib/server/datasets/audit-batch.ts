/**
 * One audit job: batch B of generation G of a dataset. The batch is claimed (counted) only while it
 * is not done and still of the dataset's current generation; its episodes (only these) are read from
 * the stored file, audited by the engine, and stored with the batch's "done" mark in one transaction. A job
 * that dies before that commit leaves nothing: pg-boss retries it and the results are written then.
 */
import "server-only";
import { auditEpisode, type Episode, type EpisodeAudit } from "@/kinematics";
import {
  claimDatasetBatchForWorker,
  getDatasetArmForWorker,
  storeDatasetBatchResults,
  type EpisodeResult,
} from "@/db/queries/datasets";
import { armOfRevision, readStoredEpisodes } from "./dataset-file";
import type { DatasetJob } from "./queue";

/** The stored row of one audited episode. */
export function episodeResult(index: number, episode: Episode, audit: EpisodeAudit): EpisodeResult {
  const { count, timeS } = episode.recording;
  const faults = audit.findings.filter((f) => f.severity === "fault");
  const worst = faults[0] ?? audit.findings[0];
  return {
    index,
    episode: audit.episode,
    samples: audit.samples,
    durationS: count > 1 && Number.isFinite(timeS[count - 1] - timeS[0]) ? timeS[count - 1] - timeS[0] : 0,
    verdict: audit.verdict,
    findingCount: audit.findings.length,
    faultCount: faults.length,
    worstKind: audit.verdict === "invalid" ? "invalid" : (worst?.kind ?? null),
    worstMessage: audit.verdict === "invalid" ? (audit.problems[0] ?? null) : (worst?.message ?? null),
    findings: audit.findings,
    problems: audit.problems,
  };
}

/** What became of a job. */
export type BatchOutcome = "stored" | "skipped";

/** Runs one batch job; throws when it cannot (pg-boss then retries it). */
export async function runDatasetBatch(
  job: DatasetJob,
  options: { beforeStore?: () => Promise<void> } = {},
): Promise<BatchOutcome> {
  const claimed = await claimDatasetBatchForWorker(job);
  if (!claimed) return "skipped"; // done already, or an audit of a newer generation started
  const revision = await getDatasetArmForWorker({ datasetId: job.datasetId });
  if (!revision) throw new Error(`dataset ${job.datasetId} has no arm revision`);
  const arm = armOfRevision(revision.description);
  const { firstEpisode, episodeCount } = claimed.batch;
  // only this batch's episodes (a Parquet file by ranges: the row groups that hold them)
  const episodes = await readStoredEpisodes(
    claimed.dataset,
    arm,
    revision.id,
    claimed.dataset.mapping,
    firstEpisode,
    episodeCount,
  ).catch((err: unknown) => {
    throw new Error(`dataset ${job.datasetId}: ${err instanceof Error ? err.message : String(err)}`);
  });
  const results: EpisodeResult[] = episodes.map((episode, k) =>
    episodeResult(firstEpisode + k, episode, auditEpisode(arm, episode)),
  );
  await options.beforeStore?.();
  const stored = await storeDatasetBatchResults({ ...job, episodes: results });
  return stored ? "stored" : "skipped";
}
