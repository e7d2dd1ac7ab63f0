/**
 * Reading a dataset of episodes: Parquet files (hyparquet), recording CSV files (`parseRecordingCsv`)
 * and `.zip` archives of either (fflate), mapped to episodes by a column mapping. Pure: the caller
 * hands over the files' bytes (the command line walks folders, the server reads object storage).
 *
 * The mapping's defaults cover the common case:
 * - episode: column `episode` if present, else one episode per file (the file's name as its id);
 * - time: column `t` (seconds) if present; else, with a rate, frame index / rate, the frame index
 *   taken from a column `frame_index` or `frame` when there is one and from the row's place in its
 *   episode otherwise;
 * - joints: one column per arm joint, named like the joint, or one list column holding every joint in
 *   the arm's order, chosen by name; numbers of any Parquet numeric type, float32 and float64 read
 *   exactly (a float32 widens to a double without rounding).
 * What cannot be mapped is refused with the file's columns and types and the option to set.
 *
 * @module
 */
import {
  parquetMetadata,
  parquetMetadataAsync,
  parquetRead,
  parquetSchema,
  type AsyncBuffer,
  type FileMetaData,
} from "hyparquet";
import { unzipSync } from "fflate";
import type { Arm } from "../plan/arm";
import { describeRecordingProblem, parseRecordingCsv } from "./csv";
import type { Episode } from "./timed-replay";

/** Where a dataset's data is. Every field is optional; see the module comment for the defaults. */
export interface ColumnMapping {
  /** Column holding the episode id (default `episode` when present, else one episode per file). */
  episodeColumn?: string;
  /** Column holding time in seconds (default `t`). */
  timeColumn?: string;
  /** Frame rate (Hz) when there is no time column: time = frame index / rate. */
  rateHz?: number;
  /** One column per arm joint, in the arm's joint order. */
  jointColumns?: string[];
  /** One list column holding every joint, in the arm's order. */
  jointsColumn?: string;
}

/** One input file: its name (a relative path) and its bytes. */
export interface DatasetFile {
  name: string;
  bytes: Uint8Array;
}

/** A column of a file and its type as people read it (`DOUBLE`, `FLOAT`, `INT64`, `STRING`, `list<FLOAT>`). */
export interface ColumnInfo {
  name: string;
  type: string;
}

/**
 * The columns of an episode's file that the mapping does not take (kept for the export): their
 * names and types, and per column the value of each frame (`null` where a file lacks the column).
 * Numbers keep their stored type (INT64 as bigint), text stays text.
 */
export interface OtherColumns {
  columns: ColumnInfo[];
  /** values[c][k]: column c at frame k. */
  values: unknown[][];
}

/** An episode as read from a dataset, with its unmapped columns when they were asked for. */
export interface DatasetEpisode extends Episode {
  other?: OtherColumns;
}

/** Options for {@link readDataset}. */
export interface ReadOptions {
  /** Also read every column the mapping does not take, into each episode's `other`. */
  keepColumns?: boolean;
}

/** What {@link readDataset} returns: the episodes, or refusal lines when any file cannot be mapped. */
export interface DatasetReadResult {
  episodes: DatasetEpisode[];
  /** Refusal lines (empty when every file was mapped); with any, `episodes` is empty. */
  problems: string[];
  /** The files read, in order, with their columns. */
  files: { name: string; rows: number; columns: ColumnInfo[] }[];
}

/** The mapping option names, as the command line spells them (the product's form uses the same words). */
const optionNames = {
  episodeColumn: "--episode-column",
  timeColumn: "--time-column",
  rateHz: "--rate",
  jointColumns: "--joint-columns",
  jointsColumn: "--joints-column",
} as const;

/** True for a name the dataset readers take: `.parquet` or `.csv`, not hidden, not archive metadata. */
export function isDatasetFileName(name: string): boolean {
  const base = name.split("/").pop() ?? name;
  if (base.startsWith(".") || name.startsWith("__MACOSX/")) return false;
  return /\.(parquet|csv)$/i.test(base);
}

