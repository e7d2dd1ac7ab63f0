/**
 * Exports of a checked plan version: the waypoint list sampled at a chosen rate, the engine's
 * report, the arm revision and a SHA-256 of the content, as JSON or CSV.
 *
 * JSON: a plan document (format "jointproof.plan", version 1 — so the checker reads it as a plan)
 * with one extra field `export`. `export.sha256` is the hex SHA-256 (FIPS 180-4) of the UTF-8
 * bytes of `JSON.stringify` of the whole object without `export.sha256`, keys in file order.
 *
 * CSV: `#` comment lines (plan, arm revision, verdict, findings, rate), a header `t,<joint names…>`,
 * one row per waypoint, and a last line `# sha256: <hex>` over every byte before that line.
 */
import { createHash } from "node:crypto";
import type { Plan, Report, Samples } from "@/kinematics";

export type ExportMeta = {
  plan: { id: string; name: string };
  planVersion: number;
  savedAt: string;
  armRevision: { armId: string; name: string; revision: number };
};

function sha256Hex(text: string): string {
  return createHash("sha256").update(text, "utf8").digest("hex");
}

/** Waypoint rows `[t, q0, q1, …]` from sampled positions. */
function waypointRows(samples: Samples): number[][] {
  const n = samples.jointCount;
  const rows: number[][] = new Array(samples.count);
  for (let k = 0; k < samples.count; k++) {
    const row = new Array<number>(n + 1);
    row[0] = samples.timeS[k];
    for (let j = 0; j < n; j++) row[j + 1] = samples.position[k * n + j];
    rows[k] = row;
  }
  return rows;
}

export function buildJsonExport(document: Plan, report: Report, samples: Samples, meta: ExportMeta): string {
  const body = {
    ...document,
    export: {
      ...meta,
      rateHz: samples.rateHz,
      joints: document.arm.joints.map((j) => j.name),
      columns: ["t", ...document.arm.joints.map((j) => j.name)],
      waypoints: waypointRows(samples),
      report,
    },
  };
  const sha256 = sha256Hex(JSON.stringify(body));
  return JSON.stringify({ ...body, export: { ...body.export, sha256 } });
}

/** Verifies a JSON export's checksum: recomputes it over the content without `export.sha256`. */
export function verifyJsonExport(text: string): { ok: boolean; expected: string | null; actual: string } {
  const parsed = JSON.parse(text) as { export?: Record<string, unknown> };
  const expected = typeof parsed.export?.sha256 === "string" ? parsed.export.sha256 : null;
  if (parsed.export) delete parsed.export.sha256;
  const actual = sha256Hex(JSON.stringify(parsed));
  return { ok: expected === actual, expected, actual };
}

const oneLine = (s: string) => s.replace(/[\r\n]+/g, " ");

export function buildCsvExport(document: Plan, report: Report, samples: Samples, meta: ExportMeta): string {
  const faults = report.findings.filter((f) => f.severity === "fault").length;
  const cautions = report.findings.length - faults;
  const lines = [
    `# jointproof export: plan "${oneLine(meta.plan.name)}" (${meta.plan.id}) version ${meta.planVersion}, saved ${meta.savedAt}`,
    `# arm: ${oneLine(meta.armRevision.name)} revision ${meta.armRevision.revision} (${meta.armRevision.armId})`,
    `# verdict: ${report.verdict} (${faults} fault${faults === 1 ? "" : "s"}, ${cautions} caution${cautions === 1 ? "" : "s"})`,
    ...report.findings.map(
      (f) => `# finding: ${f.severity} ${f.kind} move ${f.move ?? "start"} joint ${f.joint ?? "-"}: ${oneLine(f.message)}`,
    ),
    `# rate_hz: ${samples.rateHz}`,
    `# units: t in s; revolute joints in rad, prismatic joints in m`,
    ["t", ...document.arm.joints.map((j) => j.name)].join(","),
    ...waypointRows(samples).map((row) => row.join(",")),
  ];
  const content = lines.join("\n") + "\n";
  return `${content}# sha256: ${sha256Hex(content)}\n`;
}

/** Verifies a CSV export's last-line checksum. */
export function verifyCsvExport(text: string): { ok: boolean; expected: string | null; actual: string } {
  const match = /(^|\n)# sha256: ([0-9a-f]{64})\n?$/.exec(text);
  const content = match ? text.slice(0, match.index + match[1].length) : text;
  const actual = sha256Hex(content);
  return { ok: match !== null && match[2] === actual, expected: match ? match[2] : null, actual };
}
