/**
 * Reading a stored dataset: the file from object storage, read and mapped by the engine
 * (kinematics/recordings/dataset-read.ts). Each process keeps the last datasets it read, so the
 * batches of one audit do not fetch and parse the file again.
 */
import "server-only";
import { armSchema, readDataset, type Arm, type ColumnMapping, type DatasetReadResult } from "@/kinematics";
import { columnMappingSchema } from "@/lib/shared/schemas/datasets";
import { getObject } from "@/lib/server/storage";

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
): Promise<DatasetReadResult> {
  const parsed: ColumnMapping = columnMappingSchema.parse(mapping ?? {});
  const key = `${dataset.objectKey}|${armKey}|${JSON.stringify(parsed)}`;
  let pending = cache.get(key);
  if (!pending) {
    pending = (async () => {
      const bytes = await getObject(dataset.objectKey);
      return readDataset(arm, [{ name: innerName(dataset.name, dataset.fileKind), bytes }], parsed);
    })();
    pending.catch(() => cache.delete(key));
    cache.set(key, pending);
    while (cache.size > CACHE_ENTRIES) cache.delete(cache.keys().next().value as string);
  }
  return pending;
}
