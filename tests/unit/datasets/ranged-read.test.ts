// Reading a few episodes of a Parquet file by ranges (what an audit worker does for its batch) gives
// exactly the episodes that reading the whole file gives, and fetches only part of the file.
import { describe, expect, it } from "vitest";
import { parquetWriteBuffer } from "hyparquet-writer";
import { indexParquetEpisodes, parseArm, readDataset, readParquetEpisodes, type Arm } from "@/kinematics";

function armOf(): Arm {
  const result = parseArm({
    name: "Replay arm",
    controlRateHz: 1000,
    joints: [
      { name: "lift", min: -1, max: 1, maxVelocity: 1 },
      { name: "grip", type: "prismatic", min: 0, max: 0.04, maxVelocity: 0.1 },
    ],
  });
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

/** 30 episodes of 100 frames, in row groups of 700 rows (episodes cross group boundaries); `order` permutes the rows. */
function parquet(order?: (rows: number) => number[]): Uint8Array {
  const rows = 3000;
  const at = order ? order(rows) : Array.from({ length: rows }, (_, r) => r);
  const episode = new Int32Array(rows);
  const t = new Float64Array(rows);
  const lift = new Float64Array(rows);
  const grip = new Float64Array(rows);
  at.forEach((r, i) => {
    episode[i] = 100 + Math.floor(r / 100);
    t[i] = (r % 100) / 30;
    lift[i] = Math.sin(r / 37) * 0.5;
    grip[i] = 0.01 + (r % 7) * 0.001;
  });
  return new Uint8Array(
    parquetWriteBuffer({
      columnData: [
        { name: "episode", data: episode, type: "INT32" },
        { name: "t", data: t, type: "DOUBLE" },
        { name: "lift", data: lift, type: "DOUBLE" },
        { name: "grip", data: grip, type: "DOUBLE" },
        { name: "note", data: Array.from({ length: rows }, (_, i) => `row ${i}`), type: "STRING" },
      ],
      rowGroupSize: 700,
    }),
  );
}

/** The bytes as hyparquet's file interface, counting the bytes handed out. */
function source(bytes: Uint8Array) {
  const counter = { bytes: 0 };
  return {
    counter,
    file: {
      byteLength: bytes.byteLength,
      slice(start: number, end?: number) {
        const stop = end ?? bytes.byteLength;
        counter.bytes += stop - start;
        return bytes.slice(start, stop).buffer as ArrayBuffer;
      },
    },
  };
}

describe("reading a batch of episodes by ranges", () => {
  it("every batch of 7 episodes equals the same episodes read from the whole file, ids included", async () => {
    const arm = armOf();
    const bytes = parquet();
    const whole = await readDataset(arm, [{ name: "data.parquet", bytes }]);
    expect(whole.problems).toEqual([]);
    const { file } = source(bytes);
    const index = await indexParquetEpisodes(arm, "data.parquet", file);
    expect(index.problems).toEqual([]);
    expect(index.episodes).toHaveLength(30);
    for (let first = 0; first < 30; first += 7) {
      const batch = await readParquetEpisodes(arm, file, index, first, 7);
      expect(batch).toEqual(whole.episodes.slice(first, first + 7));
    }
  });

  it("one batch fetches the footer, the episode column and its own row groups, well under the whole file", async () => {
    const arm = armOf();
    const bytes = parquet();
    const { file, counter } = source(bytes);
    const index = await indexParquetEpisodes(arm, "data.parquet", file);
    counter.bytes = 0;
    await readParquetEpisodes(arm, file, index, 0, 3); // rows 0–299: the first row group only
    expect(counter.bytes).toBeGreaterThan(0);
    expect(counter.bytes).toBeLessThan(bytes.byteLength / 3);
  });

  it("episodes whose rows are scattered through the file read back equal to the whole-file read", async () => {
    const arm = armOf();
    // rows interleaved: episode of row r comes at place (r % 10) * 300 + floor(r / 10)
    const bytes = parquet((rows) => Array.from({ length: rows }, (_, i) => (i % 300) * 10 + Math.floor(i / 300)));
    const whole = await readDataset(arm, [{ name: "data.parquet", bytes }]);
    const { file } = source(bytes);
    const index = await indexParquetEpisodes(arm, "data.parquet", file);
    const batch = await readParquetEpisodes(arm, file, index, 4, 5);
    expect(batch).toEqual(whole.episodes.slice(4, 9));
  });

  it("a file the mapping cannot read is refused in the index with its columns, as the whole-file read refuses it", async () => {
    const arm = armOf();
    const bytes = parquet();
    const { file } = source(bytes);
    const index = await indexParquetEpisodes(arm, "data.parquet", file, { timeColumn: "time" });
    const whole = await readDataset(arm, [{ name: "data.parquet", bytes }], { timeColumn: "time" });
    expect(index.problems).toEqual(whole.problems);
    expect(index.problems[0]).toMatch(/has no time column "time".*note \(STRING\)/);
  });
});