/** True when the bytes start like a zip archive (local file header "PK\x03\x04", or an empty archive). */
export function isZip(bytes: Uint8Array): boolean {
  return (
    bytes.length >= 4 &&
    bytes[0] === 0x50 &&
    bytes[1] === 0x4b &&
    (bytes[2] === 3 || bytes[2] === 5) &&
    (bytes[3] === 4 || bytes[3] === 6)
  );
}

/** The Parquet and CSV files of a zip archive, sorted by name. Throws on an archive that is not valid. */
export function unzipDataset(bytes: Uint8Array): DatasetFile[] {
  const entries = unzipSync(bytes, { filter: (file) => isDatasetFileName(file.name) });
  return Object.entries(entries)
    .map(([name, data]) => ({ name, bytes: data }))
    .sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
}

/** A file's name without folders and extension (`data/episode_000.parquet` → `episode_000`). */
function stem(name: string): string {
  const base = name.split("/").pop() ?? name;
  return base.replace(/\.(parquet|csv)$/i, "");
}

interface SchemaNode {
  element: {
    name: string;
    type?: string;
    converted_type?: string;
    logical_type?: { type: string };
    repetition_type?: string;
  };
  children: SchemaNode[];
}

/** The type of a top-level Parquet column as people read it. */
function typeOf(node: SchemaNode): string {
  const e = node.element;
  if (node.children.length === 0) {
    if (e.logical_type?.type === "STRING" || e.converted_type === "UTF8") return "STRING";
    if (e.logical_type?.type === "FLOAT16") return "FLOAT16";
    return e.type ?? "unknown";
  }
  const isList = e.converted_type === "LIST" || e.logical_type?.type === "LIST";
  if (isList) {
    // three-level list: <name> (LIST) → repeated group → element; two-level: <name> → repeated leaf
    let leaf = node.children[0];
    while (leaf && leaf.children.length === 1) leaf = leaf.children[0];
    return `list<${leaf && leaf.children.length === 0 ? typeOf(leaf) : "group"}>`;
  }
  return "group";
}

const numericTypes = new Set(["DOUBLE", "FLOAT", "INT32", "INT64"]);

/** A decoded value as a double: numbers as they are, bigints converted, anything else (null, text) NaN. */
function toDouble(value: unknown): number {
  if (typeof value === "number") return value;
  if (typeof value === "bigint") return Number(value);
  return Number.NaN;
}

/** The bytes as an ArrayBuffer of their own (no copy when they already fill one). */
function arrayBufferOf(bytes: Uint8Array): ArrayBuffer {
  if (bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer)
    return bytes.buffer;
  return bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
}

/** The columns of a Parquet file, with its row count. Throws when the bytes are not a Parquet file. */
export function parquetColumns(bytes: Uint8Array): { rows: number; columns: ColumnInfo[] } {
  return columnsOfMetadata(parquetMetadata(arrayBufferOf(bytes)));
}

function columnsOfMetadata(metadata: FileMetaData): { rows: number; columns: ColumnInfo[] } {
  const tree = parquetSchema(metadata) as unknown as SchemaNode;
  return {
    rows: Number(metadata.num_rows),
    columns: tree.children.map((c) => ({ name: c.element.name, type: typeOf(c) })),
  };
}

/** Columns and types as one list for refusal messages: `t (DOUBLE), state (list<FLOAT>)`. */
function columnList(columns: ColumnInfo[]): string {
  return columns.length === 0 ? "(none)" : columns.map((c) => `${c.name} (${c.type})`).join(", ");
}

