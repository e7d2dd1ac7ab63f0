/**
 * The command-line checker: `jointproof check PLAN.json`, `jointproof scan LOG.csv --arm ARM` and
 * `jointproof verify EXPORT`, with the arm-model commands (arm-commands.ts) and the dataset audit
 * (audit-command.ts). A thin wrapper over kinematics/: Node file I/O here, everything else in the engine.
 * Readable output counts moves from 1 (the engine's `moveLabel`); JSON output keeps 0-based indexes.
 *
 * Exit codes: 0 pass or caution, 1 fault, 2 input that is not a valid document (one `path: message`
 * line per problem on stderr) or a usage error.
 */
import { readFileSync, writeFileSync } from "node:fs";
import {
  check,
  describeRecordingProblem,
  formatProblem,
  formatRecordingCsv,
  parsePlan,
  type Arm,
  type InputProblem,
  type PathSegment,
  type Report,
  type Verdict,
  repairStream,
  scanRecording,
  streamCheck,
  type StreamReport,
  formatNumber,
  formatQuantity,
  moveNumber,
} from "../kinematics";
import { ArmFileError, readArmFile } from "./arm-file";
import { armUsage, isArmCommand, runArmCommand } from "./arm-commands";
import { auditUsage, isAuditCommand, runAuditCommand } from "./audit-command";
import {
  hasExportBlock,
  planOfExport,
  recordedVerdict,
  verifyExport,
  verifyJsonChecksum,
} from "../lib/shared/export-format";
import { formatTable } from "./table";

/** Where the command writes; replaced in tests only by the real process streams. */
interface Io {
  out: (text: string) => void;
  err: (text: string) => void;
}

const processIo: Io = {
  out: (text) => process.stdout.write(text),
  err: (text) => process.stderr.write(text),
};

const commandsUsage = `  jointproof check PLAN.json [--json]          check a plan document ("-" reads stdin)
  jointproof scan LOG.csv --arm ARM [--control-rate HZ] [--json] [--repair OUT.csv] [--resample HZ]
                                               stream check of a recording (header t,<joint names>);
                                               --repair writes a rate-limited log that passes;
                                               ARM: a plan document or an arm JSON, or a URDF or an arm
                                               description with --control-rate (they carry no rate)
  jointproof verify EXPORT.json|EXPORT.csv [--json]
                                               checks an export's SHA-256 only (no engine check)
`;

const closingUsage = `
Moves are counted from 1 ("Move 1" is the first move) and recordings are named by the file's line
(the header is line 1); JSON output keeps 0-based indexes and paths (move: 0, moves[0]).
Angles are in radians, the gripper in metres in files and in millimetres in messages.

Exit codes: 0 pass or caution (ik: reachable), 1 fault (ik: unreachable; check: an export whose
recorded verdict differs), 2 invalid input or usage (audit: also an episode that could not be checked).

A passing check predicts no controller fault from the arm model; it does not make a motion safe.
Clamp the arm, clear the workspace, keep the emergency stop at hand and run new plans slowly first.
`;

/** The whole help: every command, then numbering and units, then the exit codes and the caution. */
const usage = `Usage:\n${commandsUsage}${armUsage}${auditUsage}${closingUsage}`;

/** Thrown for problems with the input; turned into stderr lines and exit code 2. */
class InputError extends Error {
  constructor(readonly lines: string[]) {
    super(lines.join("\n"));
  }
}

/** Parsed command-line options. */
interface Args {
  command: string | undefined;
  positional: string[];
  json: boolean;
  arm?: string;
  repair?: string;
  resampleHz?: number;
  controlRateHz?: number;
}

function parseArgs(argv: string[]): Args {
  const args: Args = { command: undefined, positional: [], json: false };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    const value = () => {
      const next = argv[++i];
      if (next === undefined) throw new InputError([`${arg}: needs a value`]);
      return next;
    };
    if (arg === "--json") args.json = true;
    else if (arg === "--arm") args.arm = value();
    else if (arg === "--repair") args.repair = value();
    else if (arg === "--resample") {
      const text = value();
      const hz = Number(text);
      if (!(hz > 0) || !Number.isFinite(hz))
        throw new InputError([`--resample: must be a rate in Hz greater than 0 (got "${text}")`]);
      args.resampleHz = hz;
    } else if (arg === "--control-rate") {
      const text = value();
      const hz = Number(text);
      if (!(hz > 0) || !Number.isFinite(hz))
        throw new InputError([`--control-rate: must be a rate in Hz greater than 0 (got "${text}")`]);
      args.controlRateHz = hz;
    } else if (arg === "-h" || arg === "--help") args.command = "help";
    else if (arg.startsWith("--")) throw new InputError([`${arg}: unknown option`]);
    else if (args.command === undefined) args.command = arg;
    else args.positional.push(arg);
  }
  return args;
}

