/**
 * Benchmarks (not tests): the stream check of a 10-minute, 1 kHz, 7-joint recording (600,000 samples),
 * the CSV parse of that recording, and the check + 1 kHz sampling of a 50-move sequence; then the whole
 * `bin/jointproof scan` command on the CSV file (start-up and parsing included), and the numpy reference
 * script when python3 with numpy is available. Then the engine targets of the full check (10 and 50
 * moves on the heavy demo arm with a keep-out box, one duration changed) in Node and in Chromium,
 * each beside a fixed calibration loop; the bench page's edit figures, `/api/v1/check` under load
 * and `/api/health` during a flood (bench/server.sh: a private cluster, the fakes and `next start`);
 * the dataset audit benches. Prints the figures and writes bench/results.json, every group with the
 * load average (`os.loadavg()`: 1, 5, 15 minutes) before and after it and the date.
 *
 * Run with `npm run bench` (hold the build lock: it may build and it runs Chromium). The recording
 * is generated into bench/tmp/ (git-ignored). `JP_BENCH_SKIP_SERVER=1` leaves out the server part.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import {
  check,
  formatProblem,
  formatRecordingCsv,
  parseRecordingCsv,
  parseArm,
  parsePlan,
  type Arm,
  type Plan,
  samplePlan,
  planFromPoses,
  repairStream,
  streamCheck,
  type Recording,
} from "../kinematics";
import { chromiumEngineFigures } from "./chromium";
import { measureEngine } from "./engine-figures";

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, "..");
const tmp = join(here, "tmp");
const csvPath = join(tmp, "recording-600k.csv");
const armPath = join(tmp, "arm.json");

const samples = 600_000;
const rateHz = 1000;

/** Invented demo arm: seven joints, the last one a prismatic gripper. */
const armDocument = {
  name: "Bench arm (invented)",
  controlRateHz: rateHz,
  cautionRatio: 0.9,
  joints: [
    { name: "base", min: -3, max: 3, maxVelocity: 3.1, maxAcceleration: 20 },
    { name: "shoulder", min: -1.8, max: 1.8, maxVelocity: 3.1, maxAcceleration: 20 },
    { name: "elbow", min: -2.6, max: 2.6, maxVelocity: 3.1, maxAcceleration: 20 },
    { name: "wrist-pitch", min: -1.9, max: 1.9, maxVelocity: 4, maxAcceleration: 30 },
    { name: "wrist-roll", min: -3.1, max: 3.1, maxVelocity: 4, maxAcceleration: 30 },
    { name: "tool-roll", min: -3.1, max: 3.1, maxVelocity: 4, maxAcceleration: 30 },
    { name: "gripper", type: "prismatic", min: 0, max: 0.045, maxVelocity: 0.1 },
  ],
};

function armOf(): Arm {
  const result = parseArm(armDocument);
  if (!result.ok) throw new Error(JSON.stringify(result.problems));
  return result.value;
}

/** A deterministic guided-arm recording: slow sines per joint plus a glitch every 10,000 samples. */
function makeRecording(arm: Arm): Recording {
  const n = arm.joints.length;
  const timeS = new Float64Array(samples);
  const position = new Float64Array(samples * n);
  for (let k = 0; k < samples; k++) {
    const t = k / rateHz;
    timeS[k] = t;
    for (let j = 0; j < n; j++) {
      const amplitude = j === n - 1 ? 0.02 : 0.6 / (j + 1);
      const centre = j === n - 1 ? 0.022 : 0;
      let q = centre + amplitude * Math.sin(2 * Math.PI * (0.05 + 0.03 * j) * t + j);
      if (k % 10_000 === 5_000 && j === k % n) q += j === n - 1 ? 0.001 : 0.02;
      position[k * n + j] = Math.round(q * 1e7) / 1e7;
    }
  }
  return { names: arm.joints.map((j) => j.name), jointCount: n, count: samples, timeS, position };
}

