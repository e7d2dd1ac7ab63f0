/**
 * The dataset actions behind the API routes: streamed upload, mapping preview, audit start, repair,
 * export and the replay plan. Handlers parse, authenticate, load and authorise; these act.
 */
import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { Readable, Transform } from "node:stream";
import { zipSync, strToU8 } from "fflate";
import {
  auditEpisode,
  auditToJson,
  repairEpisode,
  replayOf,
  replayViewPlan,
  summarizeAudits,
  exportColumnsOf,
  otherValuesOf,
  writeEpisodesParquet,
  type Arm,
  type Episode,
  type EpisodeToWrite,
} from "@/kinematics";
import {
  listDatasetEpisodes,
  listDatasetRepairs,
  saveDatasetEpisodeRepair,
  startDatasetAudit,
  type DatasetForUser,
} from "@/db/queries/datasets";
import type { Dataset } from "@/db/schema";
import { AppError } from "@/lib/server/errors";
import { deleteObject, putObjectStream } from "@/lib/server/storage";
import { SAFETY_TEXT } from "@/lib/shared/safety";
import { columnMappingSchema } from "@/lib/shared/schemas/datasets";
import { datasetEnv } from "./config";
import { armOfRevision, fileKindOf, readStoredDataset } from "./dataset-file";
import { decodeEpisode, encodeEpisode } from "./episode-codec";
import { enqueueDatasetBatches } from "./queue";

/** What a finished upload stored. */
export interface StoredUpload {
  key: string;
  sizeBytes: number;
  sha256: string;
  fileKind: "parquet" | "zip" | "csv";
}

/**
 * Streams a request body into the object store under a new key, whole or not at all: the declared
 * length is required and must be within the limit, the bytes are counted and hashed on the way, and
 * an object whose byte count differs from the declared length is removed again.
 */
export async function storeUpload(request: Request, projectId: string): Promise<StoredUpload> {
  const limit = datasetEnv().DATASET_UPLOAD_LIMIT_BYTES;
  const header = request.headers.get("content-length");
  const declared = header === null ? NaN : Number(header);
  if (!Number.isSafeInteger(declared) || declared < 0) {
    throw new AppError(
      "bad_request:length",
      "Send the dataset with a Content-Length header (the upload is stored whole or not at all).",
    );
  }
  if (declared > limit)
    throw new AppError("payload_too_large", `The dataset is larger than the limit of ${limit} bytes.`, {
      details: { limitBytes: limit },
    });
  if (declared === 0 || !request.body) throw new AppError("unprocessable:dataset", "The dataset file is empty.");
  const hash = createHash("sha256");
  const head = new Uint8Array(4);
  let seen = 0;
  const counter = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      if (seen < 4) head.set(chunk.subarray(0, 4 - seen), seen);
      seen += chunk.byteLength;
      if (seen > declared) return done(new Error("body longer than its Content-Length"));
      hash.update(chunk);
      done(null, chunk);
    },
    // a body that ends short of its Content-Length fails the put (the store would wait for the rest)
    flush(done) {
      done(seen === declared ? null : new Error("body shorter than its Content-Length"));
    },
  });
  const key = `datasets/${projectId}/${randomUUID()}`;
  const source = Readable.fromWeb(request.body as import("node:stream/web").ReadableStream<Uint8Array>);
  source.on("error", (err) => counter.destroy(err));
  const body = source.pipe(counter);
  // a failing body (cut, too long) aborts the put rather than leave the store waiting for bytes
  const abort = new AbortController();
  counter.on("error", () => abort.abort());
  try {
    await putObjectStream(key, body, declared, "application/octet-stream", abort.signal);
  } catch (err) {
    await deleteObject(key).catch(() => undefined);
    if (seen !== declared)
      throw new AppError(
        "bad_request:length",
        `The upload was cut: ${seen} of ${declared} bytes arrived; nothing was stored.`,
      );
    throw err;
  }
  if (seen !== declared) {
    await deleteObject(key).catch(() => undefined);
    throw new AppError(
      "bad_request:length",
      `The upload was cut: ${seen} of ${declared} bytes arrived; nothing was stored.`,
    );
  }
  return { key, sizeBytes: declared, sha256: hash.digest("hex"), fileKind: fileKindOf(head) };
}