/** Reads a file, or stdin for "-". */
function readInput(path: string): Buffer {
  try {
    return readFileSync(path === "-" ? 0 : path);
  } catch (error) {
    const reason =
      error instanceof Error && "code" in error && error.code === "ENOENT"
        ? "no such file (check the path)"
        : "cannot be read (check that it is a file you may read)";
    throw new InputError([`${path === "-" ? "(stdin)" : path}: ${reason}`]);
  }
}

/** Reads and parses a JSON file. */
function readJson(path: string): unknown {
  return parseJson(readInput(path), path);
}

/** Parses JSON bytes read from `path`. */
function parseJson(bytes: Buffer, path: string): unknown {
  const text = bytes.toString("utf8");
  try {
    return JSON.parse(text);
  } catch (error) {
    throw new InputError([
      `${path === "-" ? "(stdin)" : path}: not valid JSON (${error instanceof Error ? error.message : String(error)})`,
    ]);
  }
}

/** One `path: message` line per problem, each path under `prefix` (e.g. `["arm"]`). */
function problemLines(problems: InputProblem[], prefix: PathSegment[] = []): string[] {
  return problems.map((p) => formatProblem({ path: [...prefix, ...p.path], message: p.message }));
}

function exitCodeOf(verdict: Verdict): number {
  return verdict === "fault" ? 1 : 0;
}

function verdictWord(verdict: Verdict | "caution" | "fault"): string {
  return verdict.toUpperCase();
}

/** The readable table for `check`: moves counted from 1, joints by name. */
function formatReport(report: Report, arm: Arm): string {
  const faults = report.findings.filter((f) => f.severity === "fault").length;
  const cautions = report.findings.length - faults;
  const lines = [
    `Plan check for arm "${arm.name}" (${arm.joints.length} joints, control rate ${formatNumber(arm.controlRateHz)} Hz)`,
    `Verdict: ${verdictWord(report.verdict)}  (${faults} fault${faults === 1 ? "" : "s"}, ${cautions} caution${cautions === 1 ? "" : "s"})`,
    "",
  ];
  const moveRows = report.moves.map((move) => {
    const result = move.findings.some((f) => f.severity === "fault")
      ? "fault"
      : move.findings.length > 0
        ? "caution"
        : "pass";
    const duration = move.duration === 0 ? "instant" : `${move.duration.toFixed(3)} s`;
    // null: a fault that no duration fixes (travel, clearance, gravity alone above an effort limit)
    const shortest = move.minSafeDuration === null ? "none" : `${move.minSafeDuration.toFixed(3)} s`;
    return [String(moveNumber(move.index)), move.shape, duration, shortest, result];
  });
  lines.push(
    ...formatTable(
      [["move", "shape", "duration", "shortest safe", "result"], ...moveRows],
      ["right", "left", "right", "right", "left"],
      "  ",
    ),
  );
  lines.push("");
  if (report.findings.length === 0) lines.push("No findings.");
  else {
    lines.push("Findings:");
    const rows = report.findings.map((f) => [
      f.severity,
      f.kind,
      f.move === null ? "start" : String(moveNumber(f.move)),
      f.joint === null ? "-" : (arm.joints[f.joint]?.name ?? "-"),
      f.message,
    ]);
    lines.push(...formatTable([["severity", "kind", "move", "joint", "message"], ...rows], [], "  "));
  }
  return lines.join("\n") + "\n";
}