/** Which columns the mapping needs from a file with these columns, or the refusal lines. */
function planColumns(
  arm: Arm,
  fileName: string,
  columns: ColumnInfo[],
  mapping: ColumnMapping,
  timeFromRows: boolean,
): {
  episode: string | null;
  time: string | null;
  frame: string | null;
  joints: string[] | null;
  list: string | null;
  problems: string[];
} {
  const byName = new Map(columns.map((c) => [c.name, c]));
  const problems: string[] = [];
  const listed = `Its columns: ${columnList(columns)}.`;
  const refuse = (what: string, option: string) => problems.push(`${fileName}: ${what}. ${listed} ${option}`);

  let episode: string | null = null;
  if (mapping.episodeColumn !== undefined) {
    if (!byName.has(mapping.episodeColumn))
      refuse(
        `has no episode column "${mapping.episodeColumn}"`,
        `Set ${optionNames.episodeColumn} to one of its columns, or leave it out for one episode per file.`,
      );
    else episode = mapping.episodeColumn;
  } else if (byName.has("episode")) episode = "episode";

  let time: string | null = null;
  let frame: string | null = null;
  if (mapping.timeColumn !== undefined) {
    const c = byName.get(mapping.timeColumn);
    if (!c)
      refuse(
        `has no time column "${mapping.timeColumn}"`,
        `Set ${optionNames.timeColumn} to its time column (seconds), or ${optionNames.rateHz} HZ to count frames.`,
      );
    else if (!numericTypes.has(c.type))
      refuse(
        `time column "${c.name}" is ${c.type}, not a number`,
        `Set ${optionNames.timeColumn} to a numeric column (seconds).`,
      );
    else time = c.name;
  } else if (byName.has("t") && mapping.rateHz === undefined) {
    const c = byName.get("t")!;
    if (!numericTypes.has(c.type))
      refuse(
        `time column "t" is ${c.type}, not a number`,
        `Set ${optionNames.timeColumn} to a numeric column (seconds), or ${optionNames.rateHz} HZ.`,
      );
    else time = "t";
  } else if (mapping.rateHz !== undefined) {
    if (!timeFromRows) {
      frame =
        ["frame_index", "frame"].find((name) => byName.has(name) && numericTypes.has(byName.get(name)!.type)) ?? null;
    }
  } else {
    refuse(
      'has no time column "t"',
      `Set ${optionNames.timeColumn} to its time column (seconds), or ${optionNames.rateHz} HZ to take time from the frame index.`,
    );
  }

  let joints: string[] | null = null;
  let list: string | null = null;
  const armNames = arm.joints.map((j) => j.name);
  if (mapping.jointsColumn !== undefined) {
    const c = byName.get(mapping.jointsColumn);
    if (!c)
      refuse(
        `has no joints column "${mapping.jointsColumn}"`,
        `Set ${optionNames.jointsColumn} to its list column holding all joints.`,
      );
    else if (!/^list<(DOUBLE|FLOAT|INT32|INT64)>$/.test(c.type))
      refuse(
        `joints column "${c.name}" is ${c.type}, not a list of numbers`,
        `Set ${optionNames.jointsColumn} to a list column of numbers, or ${optionNames.jointColumns} A,B,… for one column per joint.`,
      );
    else list = c.name;
  } else {
    const names = mapping.jointColumns ?? armNames;
    if (mapping.jointColumns && names.length !== armNames.length) {
      problems.push(
        `${fileName}: ${optionNames.jointColumns} names ${names.length} columns; the arm "${arm.name}" has ${armNames.length} joints (${armNames.join(", ")}).`,
      );
    }
    const missing = names.filter((name) => !byName.has(name));
    const wrong = names.filter((name) => byName.has(name) && !numericTypes.has(byName.get(name)!.type));
    if (missing.length > 0) {
      refuse(
        mapping.jointColumns
          ? `has no column ${missing.map((m) => `"${m}"`).join(", ")}`
          : `has no column named like the arm's joint${missing.length === 1 ? "" : "s"} ${missing.map((m) => `"${m}"`).join(", ")}`,
        `Set ${optionNames.jointsColumn} NAME for a list column holding all joints, or ${optionNames.jointColumns} A,B,… naming one column per joint in the arm's order (${armNames.join(", ")}).`,
      );
    } else if (wrong.length > 0) {
      refuse(
        `joint column${wrong.length === 1 ? "" : "s"} ${wrong.map((w) => `"${w}" (${byName.get(w)!.type})`).join(", ")} not numbers`,
        `Set ${optionNames.jointColumns} to numeric columns.`,
      );
    } else joints = names;
  }
  return { episode, time, frame, joints, list, problems };
}