/** A preview of a dataset read with a mapping: its files' columns, episodes found, first rows, problems. */
export async function previewDataset(dataset: Dataset, arm: Arm, armKey: string, mapping: unknown) {
  const read = await readStoredDataset(dataset, arm, armKey, mapping);
  const first = read.episodes[0];
  const rows: number[][] = [];
  if (first) {
    const { count, jointCount, timeS, position } = first.recording;
    for (let k = 0; k < Math.min(5, count); k++)
      rows.push([timeS[k], ...Array.from(position.subarray(k * jointCount, k * jointCount + jointCount))]);
  }
  return {
    files: read.files.slice(0, 20),
    fileCount: read.files.length,
    episodes: read.episodes.length,
    frames: read.episodes.reduce((sum, e) => sum + e.recording.count, 0),
    firstEpisode: first ? { episode: first.id, columns: ["t", ...arm.joints.map((j) => j.name)], rows } : null,
    problems: read.problems.slice(0, 50),
  };
}

/** Starts the audit of a mapped dataset: counts its episodes, creates the batches and their jobs. */
export async function startAudit(
  found: DatasetForUser,
  userId: string,
  revision: { id: string; description: unknown },
) {
  const arm = armOfRevision(revision.description);
  const read = await readStoredDataset(found.dataset, arm, revision.id, found.dataset.mapping);
  if (read.problems.length > 0) {
    throw new AppError("unprocessable:dataset", `The dataset cannot be read with its mapping: ${read.problems[0]}`, {
      issues: read.problems.slice(0, 50).map((message) => ({ path: "(file)", message })),
    });
  }
  const started = await startDatasetAudit({
    datasetId: found.dataset.id,
    userId,
    episodeCount: read.episodes.length,
    batchSize: datasetEnv().DATASET_BATCH_SIZE,
  });
  if (!started) throw new AppError("not_found:dataset", "No such dataset.");
  try {
    await enqueueDatasetBatches(
      started.batches.map((batch) => ({ datasetId: found.dataset.id, generation: started.dataset.generation, batch })),
    );
  } catch (err) {
    // the batches are committed; a worker's sweep enqueues them
    console.error("[datasets] could not enqueue (the sweep will):", err instanceof Error ? err.message : err);
  }
  return started.dataset;
}

/** The episodes of a dataset with the repaired ones in place of their originals. */
async function currentEpisodes(
  found: DatasetForUser,
  userId: string,
  arm: Arm,
  revisionId: string,
  options: { keepColumns?: boolean } = {},
) {
  const read = await readStoredDataset(found.dataset, arm, revisionId, found.dataset.mapping, options);
  if (read.problems.length > 0)
    throw new AppError("unprocessable:dataset", `The dataset cannot be read with its mapping: ${read.problems[0]}`);
  const repairs = await listDatasetRepairs({ datasetId: found.dataset.id, userId });
  return { read, repairs };
}

/**
 * Repairs episodes (the given indices, or every one with findings) and audits each result again.
 * Invalid episodes are not repaired (they could not be checked). Returns what was done per episode.
 */
export async function repairDatasetEpisodes(
  found: DatasetForUser,
  userId: string,
  revision: { id: string; description: unknown },
  indices?: number[],
) {
  const arm = armOfRevision(revision.description);
  const read = await readStoredDataset(found.dataset, arm, revision.id, found.dataset.mapping);
  if (read.problems.length > 0)
    throw new AppError("unprocessable:dataset", `The dataset cannot be read with its mapping: ${read.problems[0]}`);
  const rows = await listDatasetEpisodes({ datasetId: found.dataset.id, userId });
  const wanted = indices ? new Set(indices) : null;
  const results: {
    index: number;
    episode: string;
    before: string;
    after: string | null;
    glitchesReplaced: number;
    framesFilled: number;
    maxDeviation: number[];
    note?: string;
  }[] = [];
  for (const row of rows) {
    if (wanted ? !wanted.has(row.index) : row.findingCount === 0) continue;
    const episode = read.episodes[row.index];
    if (!episode || row.verdict === "invalid") {
      results.push({
        index: row.index,
        episode: row.episode,
        before: row.verdict,
        after: null,
        glitchesReplaced: 0,
        framesFilled: 0,
        maxDeviation: [],
        note: "invalid episodes cannot be repaired",
      });
      continue;
    }
    const repair = repairEpisode(arm, episode.recording);
    const audit = auditEpisode(arm, { id: episode.id, recording: repair.recording });
    await saveDatasetEpisodeRepair({
      datasetId: found.dataset.id,
      index: row.index,
      userId,
      repaired: encodeEpisode(repair.recording, repair.filled),
      verdict: audit.verdict,
      findings: audit.findings,
    });
    results.push({
      index: row.index,
      episode: row.episode,
      before: row.verdict,
      after: audit.verdict,
      glitchesReplaced: repair.glitchesReplaced,
      framesFilled: repair.framesFilled,
      maxDeviation: repair.maxDeviation,
    });
  }
  if (wanted)
    for (const i of wanted)
      if (!rows.some((r) => r.index === i))
        throw new AppError("not_found:episode", `No episode ${i + 1} in this dataset.`);
  return results;
}

