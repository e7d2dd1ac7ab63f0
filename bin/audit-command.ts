/**
 * `jointproof audit DATASET --arm ARM [--json] [--episode-column NAME] [--time-column NAME | --rate HZ]
 *                  [--joint-columns A,B,… | --joints-column NAME]`
 * The timed-replay audit of every episode of a dataset: one Parquet file, a folder of Parquet or CSV
 * files, or a `.zip` of either. ARM is an arm JSON, a plan document or a URDF. Node file I/O here;
 * reading, mapping and the audit are in kinematics/recordings/.
 *
 * `--json` prints `{ episodes, summary, caution }`; the text output ends with the same caution.
 *
 * Exit codes: 0 when no episode faults and every episode could be audited, 1 when any episode faults,
 * 2 for unusable input (a file that cannot be read or mapped, a usage error) and when, without a fault,
 * some episode is invalid (it was not checked, so the dataset does not pass).
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative, sep } from "node:path";
import {
  armDescriptionSchema,
  armFromDescription,
  auditEpisodes,
  auditRank,
  auditToJson,
  describeIssues,
  episodeVerdicts,
  formatNumber,
  isDatasetFileName,
  parseArm,
  parseUrdf,
  readDataset,
  summarizeAudits,
  type Arm,
  type ColumnMapping,
  type DatasetFile,
  type EpisodeAudit,
} from "../kinematics";
import { SAFETY_POINTS, SAFETY_TEXT } from "../lib/shared/safety";
import { formatTable } from "./table";

/** Where the command writes (the same shape as the dispatcher's). */
export interface AuditIo {
  out: (text: string) => void;
  err: (text: string) => void;
}

/** Usage lines for `audit` (appended to the dispatcher's help). */
export const auditUsage = `  jointproof audit DATASET --arm ARM [--json] [--episode-column NAME] [--time-column NAME | --rate HZ]
                   [--joint-columns A,B,… | --joints-column NAME]
                                               timed-replay audit of every episode of a dataset (a Parquet file,
                                               a folder of Parquet or CSV files, or a .zip of either); exit 1 when
                                               any episode faults, 2 for unusable input or an invalid episode
`;

class AuditInputError extends Error {
  constructor(readonly lines: string[]) {
    super(lines.join("\n"));
  }
}

/** True for the command this module handles. */
export function isAuditCommand(command: string | undefined): boolean {
  return command === "audit";
}

interface AuditArgs {
  dataset: string;
  arm: string;
  json: boolean;
  mapping: ColumnMapping;
}

function parseAuditArgs(argv: string[]): AuditArgs {
  const positional: string[] = [];
  const mapping: ColumnMapping = {};
  let arm: string | undefined;
  let json = false;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = () => {
      const v = argv[++i];
      if (v === undefined || v.startsWith("--")) throw new AuditInputError([`${a}: needs a value`]);
      return v;
    };
    if (a === "--json") json = true;
    else if (a === "--arm") arm = value();
    else if (a === "--episode-column") mapping.episodeColumn = value();
    else if (a === "--time-column") mapping.timeColumn = value();
    else if (a === "--joints-column") mapping.jointsColumn = value();
    else if (a === "--joint-columns") {
      const text = value();
      const names = text.split(",").map((s) => s.trim());
      if (names.some((s) => s === ""))
        throw new AuditInputError([`--joint-columns: must be column names separated by commas (got "${text}")`]);
      mapping.jointColumns = names;
    } else if (a === "--rate") {
      const text = value();
      const hz = Number(text);
      if (!(hz > 0) || !Number.isFinite(hz))
        throw new AuditInputError([`--rate: must be a frame rate in Hz greater than 0 (got "${text}")`]);
      mapping.rateHz = hz;
    } else if (a.startsWith("--")) throw new AuditInputError([`${a}: unknown option`]);
    else positional.push(a);
  }
  if (positional.length !== 1)
    throw new AuditInputError(["audit: needs exactly one dataset (a Parquet file, a folder or a .zip)"]);
  if (!arm) throw new AuditInputError(["--arm: is required (an arm JSON, a plan document or a URDF)"]);
  if (mapping.timeColumn !== undefined && mapping.rateHz !== undefined)
    throw new AuditInputError(["--time-column and --rate: set one or the other"]);
  if (mapping.jointColumns && mapping.jointsColumn !== undefined)
    throw new AuditInputError(["--joint-columns and --joints-column: set one or the other"]);
  return { dataset: positional[0], arm, json, mapping };
}