/**
 * Column data of one Parquet file, assembled from hyparquet's chunks: numeric columns into one
 * Float64Array each (nulls become NaN; float32 widens exactly), others into arrays.
 */
async function readParquetColumns(
  bytes: Uint8Array | AsyncBuffer,
  columns: ColumnInfo[],
  rows: number,
  range: { rowStart: number; metadata?: FileMetaData; raw?: ReadonlySet<string> } = { rowStart: 0 },
): Promise<Map<string, Float64Array | unknown[]>> {
  const buffer = bytes instanceof Uint8Array ? arrayBufferOf(bytes) : bytes;
  const offset = range.rowStart; // out[i] holds the file's row offset + i
  const out = new Map<string, Float64Array | unknown[]>();
  for (const c of columns)
    out.set(
      c.name,
      numericTypes.has(c.type) && !range.raw?.has(c.name)
        ? new Float64Array(rows).fill(Number.NaN)
        : new Array<unknown>(rows).fill(null),
    );
  // The codecs load on first use, so pages that never read Parquet never instantiate their WebAssembly.
  const { compressors } = await import("hyparquet-compressors");
  await parquetRead({
    file: buffer,
    metadata: range.metadata,
    columns: columns.map((c) => c.name),
    rowStart: offset,
    rowEnd: offset + rows,
    // every Parquet codec (gzip, zstd, brotli, lz4, snappy), not only hyparquet's built-in snappy
    compressors,
    onChunk: ({ columnName, columnData, rowStart: chunkStart }) => {
      const column = out.get(columnName);
      if (!column) return;
      // a chunk may start before the range and run past it (whole pages): keep the rows inside
      const skip = Math.max(0, offset - chunkStart);
      const at = chunkStart + skip - offset;
      const length = Math.min(columnData.length - skip, rows - at);
      if (length <= 0) return;
      if (column instanceof Float64Array) {
        if (
          columnData instanceof Float64Array ||
          columnData instanceof Float32Array ||
          columnData instanceof Int32Array
        ) {
          column.set(columnData.subarray(skip, skip + length), at);
        } else {
          for (let i = 0; i < length; i++) column[at + i] = toDouble(columnData[skip + i]);
        }
      } else {
        for (let i = 0; i < length; i++) column[at + i] = columnData[skip + i];
      }
    },
  });
  return out;
}

/** The rows of one episode: a contiguous range `start`..`end` (exclusive), or a list when its rows are scattered. */
interface RowGroup {
  id: string;
  start: number;
  end: number;
  rows: number[] | null;
}

/** An episode value as an id. */
function idOf(v: unknown): string {
  return v === null || v === undefined ? "(none)" : typeof v === "object" ? JSON.stringify(v) : String(v);
}

/** Groups rows by episode value, in order of first appearance (contiguous runs need no row lists). */
function groupRows(values: ArrayLike<unknown> | null, rows: number): RowGroup[] {
  if (!values) return [{ id: "", start: 0, end: rows, rows: null }];
  const groups: RowGroup[] = [];
  const byId = new Map<string, RowGroup>();
  let scattered = false;
  let r = 0;
  while (r < rows) {
    const v = values[r];
    let end = r + 1;
    while (end < rows && values[end] === v) end++;
    const id = idOf(v);
    const seen = byId.get(id);
    if (seen) scattered = true;
    else {
      const group = { id, start: r, end, rows: null };
      byId.set(id, group);
      groups.push(group);
    }
    r = end;
  }
  if (!scattered) return groups;
  // an episode's rows come in more than one run: list them (file order kept within the episode)
  for (const g of groups) g.rows = [];
  for (let i = 0; i < rows; i++) byId.get(idOf(values[i]))!.rows!.push(i);
  return groups;
}