async function runCheck(args: Args, io: Io): Promise<number> {
  const [file, ...rest] = args.positional;
  if (!file || rest.length > 0) throw new InputError(["check: needs exactly one plan file (or - for stdin)"]);
  const document = readJson(file);
  // An export (a plan document with an `export` block) is trusted only once its checksum matches.
  const exported = hasExportBlock(document) ? document : null;
  let verifiedLine = "";
  if (exported) {
    const checksum = await verifyJsonChecksum(exported);
    if (!checksum.ok) throw new InputError([checksum.problem]);
    verifiedLine = `Export checksum verified: export.sha256 ${checksum.digest} matches the content.\n`;
  }
  const parsed = parsePlan(exported ? planOfExport(exported) : document);
  if (!parsed.ok) throw new InputError(problemLines(parsed.problems));
  const report = check(parsed.value);
  const recorded = exported ? recordedVerdict(exported) : null;
  const disagrees = recorded !== null && recorded !== report.verdict;
  let verdictLine = "";
  if (recorded !== null) {
    verdictLine = disagrees
      ? `Verdict disagrees with the export: it records ${recorded.toUpperCase()}, this check finds ${verdictWord(report.verdict)}. ` +
        "The engine or the arm model has changed since the export; re-check the plan and export it again before running it.\n"
      : `Verdict agrees with the export: ${verdictWord(report.verdict)}.\n`;
  } else if (exported) {
    verdictLine = "The export records no verdict to compare with.\n";
  }
  if (args.json) {
    // stdout carries the report and nothing else; the export lines go to stderr
    io.out(JSON.stringify(report, null, 2) + "\n");
    io.err(verifiedLine + verdictLine);
  } else {
    io.out(verifiedLine + verdictLine + (verifiedLine ? "\n" : "") + formatReport(report, parsed.value.arm));
  }
  return disagrees ? 1 : exitCodeOf(report.verdict);
}

/** `verify`: checksum-only verification of a JSON or CSV export. */
async function runVerify(args: Args, io: Io): Promise<number> {
  const [file, ...rest] = args.positional;
  if (!file || rest.length > 0)
    throw new InputError(["verify: needs exactly one export file (JSON or CSV, or - for stdin)"]);
  const result = await verifyExport(readInput(file));
  if (!result.ok)
    throw new InputError([
      result.problem.startsWith("not valid JSON")
        ? `${file === "-" ? "(stdin)" : file}: ${result.problem}`
        : result.problem,
    ]);
  const format = result.format;
  const where = format === "json" ? "export.sha256" : "# sha256 (last line)";
  if (args.json) io.out(JSON.stringify({ format, verified: true, sha256: result.digest }) + "\n");
  else io.out(`Export checksum verified (${format.toUpperCase()}): ${where} ${result.digest} matches the content.\n`);
  return 0;
}

/**
 * Reads the arm for `scan`. A stream check compares each step with what a joint can travel in one
 * control period, so a URDF or an arm description (which carry no control rate) needs --control-rate.
 */
function readScanArm(path: string, controlRateHz: number | undefined): Arm {
  const { arm, source } = readArmFile(path, { controlRateHz, forCheck: true });
  if ((source === "urdf" || source === "description") && controlRateHz === undefined)
    throw new InputError([
      `--control-rate: is required with ${source === "urdf" ? "a URDF" : "an arm description"} (${path} carries no control rate; the stream check needs the controller's rate in Hz)`,
    ]);
  if (
    controlRateHz !== undefined &&
    source !== "urdf" &&
    source !== "description" &&
    controlRateHz !== arm.controlRateHz
  )
    throw new InputError([
      `--control-rate: ${formatNumber(controlRateHz)} Hz differs from the arm's own ${formatNumber(arm.controlRateHz)} Hz in ${path}; leave the option out or make the two agree`,
    ]);
  return arm;
}

/** The readable summary for `scan`. */
function formatStreamReport(report: StreamReport, arm: Arm, limit = 50): string {
  const faults = report.findings.filter((f) => f.severity === "fault").length;
  const cautions = report.findings.length - faults;
  const lines = [
    `Stream check for arm "${arm.name}": ${report.samples} samples at ${formatNumber(report.rateHz)} Hz (mean), control rate ${formatNumber(arm.controlRateHz)} Hz`,
    `Verdict: ${verdictWord(report.verdict)}  (${faults} fault${faults === 1 ? "" : "s"}, ${cautions} caution${cautions === 1 ? "" : "s"})`,
  ];
  if (report.findings.length > 0) {
    lines.push("", "Findings:");
    const rows = report.findings
      .slice(0, limit)
      .map((f) => [
        f.severity,
        f.kind,
        arm.joints[f.joint]?.name ?? "-",
        f.line === f.endLine ? String(f.line) : `${f.line}–${f.endLine}`,
        f.message,
      ]);
    lines.push(...formatTable([["severity", "kind", "joint", "lines", "message"], ...rows], [], "  "));
    if (report.findings.length > limit)
      lines.push(`  … and ${report.findings.length - limit} more (use --json for all)`);
  }
  return lines.join("\n") + "\n";
}