/** One episode's data for the episode view: recorded, and repaired when there is a repair. */
export async function episodeData(
  found: DatasetForUser,
  userId: string,
  revision: { id: string; description: unknown },
  index: number,
) {
  const arm = armOfRevision(revision.description);
  const { read, repairs } = await currentEpisodes(found, userId, arm, revision.id);
  const episode = read.episodes[index];
  if (!episode) throw new AppError("not_found:episode", `No episode ${index + 1} in this dataset.`);
  const names = arm.joints.map((j) => j.name);
  const toJson = (e: Episode["recording"]) => ({
    timeS: Array.from(e.timeS),
    position: Array.from(e.position),
    jointCount: e.jointCount,
    count: e.count,
  });
  const stored = repairs.get(index);
  const repaired = stored ? decodeEpisode(stored, names) : null;
  return {
    arm,
    recorded: toJson(episode.recording),
    repaired: repaired ? { ...toJson(repaired.recording), filled: Array.from(repaired.filled) } : null,
  };
}

/** The file names inside an export archive. */
export const exportFiles = { data: "dataset.parquet", report: "report.json", manifest: "manifest.json" } as const;

/**
 * The cleaned dataset as a zip: `dataset.parquet` (every checked episode, repaired ones in place of
 * their originals, under the episode, time and joint column names of the dataset's mapping, plus
 * `frame_index` (0… within each episode, filled frames counted; it replaces an input column of that
 * name) and a `filled` column marking interpolated frames, then every other column of the input as
 * it was stored, empty on filled frames), `report.json` (per-episode audit of what was exported, the
 * columns kept and replaced, and the excluded episodes with their reasons) and `manifest.json` (the
 * SHA-256 of both, with its own `export.sha256` so `jointproof verify manifest.json` accepts it).
 * Invalid episodes are excluded and listed, never silently dropped.
 */