/** The columns a mapping takes from one file. */
interface ColumnPlan {
  episode: string | null;
  time: string | null;
  frame: string | null;
  joints: string[] | null;
  list: string | null;
}

/** Builds the episodes of one table: numeric columns as Float64Arrays, others as arrays of the file's rows. */
function episodesOf(
  arm: Arm,
  fileName: string,
  multiFile: boolean,
  rows: number,
  data: Map<string, Float64Array | unknown[]>,
  plan: ColumnPlan,
  rateHz: number | undefined,
  others: ColumnInfo[] = [],
): DatasetEpisode[] {
  const groups = groupRows(plan.episode ? data.get(plan.episode)! : null, rows);
  return episodesOfGroups(arm, fileName, multiFile, groups, 0, data, plan, rateHz, others);
}

/** Builds the episodes of the given row groups from column data holding the file's rows `offset`…. */
function episodesOfGroups(
  arm: Arm,
  fileName: string,
  multiFile: boolean,
  groups: RowGroup[],
  offset: number,
  data: Map<string, Float64Array | unknown[]>,
  plan: ColumnPlan,
  rateHz: number | undefined,
  others: ColumnInfo[] = [],
): DatasetEpisode[] {
  const n = arm.joints.length;
  const names = arm.joints.map((j) => j.name);
  const time = plan.time ? (data.get(plan.time) as Float64Array) : null;
  const frame = plan.frame ? (data.get(plan.frame) as Float64Array) : null;
  const list = plan.list ? (data.get(plan.list) as unknown[]) : null;
  const jointData = plan.joints ? plan.joints.map((name) => data.get(name) as Float64Array) : null;
  return groups.map((group) => {
    const count = group.rows ? group.rows.length : group.end - group.start;
    const rowAt = group.rows ? group.rows.map((r) => r - offset) : null;
    const first = group.start - offset;
    const timeS = new Float64Array(count);
    const position = new Float64Array(count * n);
    let jointCount = n;
    for (let i = 0; i < count; i++) {
      const r = rowAt ? rowAt[i] : first + i;
      timeS[i] = time ? time[r] : (frame ? frame[r] : i) / (rateHz as number); // frame index / rate
    }
    if (jointData) {
      for (let j = 0; j < n; j++) {
        const column = jointData[j];
        for (let i = 0; i < count; i++) position[i * n + j] = column[rowAt ? rowAt[i] : first + i];
      }
    } else if (list) {
      for (let i = 0; i < count; i++) {
        const values = list[rowAt ? rowAt[i] : first + i] as ArrayLike<unknown> | null | undefined;
        const length = values ? values.length : 0;
        if (length !== n) jointCount = length; // the wrong number of joints makes the episode invalid
        for (let j = 0; j < n; j++) position[i * n + j] = j < length ? toDouble(values![j]) : Number.NaN;
      }
    }
    const id = plan.episode ? (multiFile ? `${stem(fileName)}/${group.id}` : group.id) : stem(fileName);
    const episode: DatasetEpisode = {
      id,
      recording: { names, jointCount, count, timeS, position: jointCount === n ? position : new Float64Array(0) },
    };
    if (others.length > 0) {
      const values = others.map((c) => {
        const column = data.get(c.name)!;
        const out = new Array<unknown>(count);
        for (let i = 0; i < count; i++) out[i] = column[rowAt ? rowAt[i] : first + i];
        return out;
      });
      episode.other = { columns: others, values };
    }
    return episode;
  });
}

