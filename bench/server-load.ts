/**
 * The server's figures under load (autocannon, against the server bench/server.sh starts):
 * `/api/v1/check` of the 5-move light-arm plan at 50 connections for 20 s, and `/api/health` while
 * 20 connections flood the check with the worst documents the work budget allows. Latencies are
 * recorded per response (autocannon's own table has no 95th percentile).
 */
import autocannon, { type Result } from "autocannon";
import armL from "../kinematics/arm/presets/bench-arm-l.json";
import { lightPlan, percentile, type PlanDocument } from "./plans";

/** Per-response latency figures (ms) and the answers by status code. */
export interface LoadFigures {
  connections: number;
  durationS: number;
  requests: number;
  requestsPerSecond: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
  statusCodes: Record<string, number>;
  /** The same percentiles per status code: a fast "busy" answer is not a fast check. */
  byStatus: Record<string, { p50Ms: number; p95Ms: number; p99Ms: number }>;
  errors: number;
  timeouts: number;
}

function run(
  options: Parameters<typeof autocannon>[0],
): Promise<{ latencies: number[]; result: Result; statusCodes: Record<string, number[]> }> {
  return new Promise((resolve) => {
    const latencies: number[] = [];
    const statusCodes: Record<string, number[]> = {};
    const instance = autocannon({ timeout: 30, ...options });
    instance.on("response", (_client, status, _bytes, ms) => {
      latencies.push(ms);
      (statusCodes[status] ??= []).push(ms);
    });
    instance.on("done", (result) => resolve({ latencies, result, statusCodes }));
  });
}

function figuresOf(
  connections: number,
  durationS: number,
  latencies: number[],
  result: Result,
  statusCodes: Record<string, number[]>,
): LoadFigures {
  const round = (v: number) => Number(v.toFixed(2));
  const entries = Object.entries(statusCodes);
  return {
    connections,
    durationS,
    requests: latencies.length,
    requestsPerSecond: round(latencies.length / durationS),
    p50Ms: round(percentile(latencies, 50)),
    p95Ms: round(percentile(latencies, 95)),
    p99Ms: round(percentile(latencies, 99)),
    maxMs: round(Math.max(0, ...latencies)),
    statusCodes: Object.fromEntries(entries.map(([status, ms]) => [status, ms.length])),
    byStatus: Object.fromEntries(
      entries.map(([status, ms]) => [
        status,
        { p50Ms: round(percentile(ms, 50)), p95Ms: round(percentile(ms, 95)), p99Ms: round(percentile(ms, 99)) },
      ]),
    ),
    errors: result.errors,
    timeouts: result.timeouts,
  };
}

/** `/api/v1/check` of the light arm's 5-move plan: `connections` for `durationS`. */
export async function checkLoad(baseUrl: string, token: string, connections = 50, durationS = 20) {
  const body = JSON.stringify(lightPlan());
  const { latencies, result, statusCodes } = await run({
    url: `${baseUrl}/api/v1/check`,
    connections,
    duration: durationS,
    method: "POST",
    headers: { authorization: `Bearer ${token}`, "content-type": "application/json" },
    body,
  });
  return figuresOf(connections, durationS, latencies, result, statusCodes);
}

/** One move on the light arm, with optional joint friction and control rate. */
function lightDocument(
  moves: PlanDocument["moves"],
  options: { viscous?: number; controlRateHz?: number } = {},
): PlanDocument {
  const arm = {
    ...armL,
    controlRateHz: options.controlRateHz ?? armL.controlRateHz,
    joints: armL.joints.map((j) =>
      options.viscous === undefined ? j : { ...j, friction: { coulomb: 0, viscous: options.viscous } },
    ),
  };
  return { ...lightPlan(), arm: arm as PlanDocument["arm"], moves };
}

/**
 * The worst documents within the budget of 3,000,000 units (path points × joints, 7 joints):
 * one 428 s move at 1 kHz, 5,500 moves of 0.01 s, one 0.42 s move at 10⁶ Hz, and the 40 s
 * move with a huge viscous friction; each just under the budget, so none is refused up front.
 */
export function worstDocuments(): { name: string; document: PlanDocument }[] {
  const plan = lightPlan();
  const a = plan.start,
    b = plan.moves[0].goal;
  const tiny = Array.from({ length: 5_500 }, (_, i) => ({
    goal: i % 2 === 0 ? b : a,
    duration: 0.01,
    shape: "quintic" as const,
  }));
  return [
    { name: "one 428 s move", document: lightDocument([{ goal: b, duration: 428, shape: "quintic" }]) },
    { name: "5,500 moves of 0.01 s", document: lightDocument(tiny) },
    {
      name: "one 0.42 s move at 10⁶ Hz",
      document: lightDocument([{ goal: b, duration: 0.42, shape: "quintic" }], { controlRateHz: 1e6 }),
    },
    {
      name: "one 40 s move, viscous friction 10⁶ N·m·s/rad",
      document: lightDocument([{ goal: b, duration: 40, shape: "quintic" }], { viscous: 1e6 }),
    },
  ];
}

/**
 * `/api/health` at 2 connections while 20 connections post the worst documents in turn to
 * `/api/v1/check`, both for `durationS`.
 */
export async function healthUnderFlood(baseUrl: string, token: string, durationS = 20) {
  const documents = worstDocuments();
  const headers = { authorization: `Bearer ${token}`, "content-type": "application/json" };
  const flood = run({
    url: `${baseUrl}/api/v1/check`,
    connections: 20,
    duration: durationS,
    requests: documents.map((d) => ({
      method: "POST",
      path: "/api/v1/check",
      headers,
      body: JSON.stringify(d.document),
    })),
  });
  await new Promise((r) => setTimeout(r, 500)); // the flood first
  const health = await run({ url: `${baseUrl}/api/health`, connections: 2, duration: durationS - 1 });
  const flooded = await flood;
  return {
    documents: documents.map((d) => d.name),
    health: figuresOf(2, durationS - 1, health.latencies, health.result, health.statusCodes),
    flood: figuresOf(20, durationS, flooded.latencies, flooded.result, flooded.statusCodes),
  };
}

/**
 * The server's own floor: `/api/health` (one database query, no check) at the same 50 connections for
 * `durationS`, so the check's figures can be read against what the framework answers at that load
 * on this machine.
 */
export async function healthFloor(baseUrl: string, connections = 50, durationS = 10) {
  const health = await run({ url: `${baseUrl}/api/health`, connections, duration: durationS });
  return figuresOf(connections, durationS, health.latencies, health.result, health.statusCodes);
}