function runScan(args: Args, io: Io): number {
  const [file, ...rest] = args.positional;
  if (!file || rest.length > 0) throw new InputError(["scan: needs exactly one recording file (CSV)"]);
  if (!args.arm) throw new InputError(["--arm: is required (a plan document, an arm JSON or a URDF)"]);
  const arm = readScanArm(args.arm, args.controlRateHz);
  const scanned = scanRecording(arm, readInput(file));
  if ("problems" in scanned) throw new InputError(scanned.problems.map(describeRecordingProblem));
  const { recording, report } = scanned;

  let repairText = "";
  let repairJson: Record<string, unknown> | undefined;
  if (args.repair) {
    const repaired = repairStream(arm, recording, { resampleHz: args.resampleHz });
    const after = streamCheck(arm, repaired.recording);
    try {
      writeFileSync(args.repair, formatRecordingCsv(repaired.recording));
    } catch {
      throw new InputError([`${args.repair}: cannot be written`]);
    }
    repairJson = {
      file: args.repair,
      verdict: after.verdict,
      samples: after.samples,
      maxDeviation: repaired.maxDeviation,
      maxDeviationSample: repaired.maxDeviationSample,
    };
    const deviations = arm.joints
      .map((joint, j) => `${joint.name} ${formatQuantity(repaired.maxDeviation[j], joint, "position")}`)
      .join(", ");
    repairText = `\nRepaired log written to ${args.repair}: ${after.samples} samples, verdict ${verdictWord(after.verdict)}.\nLargest departure from the recording per joint: ${deviations}.\n`;
  }
  if (args.json) {
    const { verdict, samples, rateHz, findings } = report;
    io.out(
      JSON.stringify(
        repairJson
          ? { verdict, samples, rateHz, findings, repair: repairJson }
          : { verdict, samples, rateHz, findings },
        null,
        2,
      ) + "\n",
    );
  } else {
    io.out(formatStreamReport(report, arm) + repairText);
  }
  return exitCodeOf(report.verdict);
}

/** `check` and `verify` take no scan options: refused rather than ignored, so none seems to apply. */
function refuseScanOptions(args: Args): void {
  const given = [
    args.arm !== undefined && "--arm",
    args.repair !== undefined && "--repair",
    args.resampleHz !== undefined && "--resample",
    args.controlRateHz !== undefined && "--control-rate",
  ].filter((o): o is string => o !== false);
  if (given.length > 0)
    throw new InputError(
      given.map(
        (o) => `${o}: is an option of scan, not of ${args.command} (${args.command} reads everything from its file)`,
      ),
    );
}

/** Runs the command line; returns the exit code. */
export async function main(argv: string[], io: Io = processIo): Promise<number> {
  try {
    if (isArmCommand(argv[0])) return runArmCommand(argv, io); // arm import, fk, ik: own options
    if (isAuditCommand(argv[0])) return runAuditCommand(argv.slice(1), io); // dataset audit: own options
    const args = parseArgs(argv);
    if (args.command === "help") {
      io.out(usage);
      return 0;
    }
    if (args.command === "check" || args.command === "verify") refuseScanOptions(args);
    if (args.command === "check") return await runCheck(args, io);
    if (args.command === "scan") return runScan(args, io);
    if (args.command === "verify") return await runVerify(args, io);
    io.err(args.command === undefined ? usage : `${args.command}: unknown command\n${usage}`);
    return 2;
  } catch (error) {
    if (error instanceof InputError || error instanceof ArmFileError) {
      io.err(error.lines.map((line) => line + "\n").join(""));
      return 2;
    }
    throw error;
  }
}