/** Reads one CSV recording file (header `t,<names>`) as episodes. */
function csvEpisodes(
  arm: Arm,
  file: DatasetFile,
  multiFile: boolean,
  mapping: ColumnMapping,
  keepColumns = false,
): { episodes: DatasetEpisode[]; columns: ColumnInfo[]; rows: number; problems: string[] } {
  const parsed = parseRecordingCsv(file.bytes);
  if (!parsed.recording) {
    const lines = parsed.problems.map((p) => `${file.name}: ${describeRecordingProblem(p)}`);
    if (mapping.rateHz !== undefined || mapping.timeColumn !== undefined) {
      lines.push(
        `${file.name}: a CSV file must start with a time column "t" in seconds; ${optionNames.timeColumn} and ${optionNames.rateHz} apply to Parquet files only.`,
      );
    }
    return { episodes: [], columns: [], rows: 0, problems: lines };
  }
  const r = parsed.recording;
  const columns: ColumnInfo[] = [{ name: "t", type: "DOUBLE" }, ...r.names.map((name) => ({ name, type: "DOUBLE" }))];
  const data = new Map<string, Float64Array | unknown[]>();
  data.set("t", r.timeS);
  r.names.forEach((name, c) => {
    const column = new Float64Array(r.count);
    for (let k = 0; k < r.count; k++) column[k] = r.position[k * r.jointCount + c];
    data.set(name, column);
  });
  const plan = planColumns(
    arm,
    file.name,
    columns,
    { ...mapping, timeColumn: mapping.timeColumn ?? "t", rateHz: undefined },
    false,
  );
  if (plan.problems.length > 0) return { episodes: [], columns, rows: r.count, problems: plan.problems };
  const taken = new Set(["t", ...(plan.joints ?? [])]);
  const others = keepColumns ? columns.filter((c) => !taken.has(c.name)) : [];
  return {
    episodes: episodesOf(arm, file.name, multiFile, r.count, data, plan, undefined, others),
    columns,
    rows: r.count,
    problems: [],
  };
}

/**
 * Reads a dataset's files (Parquet or CSV; a zip archive is unpacked first with {@link unzipDataset})
 * into episodes, in file order. Any file that cannot be read or mapped refuses the whole dataset with
 * lines naming the file, its columns and types and the option to set; episodes that can be read but
 * not audited (non-finite values, time not increasing, wrong joint count) are returned, and the audit
 * marks them invalid.
 */