function readBytes(path: string): Uint8Array {
  try {
    return readFileSync(path);
  } catch (error) {
    const reason =
      error instanceof Error && "code" in error && error.code === "ENOENT" ? "no such file" : "cannot be read";
    throw new AuditInputError([`${path}: ${reason}`]);
  }
}

/** Loads ARM: a URDF, a plan document (its `arm`), an arm description (joints with origins) or an arm object. */
function loadAuditArm(path: string): Arm {
  const text = Buffer.from(readBytes(path)).toString("utf8");
  if (/\.urdf$/i.test(path) || text.trimStart().startsWith("<")) {
    const r = parseUrdf(text);
    if (!r.ok) throw new AuditInputError(r.problems.map((p) => `${path}: ${p.element}: ${p.message}`));
    return armFromDescription(r.value);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    throw new AuditInputError([`${path}: not valid JSON (${error instanceof Error ? error.message : String(error)})`]);
  }
  const obj = (typeof raw === "object" && raw !== null ? raw : {}) as Record<string, unknown>;
  const isPlan = obj.format === "jointproof.plan";
  const candidate = isPlan ? obj.arm : raw;
  const prefix = isPlan ? "arm." : "";
  const c = (typeof candidate === "object" && candidate !== null ? candidate : {}) as Record<string, unknown>;
  const isDescription =
    Array.isArray(c.joints) &&
    c.joints.some((j) => typeof j === "object" && j !== null && "origin" in j) &&
    !("chain" in c);
  if (isDescription) {
    const d = armDescriptionSchema.safeParse(candidate);
    if (!d.success)
      throw new AuditInputError(describeIssues(d.error.issues).map((p) => `${path}: ${prefix}${p.path}: ${p.message}`));
    return armFromDescription(d.data);
  }
  const parsed = parseArm(candidate);
  if (!parsed.ok) throw new AuditInputError(parsed.problems.map((p) => `${path}: ${prefix}${p.path}: ${p.message}`));
  return parsed.value;
}

/** The dataset's files: the one file, or every .parquet/.csv under a folder (sorted, names relative to it). */
function datasetFiles(path: string): DatasetFile[] {
  let isDirectory: boolean;
  try {
    isDirectory = statSync(path).isDirectory();
  } catch {
    throw new AuditInputError([`${path}: no such file or folder`]);
  }
  if (!isDirectory) return [{ name: path.split(sep).pop() ?? path, bytes: readBytes(path) }];
  const found: string[] = [];
  const visit = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const full = join(dir, entry.name);
      if (entry.isDirectory()) {
        if (!entry.name.startsWith(".")) visit(full);
      } else if (isDatasetFileName(relative(path, full).split(sep).join("/"))) found.push(full);
    }
  };
  visit(path);
  found.sort();
  if (found.length === 0) throw new AuditInputError([`${path}: the folder holds no .parquet or .csv file`]);
  return found.map((full) => ({ name: relative(path, full).split(sep).join("/"), bytes: readBytes(full) }));
}

