/**
 * Writing episodes as one Parquet file (hyparquet-writer): columns `episode` (text), `frame_index`
 * (int32, from 0 within each episode), `t` (seconds, double) and one column per arm joint, named like
 * the joint (double, or float32 on request), plus `filled` (boolean) when any episode marks frames
 * filled by a repair. The episode, time and joint columns can be renamed, and the joints written as
 * one list column, and the input's other (unmapped) columns carried after them, to give a dataset
 * back the columns it was read from. `readDataset` reads the default layout back with its default
 * mapping.
 *
 * @module
 */
import { parquetWriteBuffer } from "hyparquet-writer";
import type { Arm } from "../plan/arm";
import type { Episode } from "./timed-replay";
import type { DatasetEpisode } from "./dataset-read";

/** An episode to write, with the frames a repair filled (1) marked. */
export interface EpisodeToWrite extends Episode {
  filled?: Uint8Array;
  /** Values of {@link WriteOptions.otherColumns} per column and written frame (`null` where none). */
  other?: unknown[][];
}

/** Column types {@link WriteOptions.otherColumns} can carry: the scalar Parquet types, as they were read. */
export const keepableColumnTypes: readonly string[] = ["DOUBLE", "FLOAT", "INT32", "INT64", "STRING", "BOOLEAN"];

/** Options for {@link writeEpisodesParquet}. */
export interface WriteOptions {
  /** Store joint positions as float32 instead of float64. */
  float32?: boolean;
  /** Column names, to write a dataset back with the columns it was read from (defaults in the module comment). */
  columns?: {
    episode?: string;
    time?: string;
    /** One column per joint, in the arm's order. */
    joints?: string[];
    /** One list column holding every joint instead of one column per joint. */
    jointsList?: string;
  };
  /**
   * More columns, written after the episode's own (nullable, in the given types: one of
   * {@link keepableColumnTypes}), with each episode's values from its `other`: the columns of the
   * input that the mapping did not take, so an export keeps them.
   */
  otherColumns?: readonly { name: string; type: string }[];
}

/** The episodes as the bytes of one Parquet file (snappy-compressed pages). */
export function writeEpisodesParquet(
  arm: Arm,
  episodes: readonly EpisodeToWrite[],
  options: WriteOptions = {},
): Uint8Array {
  const n = arm.joints.length;
  let rows = 0;
  for (const e of episodes) rows += e.recording.count;
  const episode = new Array<string>(rows);
  const frame = new Int32Array(rows);
  const time = new Float64Array(rows);
  const joints = arm.joints.map(() => (options.float32 ? new Float32Array(rows) : new Float64Array(rows)));
  const anyFilled = episodes.some((e) => e.filled && e.filled.some((f) => f === 1));
  const filled = anyFilled ? new Array<boolean>(rows) : null;
  let r = 0;
  for (const e of episodes) {
    const { count, timeS, position, jointCount } = e.recording;
    if (jointCount !== n) throw new RangeError(`episode ${e.id}: has ${jointCount} joints; the arm has ${n}`);
    for (let k = 0; k < count; k++, r++) {
      episode[r] = e.id;
      frame[r] = k;
      time[r] = timeS[k];
      for (let j = 0; j < n; j++) joints[j][r] = position[k * n + j];
      if (filled) filled[r] = e.filled?.[k] === 1;
    }
  }
  const jointType = options.float32 ? "FLOAT" : "DOUBLE";
  const names = options.columns ?? {};
  const jointNames = names.joints ?? arm.joints.map((joint) => joint.name);
  if (jointNames.length !== n)
    throw new RangeError(`columns.joints names ${jointNames.length} columns; the arm has ${n} joints`);
  const head = [
    { name: names.episode ?? "episode", data: episode, type: "STRING" as const, nullable: false },
    { name: "frame_index", data: frame, type: "INT32" as const, nullable: false },
    { name: names.time ?? "t", data: time, type: "DOUBLE" as const, nullable: false },
  ];
  const tail: { name: string; data: unknown[]; type: "BOOLEAN"; nullable: boolean }[] = filled
    ? [{ name: "filled", data: filled, type: "BOOLEAN" as const, nullable: false }]
    : [];
  const otherColumns = options.otherColumns ?? [];
  const otherData = otherColumns.map((c, i) => {
    if (!keepableColumnTypes.includes(c.type))
      throw new RangeError(`column "${c.name}": type ${c.type} cannot be written`);
    const data = new Array<unknown>(rows).fill(null);
    let at = 0;
    for (const e of episodes) {
      const values = e.other?.[i];
      if (values) for (let k = 0; k < e.recording.count; k++) data[at + k] = values[k] ?? null;
      at += e.recording.count;
    }
    return { name: c.name, data, type: c.type as "DOUBLE" | "FLOAT" | "INT32" | "INT64" | "STRING" | "BOOLEAN" };
  });
  if (names.jointsList) {
    // a three-level LIST of the joint positions, one list per row (Apache Parquet LogicalTypes, "Lists")
    const lists = new Array<number[]>(rows);
    for (let i = 0; i < rows; i++) {
      const row = new Array<number>(n);
      for (let j = 0; j < n; j++) row[j] = joints[j][i];
      lists[i] = row;
    }
    const columnData = [...head, { name: names.jointsList, data: lists }, ...tail, ...otherData];
    const leaf = (c: { name: string; type: "STRING" | "INT32" | "DOUBLE" | "BOOLEAN" }) =>
      c.type === "STRING"
        ? {
            name: c.name,
            type: "BYTE_ARRAY" as const,
            converted_type: "UTF8" as const,
            repetition_type: "REQUIRED" as const,
          }
        : { name: c.name, type: c.type, repetition_type: "REQUIRED" as const };
    const buffer = parquetWriteBuffer({
      columnData: columnData.map(({ name, data }) => ({ name, data })),
      schema: [
        { name: "root", num_children: columnData.length },
        ...head.map(leaf),
        { name: names.jointsList, repetition_type: "REQUIRED", converted_type: "LIST", num_children: 1 },
        { name: "list", repetition_type: "REPEATED", num_children: 1 },
        { name: "element", type: jointType, repetition_type: "REQUIRED" },
        ...tail.map(leaf),
        ...otherData.map((c) =>
          c.type === "STRING"
            ? {
                name: c.name,
                type: "BYTE_ARRAY" as const,
                converted_type: "UTF8" as const,
                repetition_type: "OPTIONAL" as const,
              }
            : { name: c.name, type: c.type, repetition_type: "OPTIONAL" as const },
        ),
      ],
      rowGroupSize: 100000,
      createdBy: "jointproof",
    });
    return new Uint8Array(buffer);
  }
  const buffer = parquetWriteBuffer({
    columnData: [
      ...head,
      ...jointNames.map((name, j) => ({ name, data: joints[j], type: jointType, nullable: false }) as const),
      ...tail,
      ...otherData.map((c) => ({ ...c, nullable: true })),
    ],
    rowGroupSize: 100000,
    createdBy: "jointproof",
  });
  return new Uint8Array(buffer);
}

