/**
 * A dataset of 330 invented episodes through the real API handlers, the real object store (the local
 * fake) and two real dataset worker processes on pg-boss against the test database; one worker is
 * killed (SIGKILL) mid-audit. Nothing may be lost and nothing counted twice: every episode has exactly
 * one result, equal to the engine's audit of the same episode, and every batch is done once.
 */
import "../api/_env";
import { spawn, type ChildProcess } from "node:child_process";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { datasetBatches, datasetEpisodes } from "@/db/schema";
import { createArm } from "@/db/queries/arms";
import { createProject, upsertMember } from "@/db/queries/projects";
import { auditEpisode, readDataset, summarizeAudits, writeEpisodesParquet } from "@/kinematics";
import * as uploadRoute from "@/app/api/v1/projects/[projectId]/datasets/route";
import * as datasetRoute from "@/app/api/v1/datasets/[datasetId]/route";
import * as previewRoute from "@/app/api/v1/datasets/[datasetId]/preview/route";
import * as mappingRoute from "@/app/api/v1/datasets/[datasetId]/mapping/route";
import * as auditRoute from "@/app/api/v1/datasets/[datasetId]/audit/route";
import * as episodesRoute from "@/app/api/v1/datasets/[datasetId]/episodes/route";
import * as episodeRoute from "@/app/api/v1/datasets/[datasetId]/episodes/[index]/route";
import * as repairRoute from "@/app/api/v1/datasets/[datasetId]/repair/route";
import * as exportRoute from "@/app/api/v1/datasets/[datasetId]/export/route";
import * as replayRoute from "@/app/api/v1/datasets/[datasetId]/episodes/[index]/replay-plan/route";
import { stopDatasetBoss } from "@/lib/server/datasets/queue";
import { datasetArm, datasetArmDocument, generateDataset, plantedDefect } from "@/bench/dataset-generate";
import { unzipSync } from "fflate";
import { call, makeUser, sessionCookieFor, type Auth } from "../api/_helpers";

const EPISODES = 330;
// the jobs' expiry is set by whoever enqueues them (the API, in this process): short, so a lost batch is retried soon
const workerEnv = { DATASET_JOB_EXPIRE_S: "3", DATASET_SWEEP_S: "1", DATASET_RETRY_LIMIT: "10" };
Object.assign(process.env, workerEnv);
const workers: ChildProcess[] = [];

function startWorker(): Promise<ChildProcess> {
  const child = spawn(
    process.execPath,
    ["--conditions=react-server", "--import", "tsx", "lib/server/datasets/run-worker.ts"],
    {
      env: { ...process.env, ...workerEnv },
      stdio: ["ignore", "pipe", "pipe"],
    },
  );
  workers.push(child);
  let log = "";
  child.stderr?.on("data", (d: Buffer) => (log += d.toString()));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`worker did not start: ${log}`)), 30_000);
    child.stdout?.on("data", (d: Buffer) => {
      if (d.toString().includes("ready")) {
        clearTimeout(timer);
        resolve(child);
      }
    });
    child.on("exit", (code) => reject(new Error(`worker exited (${code}): ${log}`)));
  });
}

