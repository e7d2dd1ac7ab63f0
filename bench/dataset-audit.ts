/**
 * Benchmark (not a test): `jointproof audit` on an invented dataset of 600 episodes (450–1,100 frames
 * at 30 Hz, 7 joints, every kind of defect planted; bench/dataset-generate.ts) stored as one Parquet
 * file, start-up included, against a reference script with pyarrow and numpy doing the same audit
 * (bench/dataset_audit_reference.py; skipped where python3 lacks pyarrow). Checks that both agree on
 * the summary, prints the figures and adds them to bench/results.json under `datasetAudit`.
 *
 * Run with `npx tsx bench/dataset-audit.ts` (also the last step of `npm run bench`). It then runs
 * `bash bench/dataset-workers.sh` (episodes per second through one and two dataset workers, on a
 * private PostgreSQL cluster and the object-store fake; ports JP_BENCH_*; JP_BENCH_SKIP_WORKERS=1
 * leaves it out) and adds its figures.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { writeEpisodesParquet } from "../kinematics";
import { datasetArm, datasetArmDocument, generateDataset } from "./dataset-generate";

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, "..");
const tmp = join(here, "tmp");
const episodes = 600;
const parquetPath = join(tmp, `dataset-${episodes}.parquet`);
const armPath = join(tmp, "dataset-arm.json");
const bin = join(root, "bin", "jointproof");
const runs = 5;

interface Timing {
  bestMs: number;
  medianMs: number;
}

function time(run: () => void): Timing {
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    run();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return { bestMs: times[0], medianMs: times[times.length >> 1] };
}

const round = (x: number, digits = 0) => Number(x.toFixed(digits));

function main() {
  mkdirSync(tmp, { recursive: true });
  const generated = generateDataset({ episodes });
  const frames = generated.reduce((sum, e) => sum + e.recording.count, 0);
  writeFileSync(parquetPath, writeEpisodesParquet(datasetArm(), generated));
  writeFileSync(armPath, JSON.stringify(datasetArmDocument, null, 2));
  const megabytes = statSync(parquetPath).size / 1e6;

  spawnSync(process.execPath, [bin, "--help"], { encoding: "utf8" }); // build the cached bundle first
  let ours: { summary: unknown } | null = null;
  const auditTime = time(() => {
    const r = spawnSync(process.execPath, [bin, "audit", parquetPath, "--arm", armPath, "--json"], {
      encoding: "utf8",
      maxBuffer: 1 << 28,
    });
    if (r.status !== 1 && r.status !== 0) throw new Error(`audit failed (${r.status}): ${r.stderr}`);
    ours = JSON.parse(r.stdout);
  });

  const probe = spawnSync("python3", ["-c", "import pyarrow, numpy"], { encoding: "utf8" });
  let referenceTime: Timing | null = null;
  let reference: unknown = null;
  if (probe.status === 0) {
    const script = join(here, "dataset_audit_reference.py");
    referenceTime = time(() => {
      const r = spawnSync("python3", [script, parquetPath, armPath], { encoding: "utf8" });
      if (r.status !== 0) throw new Error(`reference failed: ${r.stderr}`);
      reference = JSON.parse(r.stdout);
    });
  } else {
    console.log("dataset audit: python3 with pyarrow and numpy not found; reference comparison skipped");
  }
  const oursSummary = (ours as { summary: unknown } | null)?.summary ?? null;
  const agree =
    reference === null ? null : JSON.stringify(sortKeys(oursSummary)) === JSON.stringify(sortKeys(reference));

  const resultsPath = join(here, "results.json");
  const results = existsSync(resultsPath)
    ? (JSON.parse(readFileSync(resultsPath, "utf8")) as Record<string, unknown>)
    : {};
  const workersPath = join(tmp, "dataset-workers.json");
  if (process.env.JP_BENCH_SKIP_WORKERS !== "1") {
    rmSync(workersPath, { force: true }); // figures from this run only, never an older run's
    // one and two audit workers on a private cluster and the object-store fake (bench/dataset-workers.sh)
    const run = spawnSync("bash", [join(here, "dataset-workers.sh")], {
      cwd: root,
      stdio: ["ignore", "inherit", "pipe"],
    });
    if (run.status !== 0) {
      const lines = (run.stderr?.toString() ?? "").split("\n");
      // the bench's own reason first; the workers' queue errors after the cluster stops say nothing
      const why = lines.filter((l) => l.includes("dataset workers bench failed"));
      const other = lines.filter((l) => /error|did not|exited/i.test(l) && !l.includes("queue error"));
      console.log(
        `dataset workers: not measured (bench/dataset-workers.sh exited ${run.status}) ${[...why, ...other].slice(0, 3).join(" | ")}`,
      );
    }
  }
  const workers = existsSync(workersPath) ? JSON.parse(readFileSync(workersPath, "utf8")) : null;
  results.datasetAudit = {
    episodes,
    frames,
    joints: 7,
    rateHz: 30,
    parquetMegabytes: round(megabytes, 2),
    auditCommand: { bestMs: round(auditTime.bestMs), medianMs: round(auditTime.medianMs) },
    pyarrowReference: referenceTime
      ? { bestMs: round(referenceTime.bestMs), medianMs: round(referenceTime.medianMs) }
      : null,
    ratioMedian: referenceTime ? round(auditTime.medianMs / referenceTime.medianMs, 2) : null,
    target: "ratio ≤ 1.0 (our audit, start-up included, no slower than the reference)",
    summariesAgree: agree,
    summary: oursSummary,
    workers,
  };
  writeFileSync(resultsPath, JSON.stringify(results, null, 2) + "\n");
  console.log(
    `jointproof audit (whole command, ${episodes} episodes, ${frames} frames, ${round(megabytes, 1)} MB Parquet): ${round(auditTime.medianMs)} ms median, ${round(auditTime.bestMs)} ms best`,
  );
  if (referenceTime) {
    console.log(
      `pyarrow + numpy reference: ${round(referenceTime.medianMs)} ms median, ${round(referenceTime.bestMs)} ms best; ratio ${round(auditTime.medianMs / referenceTime.medianMs, 2)} (target ≤ 1.0); summaries ${agree ? "agree" : "DISAGREE"}`,
    );
  }
  if (workers) console.log(`dataset workers: ${JSON.stringify(workers)}`);
}

/** A value with object keys sorted, for comparing JSON from two producers. */
function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value && typeof value === "object") {
    return Object.fromEntries(
      Object.entries(value as Record<string, unknown>)
        .sort(([a], [b]) => (a < b ? -1 : 1))
        .map(([k, v]) => [k, sortKeys(v)]),
    );
  }
  return value;
}

main();
