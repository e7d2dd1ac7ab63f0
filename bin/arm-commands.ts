/**
 * Arm-model commands of the command-line checker:
 *   jointproof arm import FILE.urdf            the arm description as JSON
 *   jointproof fk ARM --pose q1,q2,…           tool pose in the base frame
 *   jointproof ik ARM --position x,y,z [--rpy r,p,y] [--seed q1,…]
 * ARM is a URDF file, a plan document, an `arm` object with a `chain`, or an arm description
 * (bin/arm-file.ts). `--help` after a command prints its usage. Node file I/O here; everything else
 * in kinematics/.
 *
 * Exit codes: 0 success (ik: reachable), 1 ik unreachable, 2 bad input or usage (one line per problem).
 */
import {
  chainLimits,
  compileChain,
  createChainBuffers,
  forwardKinematics,
  type CompiledChain,
  solveIk,
  rotationRows,
  parseUrdf,
} from "../kinematics";
import { ArmFileError, readArmFile, readArmText } from "./arm-file";

/** Where the commands write (the same shape as the dispatcher's). */
export interface ArmIo {
  out: (text: string) => void;
  err: (text: string) => void;
}

/** Usage lines of each arm-model command. */
const commandUsage = {
  arm: `  jointproof arm import FILE.urdf              print the arm description (joints in chain order, links, tool point) as JSON
`,
  fk: `  jointproof fk ARM --pose q1,q2,…             tool pose { position, rotation } in the base frame (metres);
                                               angles in radians, the gripper in metres, as in the plan document
`,
  ik: `  jointproof ik ARM --position x,y,z [--rpy r,p,y] [--seed q1,…]
                                               joint pose for a tool-point goal (metres, base frame):
                                               { pose, positionErrorM, reachable }, with --rpy also
                                               orientationErrorRad; exit 1 when unreachable
`,
};

/** Usage lines for the arm-model commands (the dispatcher's help lists them with the others). */
export const armUsage = `${commandUsage.arm}${commandUsage.fk}${commandUsage.ik}                                               ARM: a URDF, a plan document or an arm JSON
`;

class ArmInputError extends Error {
  constructor(readonly lines: string[]) {
    super(lines.join("\n"));
  }
}

/** True for the commands this module handles. */
export function isArmCommand(command: string | undefined): boolean {
  return command === "arm" || command === "fk" || command === "ik";
}

function urdfDescription(path: string, text: string) {
  const r = parseUrdf(text);
  if (!r.ok) throw new ArmInputError(r.problems.map((p) => `${path}: ${p.element}: ${p.message}`));
  return r.value;
}

interface LoadedArm {
  chain: CompiledChain;
  lower: Float64Array;
  upper: Float64Array;
  jointCount: number;
}

/** Loads ARM (URDF or JSON, see bin/arm-file.ts) and compiles its chain. */
function loadArm(path: string): LoadedArm {
  const { arm } = readArmFile(path);
  if (!arm.chain) throw new ArmInputError([`${path}: arm.chain: is required for fk and ik (the arm's geometry)`]);
  if (arm.chain.joints.length > arm.joints.length) {
    throw new ArmInputError([
      `${path}: arm.chain.joints: has ${arm.chain.joints.length} entries, more than the arm's ${arm.joints.length} joints`,
    ]);
  }
  const chain = compileChain(
    arm.chain,
    arm.joints.map((j) => j.type),
  );
  return { chain, ...chainLimits(arm.joints, chain.jointCount), jointCount: arm.joints.length };
}

function numberList(option: string, text: string | undefined, count?: number): number[] {
  if (text === undefined) throw new ArmInputError([`${option}: needs a value`]);
  const parts = text.split(",").map((s) => s.trim());
  const values = parts.map(Number);
  if (parts.some((p) => p === "") || values.some((v) => !Number.isFinite(v))) {
    throw new ArmInputError([`${option}: must be numbers separated by commas (got "${text}")`]);
  }
  if (count !== undefined && values.length !== count)
    throw new ArmInputError([`${option}: must have ${count} values (has ${values.length})`]);
  return values;
}