async function waitFor<T>(what: string, probe: () => Promise<T | undefined | false>, timeoutMs = 90_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

let auth: Auth;
let viewerAuth: Auth;
let projectId: string;
let armId: string;
const generated = generateDataset({ episodes: EPISODES, minFrames: 450, maxFrames: 700, seed: 11 });
const parquet = writeEpisodesParquet(datasetArm(), generated);

beforeAll(async () => {
  const owner = await makeUser("researcher", "dataset-owner");
  const viewer = await makeUser("student", "dataset-viewer");
  auth = { cookie: await sessionCookieFor(owner.id) };
  viewerAuth = { cookie: await sessionCookieFor(viewer.id) };
  const project = await createProject({ userId: owner.id, name: "Demonstrations", kind: "research" });
  projectId = project.id;
  await upsertMember({ projectId, ownerId: owner.id, email: viewer.email, role: "viewer" });
  const arm = await createArm({ projectId, name: "Copy arm", description: datasetArmDocument, userId: owner.id });
  if (!arm) throw new Error("arm not created");
  armId = arm.armId;
}, 60_000);

afterAll(async () => {
  for (const w of workers) if (w.exitCode === null) w.kill("SIGKILL");
  await stopDatasetBoss();
});

describe("dataset audit through the workers", () => {
  let datasetId: string;

  it("refuses an upload without its Content-Length, and one cut short, storing nothing", async () => {
    const noLength = await call(uploadRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/datasets?name=NoLength`,
      params: { projectId },
      auth,
      rawBody: parquet,
    });
    expect(noLength.status).toBe(400);
    const cut = await call(uploadRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/datasets?name=Cut`,
      params: { projectId },
      auth,
      rawBody: parquet.subarray(0, 1000),
      headers: { "content-length": String(parquet.byteLength) },
    });
    expect(cut.status).toBe(400);
    const list = await call(uploadRoute.GET, {
      path: `/api/v1/projects/${projectId}/datasets`,
      params: { projectId },
      auth,
    });
    expect((list.body as { datasets: unknown[] }).datasets).toEqual([]);
  });

  it("stores an upload whole with its SHA-256, and a viewer may not upload", async () => {
    const denied = await call(uploadRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/datasets?name=Viewer`,
      params: { projectId },
      auth: viewerAuth,
      rawBody: parquet,
      headers: { "content-length": String(parquet.byteLength) },
    });
    expect(denied.status).toBe(403);
    const res = await call(uploadRoute.POST, {
      method: "POST",
      path: `/api/v1/projects/${projectId}/datasets?name=Week%201`,
      params: { projectId },
      auth,
      rawBody: parquet,
      headers: { "content-length": String(parquet.byteLength) },
    });
    expect(res.status).toBe(201);
    const dataset = (res.body as { dataset: { id: string; sizeBytes: number; fileKind: string; sha256: string } })
      .dataset;
    expect(dataset).toMatchObject({ sizeBytes: parquet.byteLength, fileKind: "parquet" });
    const { createHash } = await import("node:crypto");
    expect(dataset.sha256).toBe(createHash("sha256").update(parquet).digest("hex"));
    datasetId = dataset.id;
  });

  it("previews the mapping (columns and types, episodes, first rows) and refuses a mapping that cannot be read", async () => {
    const preview = await call(previewRoute.POST, {
      method: "POST",
      path: `/api/v1/datasets/${datasetId}/preview`,
      params: { datasetId },
      auth: viewerAuth,
      body: { armId, mapping: {} },
    });
    expect(preview.status).toBe(200);
    const body = (
      preview.body as {
        preview: {
          episodes: number;
          problems: string[];
          files: { columns: { name: string; type: string }[] }[];
          firstEpisode: { rows: number[][] };
        };
      }
    ).preview;
    expect({ episodes: body.episodes, problems: body.problems }).toEqual({ episodes: EPISODES, problems: [] });
    expect(body.files[0].columns.slice(0, 3)).toEqual([
      { name: "episode", type: "STRING" },
      { name: "frame_index", type: "INT32" },
      { name: "t", type: "DOUBLE" },
    ]);
    expect(body.firstEpisode.rows[1].slice(1)).toEqual(Array.from(generated[0].recording.position.subarray(7, 14)));
    const bad = await call(mappingRoute.POST, {
      method: "POST",
      path: `/api/v1/datasets/${datasetId}/mapping`,
      params: { datasetId },
      auth,
      body: { armId, mapping: { jointsColumn: "state" } },
    });
    expect(bad.status).toBe(422);
    expect(JSON.stringify(bad.body)).toContain("Its columns: episode (STRING), frame_index (INT32), t (DOUBLE)");
    const ok = await call(mappingRoute.POST, {
      method: "POST",
      path: `/api/v1/datasets/${datasetId}/mapping`,
      params: { datasetId },
      auth,
      body: { armId, mapping: {} },
    });
    expect(ok.status).toBe(200);
  });

  it("audits 330 episodes with two workers killed mid-batch and a third taking over: every episode stored once, equal to the engine's audit", async () => {
    const first = await startWorker();
    const second = await startWorker();
    const started = await call(auditRoute.POST, {
      method: "POST",
      path: `/api/v1/datasets/${datasetId}/audit`,
      params: { datasetId },
      auth,
    });
    expect(started.status).toBe(202);
    const generation = (started.body as { dataset: { generation: number } }).dataset.generation;
    const batchCount = await db.$count(datasetBatches, eq(datasetBatches.datasetId, datasetId));
    expect(batchCount).toBe(Math.ceil(EPISODES / 25));
    // kill both workers while a batch is claimed and not yet stored (its job is then lost mid-batch)
    await waitFor(
      "a batch in hand",
      async () =>
        (await db.$count(
          datasetBatches,
          sql`${datasetBatches.datasetId} = ${datasetId} and ${datasetBatches.attempts} > 0 and not ${datasetBatches.done}`,
        )) > 0,
      60_000,
    );
    first.kill("SIGKILL");
    second.kill("SIGKILL");
    const doneAtKill = await db.$count(
      datasetBatches,
      sql`${datasetBatches.datasetId} = ${datasetId} and ${datasetBatches.done}`,
    );
    expect(doneAtKill).toBeLessThan(batchCount);
    await startWorker();
    const summary = await waitFor("the audit to finish", async () => {
      const res = await call(datasetRoute.GET, {
        path: `/api/v1/datasets/${datasetId}`,
        params: { datasetId },
        auth: viewerAuth,
      });
      const body = res.body as {
        dataset: { status: string };
        summary: Record<string, unknown>;
        progress: { batchesDone: number; batches: number };
      };
      return body.dataset.status === "audited" ? body : undefined;
    });
    expect(summary.progress).toMatchObject({ batchesDone: batchCount, batches: batchCount });

    // exactly one row per episode, of this generation
    const rows = await db.select().from(datasetEpisodes).where(eq(datasetEpisodes.datasetId, datasetId));
    expect(rows).toHaveLength(EPISODES);
    expect(new Set(rows.map((r) => r.index)).size).toBe(EPISODES);
    expect(rows.every((r) => r.generation === generation)).toBe(true);
    // every batch done; the batch in hand when the workers died was attempted again
    const batches = await db.select().from(datasetBatches).where(eq(datasetBatches.datasetId, datasetId));
    expect(batches.every((b) => b.done)).toBe(true);
    expect(batches.some((b) => b.attempts >= 2)).toBe(true);

    // the same results as the engine on the same episodes
    const arm = datasetArm();
    const read = await readDataset(arm, [{ name: "week.parquet", bytes: parquet }]);
    const expected = read.episodes.map((e) => auditEpisode(arm, e));
    const byIndex = new Map(rows.map((r) => [r.index, r]));
    expected.forEach((audit, i) => {
      const row = byIndex.get(i)!;
      expect({ episode: row.episode, verdict: row.verdict, findings: row.findingCount }).toEqual({
        episode: audit.episode,
        verdict: audit.verdict,
        findings: audit.findings.length,
      });
    });
    const local = summarizeAudits(expected);
    expect(summary.summary).toMatchObject({
      episodes: EPISODES,
      pass: local.pass,
      caution: local.caution,
      fault: local.fault,
      invalid: local.invalid,
      byKind: local.byKind,
    });
    // the planted defects are found: every planted glitch episode has a glitch
    generated.forEach((e, i) => {
      if (plantedDefect(i) === "glitch") expect(expected[i].findings.some((f) => f.kind === "glitch")).toBe(true);
      if (plantedDefect(i) === "invalid") expect(byIndex.get(i)!.verdict).toBe("invalid");
    });
  }, 180_000);

  it("lists episodes, opens one, repairs it (viewers may not), and the repaired episode audits clean", async () => {
    const list = await call(episodesRoute.GET, {
      path: `/api/v1/datasets/${datasetId}/episodes`,
      params: { datasetId },
      auth: viewerAuth,
    });
    const episodes = (list.body as { episodes: { index: number; verdict: string; worstKind: string | null }[] })
      .episodes;
    expect(episodes).toHaveLength(EPISODES);
    const glitchy = episodes.find((e) => e.worstKind === "glitch")!;
    const one = await call(episodeRoute.GET, {
      path: `/api/v1/datasets/${datasetId}/episodes/${glitchy.index}`,
      params: { datasetId, index: String(glitchy.index) },
      auth: viewerAuth,
    });
    expect(one.status).toBe(200);
    const body = one.body as {
      episode: { findings: { kind: string; sample: number }[] };
      recorded: { count: number; timeS: number[] };
      repaired: unknown;
    };
    expect(body.episode.findings.some((f) => f.kind === "glitch")).toBe(true);
    expect(body.recorded.timeS).toHaveLength(body.recorded.count);
    expect(body.repaired).toBeNull();
    const denied = await call(repairRoute.POST, {
      method: "POST",
      path: `/api/v1/datasets/${datasetId}/repair`,
      params: { datasetId },
      auth: viewerAuth,
      body: { episodes: [glitchy.index] },
    });
    expect(denied.status).toBe(403);
    const repaired = await call(repairRoute.POST, {
      method: "POST",
      path: `/api/v1/datasets/${datasetId}/repair`,
      params: { datasetId },
      auth,
      body: { episodes: [glitchy.index] },
    });
    expect(repaired.status).toBe(200);
    expect((repaired.body as { repaired: { after: string; glitchesReplaced: number }[] }).repaired[0]).toMatchObject({
      after: "pass",
      glitchesReplaced: 1,
    });
  });

  it("repairs all, then exports a zip whose manifest lists both files' SHA-256 and the excluded invalid episodes", async () => {
    const all = await call(repairRoute.POST, {
      method: "POST",
      path: `/api/v1/datasets/${datasetId}/repair`,
      params: { datasetId },
      auth,
      body: {},
    });
    const results = (all.body as { repaired: { before: string; after: string | null }[] }).repaired;
    expect(results.filter((r) => r.before !== "invalid").every((r) => r.after === "pass")).toBe(true);
    const res = await call(exportRoute.GET, {
      path: `/api/v1/datasets/${datasetId}/export`,
      params: { datasetId },
      auth: viewerAuth,
    });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/zip");
    const zipBytes = new Uint8Array(
      await (
        await exportRoute.GET(
          new Request(`http://127.0.0.1:3000/api/v1/datasets/${datasetId}/export`, {
            headers: { cookie: (viewerAuth as { cookie: string }).cookie },
          }),
          { params: Promise.resolve({ datasetId }) },
        )
      ).arrayBuffer(),
    );
    const files = unzipSync(zipBytes);
    expect(Object.keys(files).sort()).toEqual(["dataset.parquet", "manifest.json", "report.json"]);
    const manifest = JSON.parse(new TextDecoder().decode(files["manifest.json"]));
    const { createHash } = await import("node:crypto");
    expect(manifest.files[0]).toEqual({
      name: "dataset.parquet",
      bytes: files["dataset.parquet"].byteLength,
      sha256: createHash("sha256").update(files["dataset.parquet"]).digest("hex"),
    });
    const invalidCount = generated.filter((_, i) => plantedDefect(i) === "invalid").length;
    expect(manifest.excluded).toHaveLength(invalidCount);
    expect(manifest.episodes).toBe(EPISODES - invalidCount);
    expect(manifest.caution).toMatch(/ISO 10218/);
    // the exported Parquet reads back and every episode in it passes
    const back = await readDataset(datasetArm(), [{ name: "dataset.parquet", bytes: files["dataset.parquet"] }]);
    expect(back.episodes).toHaveLength(EPISODES - invalidCount);
    expect(back.episodes.every((e) => auditEpisode(datasetArm(), e).verdict === "pass")).toBe(true);
  }, 60_000);

  it("gives a replay that eases in, passes through every frame without stopping and eases out, never a pass while a part is unchecked, with the safety caution", async () => {
    const res = await call(replayRoute.GET, {
      path: `/api/v1/datasets/${datasetId}/episodes/0/replay-plan`,
      params: { datasetId, index: "0" },
      auth: viewerAuth,
    });
    expect(res.status).toBe(200);
    const body = res.body as {
      verdict: string;
      easeIn: { plan: { moves: { duration: number }[] }; report: { verdict: string } };
      passThrough: { verdict: string; notChecked: string[] };
      document: { format: string; caution: string; passThrough: { poses: number[][]; speeds: number[][] } };
      caution: string;
      easeInS: number;
    };
    expect(body.easeIn.plan.moves).toHaveLength(1);
    expect(body.easeInS).toBeGreaterThan(0);
    expect(body.document.passThrough.poses).toHaveLength(generated[0].recording.count);
    // at rest where the pass-through joins the ease moves
    expect(body.document.passThrough.speeds[0].every((v) => v === 0)).toBe(true);
    expect(body.document.passThrough.speeds.at(-1)!.every((v) => v === 0)).toBe(true);
    expect(["pass", "caution", "fault"]).toContain(body.passThrough.verdict);
    if (body.passThrough.notChecked.length > 0) expect(body.verdict).not.toBe("pass");
    expect(body.caution).toMatch(/emergency stop/i);
    expect(body.document.caution).toMatch(/emergency stop/i);
  });
});