export async function readDataset(
  arm: Arm,
  input: DatasetFile[],
  mapping: ColumnMapping = {},
  options: ReadOptions = {},
): Promise<DatasetReadResult> {
  const problems: string[] = [];
  const files: DatasetReadResult["files"] = [];
  const episodes: DatasetEpisode[] = [];
  if (mapping.rateHz !== undefined && !(mapping.rateHz > 0 && Number.isFinite(mapping.rateHz))) {
    return { episodes, files, problems: [`${optionNames.rateHz}: must be a frame rate in Hz greater than 0`] };
  }
  if (mapping.jointColumns && mapping.jointsColumn) {
    return {
      episodes,
      files,
      problems: [`${optionNames.jointColumns} and ${optionNames.jointsColumn}: set one or the other`],
    };
  }
  if (mapping.timeColumn && mapping.rateHz !== undefined) {
    return { episodes, files, problems: [`${optionNames.timeColumn} and ${optionNames.rateHz}: set one or the other`] };
  }
  const expanded: DatasetFile[] = [];
  for (const file of input) {
    if (isZip(file.bytes)) {
      try {
        const inner = unzipDataset(file.bytes);
        if (inner.length === 0) problems.push(`${file.name}: the archive holds no .parquet or .csv file`);
        expanded.push(...inner);
      } catch (error) {
        problems.push(
          `${file.name}: not a readable zip archive (${error instanceof Error ? error.message : String(error)})`,
        );
      }
    } else expanded.push(file);
  }
  if (expanded.length === 0 && problems.length === 0) problems.push("the dataset holds no .parquet or .csv file");
  const multiFile = expanded.length > 1;
  const seen = new Set<string>();
  for (const file of expanded) {
    let fileEpisodes: DatasetEpisode[] = [];
    if (/\.csv$/i.test(file.name)) {
      const read = csvEpisodes(arm, file, multiFile, mapping, options.keepColumns);
      files.push({ name: file.name, rows: read.rows, columns: read.columns });
      problems.push(...read.problems);
      fileEpisodes = read.episodes;
    } else {
      let info: { rows: number; columns: ColumnInfo[] };
      try {
        info = parquetColumns(file.bytes);
      } catch (error) {
        problems.push(
          `${file.name}: not a readable Parquet file (${error instanceof Error ? error.message : String(error)})`,
        );
        continue;
      }
      files.push({ name: file.name, ...info });
      const plan = planColumns(arm, file.name, info.columns, mapping, false);
      if (plan.problems.length > 0) {
        problems.push(...plan.problems);
        continue;
      }
      const needed = new Set(
        [plan.episode, plan.time, plan.frame, plan.list, ...(plan.joints ?? [])].filter((c): c is string => c !== null),
      );
      // unmapped columns, read as stored (no widening to double), when they are to be kept
      const others = options.keepColumns ? info.columns.filter((c) => !needed.has(c.name)) : [];
      let data: Map<string, Float64Array | unknown[]>;
      try {
        data = await readParquetColumns(
          file.bytes,
          info.columns.filter((c) => needed.has(c.name) || others.includes(c)),
          info.rows,
          { rowStart: 0, raw: new Set(others.map((c) => c.name)) },
        );
      } catch (error) {
        problems.push(`${file.name}: cannot be read (${error instanceof Error ? error.message : String(error)})`);
        continue;
      }
      fileEpisodes = episodesOf(arm, file.name, multiFile, info.rows, data, plan, mapping.rateHz, others);
    }
    for (const episode of fileEpisodes) {
      if (seen.has(episode.id)) problems.push(`${file.name}: episode id "${episode.id}" appears in more than one file`);
      seen.add(episode.id);
      episodes.push(episode);
    }
  }
  if (problems.length > 0) return { episodes: [], files, problems };
  return { episodes, files, problems };
}

/**
 * Where the episodes of one Parquet file are, for reading a few of them without the rest: the
 * file's metadata, the columns the mapping takes, and each episode's rows (from the episode column
 * alone). `problems` as {@link readDataset} gives them for this file; with any, nothing else is set.
 */
export interface ParquetEpisodeIndex {
  name: string;
  metadata: FileMetaData | null;
  plan: ColumnPlan | null;
  columns: ColumnInfo[];
  rows: number;
  /** Each episode's id and rows, in dataset order (the episode index is the place in this list). */
  episodes: RowGroup[];
  problems: string[];
}

/**
 * Indexes the episodes of one Parquet file read through `file` (an object with `byteLength` and
 * `slice(start, end)`, e.g. ranged reads from object storage): fetches the footer and the episode
 * column only. Ids are as {@link readDataset} gives them for a dataset of this one file.
 */
export async function indexParquetEpisodes(
  arm: Arm,
  name: string,
  file: AsyncBuffer,
  mapping: ColumnMapping = {},
): Promise<ParquetEpisodeIndex> {
  const empty = { name, metadata: null, plan: null, columns: [], rows: 0, episodes: [] };
  let metadata: FileMetaData;
  try {
    metadata = await parquetMetadataAsync(file);
  } catch (error) {
    return {
      ...empty,
      problems: [`${name}: not a readable Parquet file (${error instanceof Error ? error.message : String(error)})`],
    };
  }
  const info = columnsOfMetadata(metadata);
  const plan = planColumns(arm, name, info.columns, mapping, false);
  if (plan.problems.length > 0) return { ...empty, columns: info.columns, rows: info.rows, problems: plan.problems };
  const columnPlan: ColumnPlan = {
    episode: plan.episode,
    time: plan.time,
    frame: plan.frame,
    joints: plan.joints,
    list: plan.list,
  };
  let ids: ArrayLike<unknown> | null = null;
  if (columnPlan.episode) {
    const episodeColumn = info.columns.filter((c) => c.name === columnPlan.episode);
    const data = await readParquetColumns(file, episodeColumn, info.rows, { rowStart: 0, metadata });
    ids = data.get(columnPlan.episode)!;
  }
  const groups = groupRows(ids, info.rows).map((g) => (columnPlan.episode ? g : { ...g, id: stem(name) }));
  return { name, metadata, plan: columnPlan, columns: info.columns, rows: info.rows, episodes: groups, problems: [] };
}