function options(argv: string[], allowed: string[]): { positional: string[]; values: Map<string, string> } {
  const positional: string[] = [];
  const values = new Map<string, string>();
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a.startsWith("--")) {
      if (!allowed.includes(a)) throw new ArmInputError([`${a}: unknown option`]);
      const v = argv[++i];
      if (v === undefined) throw new ArmInputError([`${a}: needs a value`]);
      values.set(a, v);
    } else positional.push(a);
  }
  return { positional, values };
}

function poseFor(loaded: LoadedArm, option: string, text: string | undefined): number[] {
  const q = numberList(option, text);
  const n = loaded.chain.jointCount;
  if (q.length !== n && q.length !== loaded.jointCount) {
    const counts = n === loaded.jointCount ? `${n}` : `${n} (the chain) or ${loaded.jointCount} (every joint)`;
    throw new ArmInputError([`${option}: must have ${counts} values (has ${q.length})`]);
  }
  return q;
}

function runImport(argv: string[], io: ArmIo): number {
  const { positional } = options(argv, []);
  if (positional.length !== 1) throw new ArmInputError(["arm import: needs exactly one URDF file"]);
  const d = urdfDescription(positional[0], readArmText(positional[0]));
  io.out(JSON.stringify(d, null, 2) + "\n");
  return 0;
}

function runFk(argv: string[], io: ArmIo): number {
  const { positional, values } = options(argv, ["--pose"]);
  if (positional.length !== 1) throw new ArmInputError(["fk: needs exactly one arm file"]);
  const loaded = loadArm(positional[0]);
  const q = poseFor(loaded, "--pose", values.get("--pose"));
  const t = forwardKinematics(loaded.chain, q, createChainBuffers(loaded.chain));
  io.out(JSON.stringify({ position: [t[12], t[13], t[14]], rotation: rotationRows(t) }, null, 2) + "\n");
  return 0;
}

function runIk(argv: string[], io: ArmIo): number {
  const { positional, values } = options(argv, ["--position", "--rpy", "--seed"]);
  if (positional.length !== 1) throw new ArmInputError(["ik: needs exactly one arm file"]);
  const loaded = loadArm(positional[0]);
  if (!values.has("--position")) throw new ArmInputError(["--position: is required (x,y,z in metres, base frame)"]);
  const p = numberList("--position", values.get("--position"), 3);
  const rpy = values.has("--rpy") ? numberList("--rpy", values.get("--rpy"), 3) : undefined;
  const seed = values.has("--seed") ? poseFor(loaded, "--seed", values.get("--seed")) : undefined;
  const r = solveIk(
    loaded.chain,
    { position: [p[0], p[1], p[2]], ...(rpy ? { rpy: [rpy[0], rpy[1], rpy[2]] as [number, number, number] } : {}) },
    { seed, lower: loaded.lower, upper: loaded.upper },
  );
  const result: Record<string, unknown> = { pose: r.pose, positionErrorM: r.positionErrorM, reachable: r.reachable };
  if (rpy) result.orientationErrorRad = r.orientationErrorRad;
  io.out(JSON.stringify(result, null, 2) + "\n");
  return r.reachable ? 0 : 1;
}

/** Runs `arm import`, `fk` or `ik` (argv includes the command); returns the exit code. */
export function runArmCommand(argv: string[], io: ArmIo): number {
  try {
    const [command, ...rest] = argv;
    if (rest.includes("--help") || rest.includes("-h")) {
      io.out(`Usage:\n${command === "arm" ? commandUsage.arm : command === "fk" ? commandUsage.fk : commandUsage.ik}`);
      return 0;
    }
    if (command === "arm") {
      const [sub, ...more] = rest;
      if (sub !== "import")
        throw new ArmInputError([
          `arm ${sub ?? ""}: unknown subcommand (use "arm import FILE.urdf")`.replace("  ", " "),
        ]);
      return runImport(more, io);
    }
    if (command === "fk") return runFk(rest, io);
    return runIk(rest, io);
  } catch (error) {
    if (error instanceof ArmInputError || error instanceof ArmFileError) {
      io.err(error.lines.map((l) => l + "\n").join(""));
      return 2;
    }
    throw error;
  }
}