/** Best and median wall-clock milliseconds of `runs` calls. */
function time(runs: number, fn: () => void): { bestMs: number; medianMs: number } {
  const times: number[] = [];
  for (let r = 0; r < runs; r++) {
    const start = performance.now();
    fn();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return { bestMs: times[0], medianMs: times[Math.floor(times.length / 2)] };
}

function round(value: number, digits = 1): number {
  return Number(value.toFixed(digits));
}

async function main(): Promise<void> {
  mkdirSync(tmp, { recursive: true });
  const arm = armOf();
  const recording = makeRecording(arm);
  if (!existsSync(csvPath)) writeFileSync(csvPath, formatRecordingCsv(recording));
  writeFileSync(armPath, JSON.stringify(armDocument, null, 2));
  const csvBytes = statSync(csvPath).size;

  // 1. stream check of 600,000 samples × 7 joints (in memory)
  let report = streamCheck(arm, recording);
  const streamTime = time(7, () => {
    report = streamCheck(arm, recording);
  });

  // 2. CSV parse of the ~50 MB file (from bytes already in memory)
  const bytes = readFileSync(csvPath);
  let parsedCount = 0;
  const parseTime = time(5, () => {
    parsedCount = parseRecordingCsv(bytes).recording?.count ?? 0;
  });
  if (parsedCount !== samples) throw new Error(`parsed ${parsedCount} rows, expected ${samples}`);

  // 3. repair of the same recording
  const repairTime = time(3, () => {
    repairStream(arm, recording);
  });

  // 4. a 50-move sequence: check, and sampling at 1 kHz
  const poses: number[][] = [];
  const durations: number[] = [];
  for (let i = 0; i < 50; i++) {
    poses.push(arm.joints.map((joint, j) => (j === 6 ? 0.01 + 0.02 * ((i + j) % 2) : 0.5 * Math.sin(i * 0.7 + j))));
    durations.push(1.5 + 0.5 * (i % 3));
  }
  const plan = planFromPoses(
    arm,
    arm.joints.map((_, j) => (j === 6 ? 0.02 : 0)),
    poses,
    durations,
    "quintic",
  );
  let sampleCount = 0;
  const checkTime = time(50, () => {
    check(plan);
  });
  const sampleTime = time(10, () => {
    sampleCount = samplePlan(plan).count;
  });

  // 4b. the live check of the web editor: a 5-move, 10-second plan on the 7-joint demo arm with
  // its chain (effort, clearance, tool speed), a fresh plan object per run as after an edit, at
  // the control rate and at the sampleRateHz option's 250 Hz; plus one effort fault whose fix
  // needs a much longer duration (the duration search).
  const demoArm = JSON.parse(
    readFileSync(join(root, "kinematics", "arm", "presets", "bench-arm-h.json"), "utf8"),
  ) as unknown;
  const liveGoals = [
    [0.4, 0.6, 0.8, 0.3, 0.2, 0.1, 0.01],
    [-0.3, 0.9, 0.5, -0.2, 0.5, -0.3, 0.02],
    [0.2, 1.3, 0.2, 0.4, -0.4, 0.6, 0],
    [0.6, 0.4, 1.0, 0.1, 0.3, 0, 0.01],
    [0, 0.2, 0.3, 0, 0, 0, 0],
  ];
  const livePlan = (moves: { goal: number[]; duration: number }[]): Plan => {
    const r = parsePlan({
      format: "jointproof.plan",
      version: 1,
      arm: demoArm,
      start: [0, 0, 0, 0, 0, 0, 0],
      surfaceMargin: 0.01,
      maxToolSpeed: 0.25,
      moves,
    });
    if (!r.ok) throw new Error(r.problems.map((p) => formatProblem(p)).join("; "));
    return r.value;
  };
  const liveMoves = liveGoals.map((goal) => ({ goal, duration: 2 }));
  const liveTime = time(15, () => {
    check(livePlan(liveMoves));
  });
  const liveCoarseTime = time(15, () => {
    check(livePlan(liveMoves), { sampleRateHz: 250 });
  });
  const effortFixTime = time(7, () => {
    check(livePlan([{ goal: [0, 1.45, 0.1, 0, 0, 0, 0.01], duration: 0.3 }]));
  });

  // 5. the whole command: start-up, reading, parsing, checking (bundle built beforehand)
  const bin = join(root, "bin", "jointproof");
  spawnSync(process.execPath, [bin, "--help"], { encoding: "utf8" });
  const scanRun = () =>
    spawnSync(process.execPath, [bin, "scan", csvPath, "--arm", armPath, "--json"], {
      encoding: "utf8",
      maxBuffer: 1 << 28,
    });
  const first = scanRun();
  if (first.status !== 1 && first.status !== 0) throw new Error(`scan failed: ${first.stderr}`);
  const scanTime = time(5, () => {
    scanRun();
  });

  // 6. the numpy reference, if available
  let numpyTime: { bestMs: number; medianMs: number } | null = null;
  const probe = spawnSync("python3", ["-c", "import numpy"], { encoding: "utf8" });
  if (probe.status === 0) {
    const script = join(here, "numpy_scan.py");
    spawnSync("python3", [script, csvPath]);
    numpyTime = time(3, () => {
      spawnSync("python3", [script, csvPath], { encoding: "utf8" });
    });
  }

  // 7. the engine targets, in Node and in Chromium, each beside the calibration loop
  const load = () => loadavg().map((v) => Number(v.toFixed(2)));
  const nodeLoad = load();
  const nodeEngine = { ...measureEngine(), loadAverage: [nodeLoad, load()] };
  const chromiumLoad = load();
  const chromiumEngine = { ...(await chromiumEngineFigures(here)), loadAverage: [chromiumLoad, load()] };

  // 8. the server part: bench page, check API under load, health during a flood
  let server: unknown = null;
  if (process.env.JP_BENCH_SKIP_SERVER !== "1") {
    const run = spawnSync("bash", [join(here, "server.sh")], { stdio: "inherit" });
    if (run.status !== 0) throw new Error(`bench/server.sh failed (exit ${run.status})`);
    server = JSON.parse(readFileSync(join(tmp, "server-bench.json"), "utf8"));
  }

  const results = {
    measuredAt: new Date().toISOString(),
    loadAverageAtEnd: load(),
    machine: { cpus: cpus().length, cpu: cpus()[0]?.model ?? "unknown", node: process.version },
    recording: {
      samples,
      joints: arm.joints.length,
      rateHz,
      csvMegabytes: round(csvBytes / 1e6, 1),
      findings: report.findings.length,
    },
    streamCheck: {
      bestMs: round(streamTime.bestMs, 2),
      medianMs: round(streamTime.medianMs, 2),
      samplesPerSecond: Math.round(samples / (streamTime.medianMs / 1000)),
    },
    csvParse: {
      bestMs: round(parseTime.bestMs),
      medianMs: round(parseTime.medianMs),
      megabytesPerSecond: round(csvBytes / 1e6 / (parseTime.medianMs / 1000), 1),
    },
    repair: {
      medianMs: round(repairTime.medianMs, 2),
      samplesPerSecond: Math.round(samples / (repairTime.medianMs / 1000)),
    },
    sequence50: {
      moves: 50,
      checkMedianMs: round(checkTime.medianMs, 3),
      sampled: sampleCount,
      sampleMedianMs: round(sampleTime.medianMs, 2),
      samplesPerSecond: Math.round(sampleCount / (sampleTime.medianMs / 1000)),
    },
    liveCheck: {
      moves: 5,
      planSeconds: 10,
      controlRateMedianMs: round(liveTime.medianMs, 1),
      controlRateBestMs: round(liveTime.bestMs, 1),
      at250HzMedianMs: round(liveCoarseTime.medianMs, 1),
      effortFixMedianMs: round(effortFixTime.medianMs, 1),
      targetMs: 50,
    },
    engineTargets: {
      plans:
        "10 and 50 moves of 2 s on the heavy demo arm (bench-arm-h) with one keep-out box; cold check (nothing cached); duration change: one move of the 10 changed on a checked plan",
      targets: { check10Ms: 16, check50Ms: 100, durationChangeMs: 2, in: "Chromium" },
      node: nodeEngine,
      chromium: chromiumEngine,
    },
    server,
    scanCommand: { bestMs: round(scanTime.bestMs), medianMs: round(scanTime.medianMs), targetMs: 700 },
    numpyReference: numpyTime ? { bestMs: round(numpyTime.bestMs), medianMs: round(numpyTime.medianMs) } : null,
  };
  console.log(
    `stream check   ${samples} samples × 7 joints: ${results.streamCheck.medianMs} ms median (${results.streamCheck.samplesPerSecond.toLocaleString("en")} samples/s)`,
  );
  console.log(
    `CSV parse      ${results.recording.csvMegabytes} MB: ${results.csvParse.medianMs} ms median (${results.csvParse.megabytesPerSecond} MB/s)`,
  );
  console.log(`repair         ${samples} samples: ${results.repair.medianMs} ms median`);
  console.log(
    `50-move check  ${results.sequence50.checkMedianMs} ms median; sampling ${sampleCount} samples at 1 kHz: ${results.sequence50.sampleMedianMs} ms (${results.sequence50.samplesPerSecond.toLocaleString("en")} samples/s)`,
  );
  console.log(
    `live check     5 moves, 10 s, demo arm H: ${results.liveCheck.controlRateMedianMs} ms median (${results.liveCheck.controlRateBestMs} ms best) at the control rate, ` +
      `${results.liveCheck.at250HzMedianMs} ms at 250 Hz; effort fix search ${results.liveCheck.effortFixMedianMs} ms (target < 50 ms)`,
  );
  console.log(
    `jointproof scan (whole command, ${results.recording.csvMegabytes} MB CSV): ${results.scanCommand.medianMs} ms median, ${results.scanCommand.bestMs} ms best (target < 700 ms)`,
  );
  if (results.numpyReference) console.log(`numpy reference script: ${results.numpyReference.medianMs} ms median`);
  for (const [where, f] of [
    ["Node", nodeEngine],
    ["Chromium", chromiumEngine],
  ] as const)
    console.log(
      `engine (${where}) 10 moves ${f.check10.medianMs} ms median (target 16), 50 moves ${f.check50.medianMs} ms (target 100), ` +
        `one duration changed ${f.durationChange10.medianMs} ms (target 2); calibration loop ${f.calibrationMs} ms`,
    );
  writeFileSync(join(here, "results.json"), JSON.stringify(results, null, 2) + "\n");
}

await main();
await import("./dataset-audit"); // the dataset audit bench adds `datasetAudit` to results.json