/** Decoded mapped columns of row groups, by row-group number, kept by the caller between reads. */
export type RowGroupCache = Map<number, Promise<Map<string, Float64Array | unknown[]>>>;

/**
 * Reads episodes `first` … `first + count − 1` of an indexed Parquet file: the mapped columns of the
 * row groups that hold their rows only (hyparquet fetches those column chunks), each row group
 * decoded once while it stays in `cache` (the caller bounds it; a worker's next batch usually lies
 * in the same row group). The episodes equal what {@link readDataset} returns for them.
 */
export async function readParquetEpisodes(
  arm: Arm,
  file: AsyncBuffer,
  index: ParquetEpisodeIndex,
  first: number,
  count: number,
  mapping: ColumnMapping = {},
  cache: RowGroupCache = new Map(),
): Promise<Episode[]> {
  const { plan, metadata } = index;
  if (!plan || !metadata) throw new Error(index.problems[0] ?? `${index.name}: not indexed`);
  const wanted = index.episodes.slice(first, first + count);
  if (wanted.length === 0) return [];
  let lo = Infinity;
  let hi = -Infinity;
  for (const g of wanted) {
    if (g.rows) {
      for (const r of g.rows) {
        if (r < lo) lo = r;
        if (r + 1 > hi) hi = r + 1;
      }
    } else {
      lo = Math.min(lo, g.start);
      hi = Math.max(hi, g.end);
    }
  }
  const needed = new Set(
    [plan.time, plan.frame, plan.list, ...(plan.joints ?? [])].filter((c): c is string => c !== null),
  );
  const columns = index.columns.filter((c) => needed.has(c.name));
  // the row groups overlapping [lo, hi), each decoded whole (hyparquet decodes whole groups anyway)
  const parts: { start: number; data: Map<string, Float64Array | unknown[]> }[] = [];
  let groupStart = 0;
  for (let g = 0; g < metadata.row_groups.length; g++) {
    const rows = Number(metadata.row_groups[g].num_rows);
    const groupEnd = groupStart + rows;
    if (groupEnd > lo && groupStart < hi) {
      let pending = cache.get(g);
      if (!pending) {
        pending = readParquetColumns(file, columns, rows, { rowStart: groupStart, metadata });
        pending.catch(() => cache.delete(g));
        cache.set(g, pending);
      }
      parts.push({ start: groupStart, data: await pending });
    }
    groupStart = groupEnd;
  }
  let data: Map<string, Float64Array | unknown[]>;
  let offset: number;
  if (parts.length === 1) {
    data = parts[0].data;
    offset = parts[0].start;
  } else {
    // rows lo … hi − 1 copied from the groups that hold them
    offset = lo;
    data = new Map();
    for (const c of columns) {
      const numeric = parts[0]?.data.get(c.name) instanceof Float64Array;
      const out = numeric ? new Float64Array(hi - lo) : new Array<unknown>(hi - lo).fill(null);
      for (const part of parts) {
        const from = part.data.get(c.name)!;
        const a = Math.max(lo, part.start);
        const b = Math.min(hi, part.start + from.length);
        for (let r = a; r < b; r++) out[r - lo] = from[r - part.start];
      }
      data.set(c.name, out);
    }
  }
  // the ids come from the index, so the episode column is not read again
  return episodesOfGroups(arm, index.name, false, wanted, offset, data, { ...plan, episode: null }, mapping.rateHz).map(
    (episode, i) => ({ ...episode, id: wanted[i].id }),
  );
}
