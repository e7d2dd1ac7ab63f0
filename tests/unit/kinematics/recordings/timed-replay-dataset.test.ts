// Dataset reading: Parquet files written in the test by a maintained writer (hyparquet-writer), zip
// archives by fflate, CSV through the recording CSV parser. Apache Parquet format: FLOAT is IEEE 754
// single precision, DOUBLE double precision; a float32 value widened to a double is exact (IEEE 754-2008
// §5.4.2, memory), so the values read back must equal Math.fround of what was written.
import { describe, expect, it } from "vitest";
import { parquetWriteBuffer } from "hyparquet-writer";
import { gzipSync, zipSync, strToU8 } from "fflate";
import { parseArm, type Arm } from "@/kinematics";
import { readDataset, type DatasetFile } from "@/kinematics/recordings/dataset-read";
import { writeEpisodesParquet } from "@/kinematics/recordings/dataset-write";
import { auditEpisodes } from "@/kinematics/recordings/timed-replay";

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

function file(name: string, buffer: ArrayBuffer | Uint8Array): DatasetFile {
  return { name, bytes: buffer instanceof Uint8Array ? buffer : new Uint8Array(buffer) };
}

/** Two episodes (ids 3 and 4) of 3 frames at 30 Hz in scalar DOUBLE columns. */
function scalarParquet(): ArrayBuffer {
  return parquetWriteBuffer({
    columnData: [
      { name: "episode", data: new Int32Array([3, 3, 3, 4, 4, 4]), type: "INT32" },
      { name: "t", data: new Float64Array([0, 1 / 30, 2 / 30, 0, 1 / 30, 2 / 30]), type: "DOUBLE" },
      { name: "lift", data: new Float64Array([0.1, 0.11, 0.12, -0.3, -0.31, -0.32]), type: "DOUBLE" },
      { name: "grip", data: new Float64Array([0.01, 0.01, 0.011, 0.02, 0.02, 0.02]), type: "DOUBLE" },
    ],
  });
}

