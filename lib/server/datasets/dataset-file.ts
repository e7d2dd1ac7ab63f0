/**
 * Reading a stored dataset: the file from object storage, read and mapped by the engine
 * (kinematics/recordings/dataset-read.ts). Each process keeps the last datasets it read, so the
 * batches of one audit do not fetch and parse the file again. An audit worker reads a single Parquet
 * file by ranges instead: the footer and the episode column once, then per batch only the column
 * chunks of the row groups that hold the batch's episodes.
 */
import "server-only";
import {
  armSchema,
  indexParquetEpisodes,
  readDataset,
  readParquetEpisodes,
  type Arm,
  type ColumnMapping,
  type DatasetReadResult,
  type Episode,
  type ParquetEpisodeIndex,
  type ReadOptions,
  type RowGroupCache,
} from "@/kinematics";
import { columnMappingSchema } from "@/lib/shared/schemas/datasets";
import { getObject, getObjectRange } from "@/lib/server/storage";

/** What the first bytes say the file is: Parquet ("PAR1"), zip ("PK\x03\x04"), else CSV text. */
export function fileKindOf(head: Uint8Array): "parquet" | "zip" | "csv" {
  if (head[0] === 0x50 && head[1] === 0x41 && head[2] === 0x52 && head[3] === 0x31) return "parquet";
  if (head[0] === 0x50 && head[1] === 0x4b && head[2] === 0x03 && head[3] === 0x04) return "zip";
  return "csv";
}

/** The name the engine sees for a stored single file (the zip's own names are kept). */
function innerName(name: string, kind: string): string {
  const base = name.replace(/[^A-Za-z0-9._-]+/g, "-") || "dataset";
  return kind === "parquet"
    ? base.endsWith(".parquet")
      ? base
      : `${base}.parquet`
    : kind === "csv"
      ? base.endsWith(".csv")
        ? base
        : `${base}.csv`
      : `${base}.zip`;
}

const cache = new Map<string, Promise<DatasetReadResult>>();
const CACHE_ENTRIES = 2;

/** The arm a dataset is audited against, from its revision's stored description. */
export function armOfRevision(description: unknown): Arm {
  return armSchema.parse(description);
}

/** Reads a stored dataset with a mapping (cached per object, revision and mapping). */
export function readStoredDataset(
  dataset: { objectKey: string; name: string; fileKind: string },
  arm: Arm,
  armKey: string,
  mapping: unknown,
  options: ReadOptions = {},
): Promise<DatasetReadResult> {
  const parsed: ColumnMapping = columnMappingSchema.parse(mapping ?? {});
  const key = `${dataset.objectKey}|${armKey}|${JSON.stringify(parsed)}|${options.keepColumns ? "all" : "mapped"}`;
  let pending = cache.get(key);
  if (!pending) {
    pending = (async () => {
      const bytes = await getObject(dataset.objectKey);
      return readDataset(arm, [{ name: innerName(dataset.name, dataset.fileKind), bytes }], parsed, options);
    })();
    pending.catch(() => cache.delete(key));
    cache.set(key, pending);
    while (cache.size > CACHE_ENTRIES) cache.delete(cache.keys().next().value as string);
  }
  return pending;
}

/** A stored object read by ranges, as hyparquet's file interface; each range is fetched once. */
function rangedObject(key: string, byteLength: number) {
  const fetched = new Map<string, Promise<ArrayBuffer>>();
  return {
    byteLength,
    slice(start: number, end?: number): Promise<ArrayBuffer> {
      const stop = Math.min(end ?? byteLength, byteLength);
      const id = `${start}-${stop}`;
      let pending = fetched.get(id);
      if (!pending) {
        pending = getObjectRange(key, start, stop).then(
          (b) => b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer,
        );
        pending.catch(() => fetched.delete(id));
        fetched.set(id, pending);
        // keep the footer and the last few column chunks, not the whole file
        while (fetched.size > 16) fetched.delete(fetched.keys().next().value as string);
      }
      return pending;
    },
  };
}

const indexes = new Map<
  string,
  Promise<{ index: ParquetEpisodeIndex; file: ReturnType<typeof rangedObject>; groups: RowGroupCache }>
>();
/** Decoded row groups kept per indexed file (a batch and the next usually share one). */
const GROUPS_KEPT = 2;

/**
 * Episodes `first` … `first + count − 1` of a stored dataset, equal to those {@link readStoredDataset}
 * gives. A single Parquet file is read by ranges (its episode index cached per process); other kinds
 * are read whole. Throws when the dataset can no longer be read with its mapping.
 */
export async function readStoredEpisodes(
  dataset: { objectKey: string; name: string; fileKind: string; sizeBytes: number },
  arm: Arm,
  armKey: string,
  mapping: unknown,
  first: number,
  count: number,
): Promise<Episode[]> {
  const parsed: ColumnMapping = columnMappingSchema.parse(mapping ?? {});
  if (dataset.fileKind !== "parquet") {
    const read = await readStoredDataset(dataset, arm, armKey, parsed);
    if (read.problems.length > 0) throw new Error(`the dataset can no longer be read: ${read.problems[0]}`);
    return read.episodes.slice(first, first + count);
  }
  const key = `${dataset.objectKey}|${armKey}|${JSON.stringify(parsed)}`;
  let pending = indexes.get(key);
  if (!pending) {
    pending = (async () => {
      const file = rangedObject(dataset.objectKey, dataset.sizeBytes);
      const index = await indexParquetEpisodes(arm, innerName(dataset.name, "parquet"), file, parsed);
      return { index, file, groups: new Map() as RowGroupCache };
    })();
    pending.catch(() => indexes.delete(key));
    indexes.set(key, pending);
    while (indexes.size > CACHE_ENTRIES) indexes.delete(indexes.keys().next().value as string);
  }
  const { index, file, groups } = await pending;
  if (index.problems.length > 0) throw new Error(`the dataset can no longer be read: ${index.problems[0]}`);
  const episodes = await readParquetEpisodes(arm, file, index, first, count, parsed, groups);
  while (groups.size > GROUPS_KEPT) groups.delete(groups.keys().next().value as number);
  return episodes;
}
