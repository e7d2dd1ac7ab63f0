/**
 * Writing episodes as one Parquet file (hyparquet-writer): columns `episode` (text), `frame_index`
 * (int32, from 0 within each episode), `t` (seconds, double) and one column per arm joint, named like
 * the joint (double, or float32 on request), plus `filled` (boolean) when any episode marks frames
 * filled by a repair. The episode, time and joint columns can be renamed, and the joints written as
 * one list column, to give a dataset back the columns it was read from. `readDataset` reads the
 * default layout back with its default mapping.
 *
 * @module
 */
import { parquetWriteBuffer } from "hyparquet-writer";
import type { Arm } from "../plan/arm";
import type { Episode } from "./timed-replay";

/** An episode to write, with the frames a repair filled (1) marked. */
export interface EpisodeToWrite extends Episode {
  filled?: Uint8Array;
}

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
  const tail = filled ? [{ name: "filled", data: filled, type: "BOOLEAN" as const, nullable: false }] : [];
  if (names.jointsList) {
    // a three-level LIST of the joint positions, one list per row (Apache Parquet LogicalTypes, "Lists")
    const lists = new Array<number[]>(rows);
    for (let i = 0; i < rows; i++) {
      const row = new Array<number>(n);
      for (let j = 0; j < n; j++) row[j] = joints[j][i];
      lists[i] = row;
    }
    const columnData = [...head, { name: names.jointsList, data: lists }, ...tail];
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
    ],
    rowGroupSize: 100000,
    createdBy: "jointproof",
  });
  return new Uint8Array(buffer);
}