describe("dataset reading: Parquet", () => {
  it("scalar columns named like the joints, an episode column and t read back exactly, one episode per id", async () => {
    const result = await readDataset(armOf(), [file("data.parquet", scalarParquet())]);
    expect(result.problems).toEqual([]);
    expect(result.episodes.map((e) => e.id)).toEqual(["3", "4"]);
    const e = result.episodes[1].recording;
    expect(e.count).toBe(3);
    expect(Array.from(e.timeS)).toEqual([0, 1 / 30, 2 / 30]);
    expect(Array.from(e.position)).toEqual([-0.3, 0.02, -0.31, 0.02, -0.32, 0.02]);
    expect(result.files[0].columns).toEqual([
      { name: "episode", type: "INT32" },
      { name: "t", type: "DOUBLE" },
      { name: "lift", type: "DOUBLE" },
      { name: "grip", type: "DOUBLE" },
    ]);
  });

  it("float32 columns read exactly as their float32 values", async () => {
    const lift = [0.1, 0.2, 0.30000001];
    const buffer = parquetWriteBuffer({
      columnData: [
        { name: "t", data: new Float32Array([0, 0.1, 0.2]), type: "FLOAT" },
        { name: "lift", data: new Float32Array(lift), type: "FLOAT" },
        { name: "grip", data: new Float32Array([0.01, 0.01, 0.01]), type: "FLOAT" },
      ],
    });
    const result = await readDataset(armOf(), [file("ep.parquet", buffer)]);
    expect(result.problems).toEqual([]);
    const r = result.episodes[0].recording;
    expect([r.position[0], r.position[2], r.position[4]]).toEqual(lift.map(Math.fround));
    expect(Array.from(r.timeS)).toEqual([0, 0.1, 0.2].map(Math.fround));
    expect(result.episodes[0].id).toBe("ep");
  });

  it("one list column holding all joints in the arm's order, chosen by name", async () => {
    const buffer = parquetWriteBuffer({
      columnData: [
        { name: "t", data: [0, 0.5] },
        {
          name: "observation.state",
          data: [
            [0.25, 0.01],
            [0.5, 0.02],
          ],
        },
      ],
      schema: [
        { name: "root", num_children: 2 },
        { name: "t", type: "DOUBLE", repetition_type: "REQUIRED" },
        { name: "observation.state", repetition_type: "OPTIONAL", converted_type: "LIST", num_children: 1 },
        { name: "list", repetition_type: "REPEATED", num_children: 1 },
        { name: "element", type: "FLOAT", repetition_type: "REQUIRED" },
      ],
    });
    const refused = await readDataset(armOf(), [file("ep.parquet", buffer)]);
    expect(refused.episodes).toEqual([]);
    expect(refused.problems).toEqual([
      'ep.parquet: has no column named like the arm\'s joints "lift", "grip". Its columns: t (DOUBLE), observation.state (list<FLOAT>). ' +
        "Set --joints-column NAME for a list column holding all joints, or --joint-columns A,B,… naming one column per joint in the arm's order (lift, grip).",
    ]);
    const result = await readDataset(armOf(), [file("ep.parquet", buffer)], { jointsColumn: "observation.state" });
    expect(result.problems).toEqual([]);
    expect(Array.from(result.episodes[0].recording.position)).toEqual([0.25, 0.01, 0.5, 0.02].map(Math.fround));
  });

  it("a list with the wrong number of joints makes that episode invalid, not the dataset unreadable", async () => {
    const buffer = parquetWriteBuffer({
      columnData: [
        { name: "t", data: [0, 0.5] },
        {
          name: "q",
          data: [
            [0.25, 0.01, 3],
            [0.5, 0.02, 3],
          ],
        },
      ],
      schema: [
        { name: "root", num_children: 2 },
        { name: "t", type: "DOUBLE", repetition_type: "REQUIRED" },
        { name: "q", repetition_type: "OPTIONAL", converted_type: "LIST", num_children: 1 },
        { name: "list", repetition_type: "REPEATED", num_children: 1 },
        { name: "element", type: "DOUBLE", repetition_type: "REQUIRED" },
      ],
    });
    const result = await readDataset(armOf(), [file("ep.parquet", buffer)], { jointsColumn: "q" });
    const [audit] = auditEpisodes(armOf(), result.episodes);
    expect(audit.verdict).toBe("invalid");
    expect(audit.problems).toEqual(['episode ep: has 3 joint values per frame; the arm "Replay arm" has 2 joints']);
  });

  it("--joint-columns picks columns in the arm's order; a frame index with a rate gives the time", async () => {
    const buffer = parquetWriteBuffer({
      columnData: [
        { name: "frame_index", data: new Int32Array([0, 1, 2]), type: "INT32" },
        { name: "a", data: new Float64Array([0.01, 0.02, 0.03]), type: "DOUBLE" },
        { name: "b", data: new Float64Array([0.5, 0.5, 0.5]), type: "DOUBLE" },
      ],
    });
    const refused = await readDataset(armOf(), [file("ep.parquet", buffer)], { jointColumns: ["b", "a"] });
    expect(refused.problems[0]).toMatch(
      /^ep\.parquet: has no time column "t"\. Its columns: frame_index \(INT32\), a \(DOUBLE\), b \(DOUBLE\)\. Set --time-column/,
    );
    const result = await readDataset(armOf(), [file("ep.parquet", buffer)], { jointColumns: ["b", "a"], rateHz: 30 });
    expect(result.problems).toEqual([]);
    const r = result.episodes[0].recording;
    expect(Array.from(r.timeS)).toEqual([0, 1 / 30, 2 / 30]);
    expect(Array.from(r.position)).toEqual([0.5, 0.01, 0.5, 0.02, 0.5, 0.03]);
  });

  it("refuses a text column given as a joint, naming its type", async () => {
    const buffer = parquetWriteBuffer({
      columnData: [
        { name: "t", data: new Float64Array([0, 1]), type: "DOUBLE" },
        { name: "lift", data: ["0", "1"], type: "STRING" },
        { name: "grip", data: new Float64Array([0, 0]), type: "DOUBLE" },
      ],
    });
    const result = await readDataset(armOf(), [file("ep.parquet", buffer)]);
    expect(result.problems[0]).toMatch(/joint column "lift" \(STRING\) not numbers/);
  });

  it("reads gzip-compressed pages (compressed here with fflate's gzip, RFC 1952)", async () => {
    const buffer = parquetWriteBuffer({
      columnData: [
        { name: "t", data: new Float64Array([0, 0.1, 0.2]), type: "DOUBLE" },
        { name: "lift", data: new Float64Array([0.5, 0.51, 0.52]), type: "DOUBLE" },
        { name: "grip", data: new Float64Array([0.01, 0.01, 0.01]), type: "DOUBLE" },
      ],
      codec: "GZIP",
      compressors: { GZIP: (input: Uint8Array) => gzipSync(input) },
    });
    const result = await readDataset(armOf(), [file("gz.parquet", buffer)]);
    expect(result.problems).toEqual([]);
    expect(Array.from(result.episodes[0].recording.position)).toEqual([0.5, 0.01, 0.51, 0.01, 0.52, 0.01]);
  });

  it("Parquet written by the product reads back identically, float64 and float32", async () => {
    const arm = armOf();
    const episodes = [
      {
        id: "take-1",
        recording: {
          names: ["lift", "grip"],
          jointCount: 2,
          count: 3,
          timeS: Float64Array.from([0, 0.1, 0.2]),
          position: Float64Array.from([0.1, 0.01, Math.PI / 7, 0.02, -0.3, 0.03]),
        },
      },
      {
        id: "take-2",
        recording: {
          names: ["lift", "grip"],
          jointCount: 2,
          count: 2,
          timeS: Float64Array.from([0, 1 / 3]),
          position: Float64Array.from([1 / 3, 0, 2 / 3, 0.04]),
        },
      },
    ];
    const back = await readDataset(arm, [file("out.parquet", writeEpisodesParquet(arm, episodes))]);
    expect(back.problems).toEqual([]);
    expect(back.episodes.map((e) => e.id)).toEqual(["take-1", "take-2"]);
    back.episodes.forEach((e, i) => {
      expect(Array.from(e.recording.timeS)).toEqual(Array.from(episodes[i].recording.timeS));
      expect(Array.from(e.recording.position)).toEqual(Array.from(episodes[i].recording.position));
    });
    const single = await readDataset(arm, [
      file("out.parquet", writeEpisodesParquet(arm, episodes, { float32: true })),
    ]);
    expect(Array.from(single.episodes[0].recording.position)).toEqual(
      Array.from(episodes[0].recording.position).map(Math.fround),
    );
  });
});