/** Result of {@link exportColumnsOf}. */
export interface ExportColumns {
  /** The unmapped input columns the export writes, by name, in order of first appearance. */
  kept: { name: string; type: string }[];
  /** Input columns the export writes itself instead (`frame_index`, numbered 0… within each episode). */
  replaced: string[];
  /** Why the export cannot keep every column (empty when it can), one line each naming the columns. */
  problems: string[];
}

/**
 * The columns an export carries besides its own (`written`: the episode, time and joint columns and
 * `filled`): every unmapped column of the input, so nothing is dropped without a word. A problem when
 * a column has a type the writer cannot reproduce, differs in type between files, or has the name of
 * a column the export writes itself.
 */
export function exportColumnsOf(episodes: readonly DatasetEpisode[], written: readonly string[]): ExportColumns {
  const byName = new Map<string, { name: string; type: string }>();
  const clash = new Set<string>();
  for (const e of episodes)
    for (const c of e.other?.columns ?? []) {
      const seen = byName.get(c.name);
      if (!seen) byName.set(c.name, { name: c.name, type: c.type });
      else if (seen.type !== c.type) clash.add(`"${c.name}" (${seen.type} and ${c.type})`);
    }
  const all = [...byName.values()];
  const replaced = all.filter((c) => c.name === "frame_index").map((c) => c.name);
  const kept = all.filter((c) => c.name !== "frame_index");
  const unwritable = kept.filter((c) => !keepableColumnTypes.includes(c.type));
  const taken = kept.filter((c) => written.includes(c.name));
  const problems: string[] = [];
  if (clash.size > 0) problems.push(`columns with different types in different files: ${[...clash].join(", ")}`);
  if (unwritable.length > 0)
    problems.push(
      `columns the export cannot write yet: ${unwritable.map((c) => `"${c.name}" (${c.type})`).join(", ")} (it writes ${keepableColumnTypes.join(", ")})`,
    );
  if (taken.length > 0)
    problems.push(
      `unmapped columns named like a column the export writes: ${taken.map((c) => `"${c.name}"`).join(", ")}; map them, or rename them in the input`,
    );
  return { kept, replaced, problems };
}

/**
 * An episode's values of the kept columns for the frames written: the recorded frames' values in
 * order, and null on frames a repair filled in (marked 1 in `filled`).
 */
export function otherValuesOf(
  episode: DatasetEpisode,
  kept: readonly { name: string }[],
  filled?: Uint8Array,
): unknown[][] {
  const other = episode.other;
  const count = filled ? filled.length : episode.recording.count;
  return kept.map((c) => {
    const at = other ? other.columns.findIndex((o) => o.name === c.name) : -1;
    const out = new Array<unknown>(count).fill(null);
    if (!other || at < 0) return out;
    const source = other.values[at];
    let k = 0;
    for (let i = 0; i < count; i++) if (!filled || filled[i] !== 1) out[i] = source[k++] ?? null;
    return out;
  });
}
