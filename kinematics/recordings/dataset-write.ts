/**
 * Writing episodes as one Parquet file (hyparquet-writer): columns `episode` (text), `frame_index`
 * (int32, from 0 within each episode), `t` (seconds, double) and one column per arm joint, named like
 * the joint (double, or float32 on request), plus `filled` (boolean) when any episode marks frames
 * filled by a repair. `readDataset` reads the file back with its default mapping.
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
}

/** The episodes as the bytes of one Parquet file (snappy-compressed pages). */
export function writeEpisodesParquet(arm: Arm, episodes: readonly EpisodeToWrite[], options: WriteOptions = {}): Uint8Array {
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
  const buffer = parquetWriteBuffer({
    columnData: [
      { name: "episode", data: episode, type: "STRING", nullable: false },
      { name: "frame_index", data: frame, type: "INT32", nullable: false },
      { name: "t", data: time, type: "DOUBLE", nullable: false },
      ...arm.joints.map((joint, j) => ({ name: joint.name, data: joints[j], type: jointType, nullable: false }) as const),
      ...(filled ? [{ name: "filled", data: filled, type: "BOOLEAN", nullable: false } as const] : []),
    ],
    rowGroupSize: 100000,
    createdBy: "jointproof",
  });
  return new Uint8Array(buffer);
}