describe("dataset writing: the columns it was read from", () => {
  it("renamed episode and time columns and one list column read back identically with the same mapping", async () => {
    const arm = armOf();
    const episodes = [
      {
        id: "a",
        recording: {
          names: ["lift", "grip"],
          jointCount: 2,
          count: 3,
          timeS: Float64Array.from([0, 0.1, 0.2]),
          position: Float64Array.from([0.1, 0.01, 0.2, 0.02, 0.3, 0.03]),
        },
      },
      {
        id: "b",
        recording: {
          names: ["lift", "grip"],
          jointCount: 2,
          count: 2,
          timeS: Float64Array.from([0, 0.1]),
          position: Float64Array.from([-0.1, 0, -0.2, 0.01]),
        },
      },
    ];
    const bytes = writeEpisodesParquet(arm, episodes, {
      columns: { episode: "take", time: "seconds", jointsList: "state" },
    });
    const back = await readDataset(arm, [file("out.parquet", bytes)], {
      episodeColumn: "take",
      timeColumn: "seconds",
      jointsColumn: "state",
    });
    expect(back.problems).toEqual([]);
    expect(back.files[0].columns.map((c) => `${c.name}:${c.type}`)).toEqual([
      "take:STRING",
      "frame_index:INT32",
      "seconds:DOUBLE",
      "state:list<DOUBLE>",
    ]);
    back.episodes.forEach((e, i) => {
      expect(e.id).toBe(episodes[i].id);
      expect(Array.from(e.recording.timeS)).toEqual(Array.from(episodes[i].recording.timeS));
      expect(Array.from(e.recording.position)).toEqual(Array.from(episodes[i].recording.position));
    });
  });

  it("joint columns under other names, in the arm's order", async () => {
    const arm = armOf();
    const episodes = [
      {
        id: "a",
        recording: {
          names: ["lift", "grip"],
          jointCount: 2,
          count: 2,
          timeS: Float64Array.from([0, 0.1]),
          position: Float64Array.from([0.1, 0.01, 0.2, 0.02]),
        },
      },
    ];
    const bytes = writeEpisodesParquet(arm, episodes, { columns: { joints: ["q0", "q1"] } });
    const back = await readDataset(arm, [file("out.parquet", bytes)], { jointColumns: ["q0", "q1"] });
    expect(Array.from(back.episodes[0].recording.position)).toEqual([0.1, 0.01, 0.2, 0.02]);
  });
});