/** The readable summary: counts by verdict and kind, then the worst episodes and the invalid ones. */
function formatAudit(arm: Arm, audits: EpisodeAudit[], durations: Map<string, number>, limit = 10): string {
  const summary = summarizeAudits(audits);
  const frames = audits.reduce((sum, a) => sum + a.samples, 0);
  const lines = [
    `Timed-replay audit for arm "${arm.name}": ${summary.episodes} episode${summary.episodes === 1 ? "" : "s"}, ${frames} frames`,
    "",
    ...formatTable(
      [["verdict", "episodes"], ...episodeVerdicts.map((v) => [v.toUpperCase(), String(summary[v])])],
      ["left", "right"],
    ),
    "",
  ];
  const kinds = Object.entries(summary.byKind);
  lines.push(
    kinds.length === 0 ? "No findings." : `Findings by kind: ${kinds.map(([k, c]) => `${k} ${c}`).join(", ")}`,
  );
  const worst = audits
    .filter((a) => a.verdict === "fault" || a.verdict === "caution")
    .sort(
      (a, b) =>
        auditRank(b) - auditRank(a) ||
        b.findings.filter((f) => f.severity === "fault").length -
          a.findings.filter((f) => f.severity === "fault").length ||
        b.findings.length - a.findings.length,
    );
  if (worst.length > 0) {
    // every column as wide as its widest cell (bin/table.ts): a long episode name, frame count or
    // duration (a time column in nanoseconds read as seconds) never pushes the next column along
    const rows = worst.slice(0, limit).map((a) => {
      const first = a.findings.find((f) => f.severity === "fault") ?? a.findings[0];
      return [
        a.episode,
        a.verdict.toUpperCase(),
        String(a.samples),
        `${formatNumber(durations.get(a.episode) ?? 0)} s`,
        String(a.findings.length),
        first.message,
      ];
    });
    lines.push(
      "",
      "Worst episodes:",
      ...formatTable(
        [["episode", "verdict", "frames", "duration", "findings", "first finding"], ...rows],
        ["left", "left", "right", "right", "right", "left"],
        "  ",
      ),
    );
    if (worst.length > limit) lines.push(`  … and ${worst.length - limit} more (use --json for all)`);
  }
  const invalid = audits.filter((a) => a.verdict === "invalid");
  if (invalid.length > 0) {
    lines.push("", "Invalid episodes (not checked):");
    for (const a of invalid.slice(0, limit))
      lines.push(`  ${a.problems[0]}${a.problems.length > 1 ? ` (and ${a.problems.length - 1} more)` : ""}`);
    if (invalid.length > limit) lines.push(`  … and ${invalid.length - limit} more (use --json for all)`);
  }
  lines.push(
    "",
    "A passing audit predicts that the arm model can follow each episode frame by frame; it does not make a replay safe.",
    "Clamp the arm, clear the workspace, keep the emergency stop at hand and replay new episodes slowly first.",
    "Before replaying on hardware:",
    ...SAFETY_POINTS.map((point) => `  - ${point}`),
  );
  return lines.join("\n") + "\n";
}

/** Runs `audit` (argv without the command); returns the exit code. */
export async function runAuditCommand(argv: string[], io: AuditIo): Promise<number> {
  try {
    const args = parseAuditArgs(argv);
    const arm = loadAuditArm(args.arm);
    const files = datasetFiles(args.dataset);
    const read = await readDataset(arm, files, args.mapping);
    if (read.problems.length > 0) throw new AuditInputError(read.problems);
    if (read.episodes.length === 0) throw new AuditInputError([`${args.dataset}: holds no episode`]);
    const audits = auditEpisodes(arm, read.episodes);
    const summary = summarizeAudits(audits);
    if (args.json) {
      // the documented shape, then the safety caution: the output leaves the tool like an export
      io.out(JSON.stringify({ episodes: audits.map(auditToJson), summary, caution: SAFETY_TEXT }) + "\n");
    } else {
      const durations = new Map(
        read.episodes.map((e) => [
          e.id,
          e.recording.count > 1 ? e.recording.timeS[e.recording.count - 1] - e.recording.timeS[0] : 0,
        ]),
      );
      io.out(formatAudit(arm, audits, durations));
    }
    return summary.fault > 0 ? 1 : summary.invalid > 0 ? 2 : 0;
  } catch (error) {
    if (error instanceof AuditInputError) {
      io.err(error.lines.map((l) => l + "\n").join(""));
      return 2;
    }
    throw error;
  }
}