export async function exportDataset(
  found: DatasetForUser,
  userId: string,
  revision: { id: string; description: unknown },
): Promise<Uint8Array> {
  const arm = armOfRevision(revision.description);
  const { read, repairs } = await currentEpisodes(found, userId, arm, revision.id, { keepColumns: true });
  const names = arm.joints.map((j) => j.name);
  // the columns the dataset was read from (episode, time, joints or one joints list), so it reads back with the same mapping
  const mapping = columnMappingSchema.parse(found.dataset.mapping ?? {});
  const columns = {
    episode: mapping.episodeColumn,
    time: mapping.timeColumn,
    joints: mapping.jointColumns,
    jointsList: mapping.jointsColumn,
  };
  const others = exportColumnsOf(read.episodes, [
    columns.episode ?? "episode",
    columns.time ?? "t",
    ...(columns.jointsList ? [columns.jointsList] : (columns.joints ?? names)),
    "filled",
  ]);
  if (others.problems.length > 0)
    throw new AppError(
      "unprocessable:export",
      `The export keeps every column of the input and cannot here: ${others.problems.join("; ")}. Nothing was exported.`,
      { issues: others.problems.map((message) => ({ path: "(file)", message })) },
    );
  const kept: EpisodeToWrite[] = [];
  const excluded: { index: number; episode: string; reason: string }[] = [];
  const audits = [];
  for (let i = 0; i < read.episodes.length; i++) {
    const original = read.episodes[i];
    const stored = repairs.get(i);
    const decoded = stored ? decodeEpisode(stored, names) : null;
    const other = otherValuesOf(original, others.kept, decoded?.filled);
    const episode: EpisodeToWrite = decoded
      ? { id: original.id, recording: decoded.recording, filled: decoded.filled, other }
      : { id: original.id, recording: original.recording, other };
    const audit = auditEpisode(arm, episode);
    if (audit.verdict === "invalid") {
      excluded.push({ index: i, episode: original.id, reason: audit.problems[0] ?? "invalid" });
      continue;
    }
    kept.push(episode);
    audits.push({ index: i, repaired: decoded !== null, ...auditToJson(audit) });
  }
  const parquet = writeEpisodesParquet(arm, kept, { columns, otherColumns: others.kept });
  const report = strToU8(
    JSON.stringify(
      {
        format: "jointproof.dataset-report",
        dataset: found.dataset.name,
        arm: arm.name,
        check: "timed replay",
        columns: { kept: others.kept, replaced: others.replaced },
        summary: summarizeAudits(audits),
        episodes: audits,
        excluded,
        caution: SAFETY_TEXT,
      },
      null,
      2,
    ) + "\n",
  );
  const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
  const manifestBody = {
    format: "jointproof.dataset-export",
    dataset: found.dataset.name,
    arm: arm.name,
    files: [
      { name: exportFiles.data, bytes: parquet.byteLength, sha256: sha(parquet) },
      { name: exportFiles.report, bytes: report.byteLength, sha256: sha(report) },
    ],
    episodes: kept.length,
    excluded,
    caution: SAFETY_TEXT,
    export: { createdAt: new Date().toISOString() } as Record<string, unknown>,
  };
  // export.sha256: SHA-256 of JSON.stringify of the document without it, keys in order (bin/export-checksum.ts)
  manifestBody.export.sha256 = sha(strToU8(JSON.stringify(manifestBody)));
  const manifest = strToU8(JSON.stringify(manifestBody, null, 2) + "\n");
  return zipSync({
    [exportFiles.data]: [parquet, { level: 0 }],
    [exportFiles.report]: report,
    [exportFiles.manifest]: manifest,
  });
}

/**
 * The replay of one episode (repaired when there is a repair): ease in from rest (a checked plan), the
 * frames passed through without stopping (checked for travel, speed and acceleration; what is not
 * checked is listed), ease out to rest (a checked plan); a replay document to download, the poses for
 * the 3D view, and the caution.
 */
export async function episodeReplayPlan(
  found: DatasetForUser,
  userId: string,
  revision: { id: string; description: unknown },
  index: number,
) {
  const arm = armOfRevision(revision.description);
  const { read, repairs } = await currentEpisodes(found, userId, arm, revision.id);
  const original = read.episodes[index];
  if (!original) throw new AppError("not_found:episode", `No episode ${index + 1} in this dataset.`);
  const stored = repairs.get(index);
  const recording = stored
    ? decodeEpisode(
        stored,
        arm.joints.map((j) => j.name),
      ).recording
    : original.recording;
  const audit = auditEpisode(arm, { id: original.id, recording });
  if (audit.verdict === "invalid")
    throw new AppError("unprocessable:episode", `Episode ${index + 1} cannot be replayed: ${audit.problems[0]}`);
  const replay = replayOf(arm, recording);
  const { count, jointCount: n, timeS, position } = recording;
  const rows = (values: Float64Array) =>
    Array.from({ length: count }, (_, k) => Array.from(values.subarray(k * n, k * n + n)));
  const passThrough = {
    shape: "monotone cubic through every frame, at rest at the first and last frame",
    verdict: replay.passThrough.verdict,
    findings: replay.passThrough.findings,
    notChecked: replay.passThrough.notChecked,
  };
  const document = {
    format: "jointproof.replay",
    version: 1,
    caution: SAFETY_TEXT,
    episode: original.id,
    repaired: stored !== undefined,
    verdict: replay.verdict,
    rest: replay.rest,
    easeIn: replay.easeIn,
    passThrough: {
      ...passThrough,
      timeS: Array.from(timeS, (t) => t - timeS[0]),
      poses: rows(position),
      speeds: rows(replay.passThrough.speeds),
    },
    easeOut: replay.easeOut,
  };
  return {
    verdict: replay.verdict,
    easeInS: replay.easeInS,
    easeOutS: replay.easeOutS,
    easeIn: { plan: replay.easeIn, report: replay.easeInReport },
    easeOut: { plan: replay.easeOut, report: replay.easeOutReport },
    passThrough,
    view: replayViewPlan(arm, replay, recording),
    document,
    repaired: stored !== undefined,
    caution: SAFETY_TEXT,
  };
}