describe("dataset reading: zip, CSV and many files", () => {
  it("a zip of Parquet files is one episode per file, ids from the file names, in name order", async () => {
    const one = new Uint8Array(
      parquetWriteBuffer({
        columnData: [
          { name: "t", data: new Float64Array([0, 0.1]), type: "DOUBLE" },
          { name: "lift", data: new Float64Array([0, 0.01]), type: "DOUBLE" },
          { name: "grip", data: new Float64Array([0, 0]), type: "DOUBLE" },
        ],
      }),
    );
    const zip = zipSync({
      "data/episode_002.parquet": one,
      "data/episode_001.parquet": one,
      "README.txt": strToU8("notes"),
      "__MACOSX/data/._x.parquet": strToU8("x"),
    });
    const result = await readDataset(armOf(), [file("set.zip", zip)]);
    expect(result.problems).toEqual([]);
    expect(result.episodes.map((e) => e.id)).toEqual(["episode_001", "episode_002"]);
    expect(result.files.map((f) => f.name)).toEqual(["data/episode_001.parquet", "data/episode_002.parquet"]);
  });

  it("a zip of recording CSV files reads each as an episode; a CSV with a bad value refuses with its line", async () => {
    const good = strToU8("t,lift,grip\n0,0,0.01\n0.1,0.01,0.01\n");
    const bad = strToU8("t,lift,grip\n0,0,0.01\n0.1,abc,0.01\n");
    const ok = await readDataset(armOf(), [file("set.zip", zipSync({ "a.csv": good, "b.csv": good }))]);
    expect(ok.problems).toEqual([]);
    expect(ok.episodes.map((e) => [e.id, e.recording.count])).toEqual([
      ["a", 2],
      ["b", 2],
    ]);
    const refused = await readDataset(armOf(), [file("set.zip", zipSync({ "a.csv": good, "b.csv": bad }))]);
    expect(refused.episodes).toEqual([]);
    expect(refused.problems).toEqual(['b.csv: line 3, column "lift": not a number ("abc")']);
  });

  it("episode ids from an episode column are prefixed with the file when there are several files", async () => {
    const result = await readDataset(armOf(), [file("a.parquet", scalarParquet()), file("b.parquet", scalarParquet())]);
    expect(result.problems).toEqual([]);
    expect(result.episodes.map((e) => e.id)).toEqual(["a/3", "a/4", "b/3", "b/4"]);
  });

  it("bytes that are neither Parquet nor zip are refused with the file's name", async () => {
    const result = await readDataset(armOf(), [file("x.parquet", strToU8("not parquet at all"))]);
    expect(result.problems[0]).toMatch(/^x\.parquet: not a readable Parquet file/);
  });
});
