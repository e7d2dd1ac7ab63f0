/**
 * The export format of a checked plan version, in one place: the writer (used by the API's export
 * route) and the verifier (used by `bin/jointproof check` and `verify`), so the rule is stated once.
 *
 * JSON: a plan document (format "jointproof.plan", version 1 — so the checker reads it as a plan)
 * with one extra field `export` (the waypoints, the report, the arm revision, the safety caution, …). `export.sha256` is
 * the hex SHA-256 (FIPS 180-4) of the UTF-8 bytes of `JSON.stringify` of the whole object without
 * `export.sha256`, keys in file order.
 *
 * CSV: `#` comment lines (plan, arm revision, verdict, findings, the safety caution, rateHz, units), a header
 * `t,<joint names…>`, one row per waypoint, and a last line `# sha256: <hex>`: the SHA-256 of every
 * byte before that line. Text fields (the joint names) are quoted per RFC 4180 §2 when they hold a
 * comma, a quote, CR or LF (quotes doubled), and a name starting with `=`, `+`, `-`, `@`, a tab or
 * CR gets a leading `'` so that a spreadsheet shows it as text instead of running it as a formula
 * (common practice for CSV exports; no standard states it).
 *
 * SHA-256 comes from Web Crypto (`crypto.subtle`), which Node and browsers both have.
 */
import { moveNumber, type Plan, type Report, type Samples } from "@/kinematics";
import { SAFETY_TEXT } from "@/lib/shared/safety";

/** Where an export comes from: the plan, its version and the arm revision it was checked against. */
export type ExportMeta = {
  plan: { id: string; name: string };
  planVersion: number;
  savedAt: string;
  armRevision: { armId: string; name: string; revision: number };
};

/** The two export formats. */
export type ExportFormat = "json" | "csv";

/** The outcome of a checksum verification: the digest, or the problem with the expected and computed digests. */
export type ChecksumResult =
  | { ok: true; format: ExportFormat; digest: string }
  | { ok: false; format: ExportFormat; problem: string; expected: string | null; actual: string | null };

const encoder = new TextEncoder();
const hexDigest = /^[0-9a-f]{64}$/;

/** Hex SHA-256 (FIPS 180-4) of bytes, or of a text's UTF-8 bytes. */
export async function sha256Hex(data: string | Uint8Array): Promise<string> {
  const bytes = typeof data === "string" ? encoder.encode(data) : data;
  const digest = new Uint8Array(await crypto.subtle.digest("SHA-256", bytes as Uint8Array<ArrayBuffer>));
  let out = "";
  for (const b of digest) out += b.toString(16).padStart(2, "0");
  return out;
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

/** The JSON export: the plan document with its `export` block, sealed by `export.sha256`. */
export async function buildJsonExport(
  document: Plan,
  report: Report,
  samples: Samples,
  meta: ExportMeta,
): Promise<string> {
  const body = {
    ...document,
    export: {
      ...meta,
      rateHz: samples.rateHz,
      safety: SAFETY_TEXT,
      joints: document.arm.joints.map((j) => j.name),
      columns: ["t", ...document.arm.joints.map((j) => j.name)],
      waypoints: waypointRows(samples),
      report,
    },
  };
  const sha256 = await sha256Hex(JSON.stringify(body));
  return JSON.stringify({ ...body, export: { ...body.export, sha256 } });
}

/** Leading characters a spreadsheet reads as the start of a formula. */
const formulaStart = /^[=+\-@\t\r]/;

/**
 * One CSV text field: a formula-looking start neutralised with a leading `'`, then quoted per
 * RFC 4180 §2 (rules 6 and 7) when it holds a comma, a quote, CR or LF.
 */
export function csvTextField(text: string): string {
  const safe = formulaStart.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** Text for a `#` comment line: one line, whatever the input holds. */
const oneLine = (s: string) => s.replace(/[\r\n]+/g, " ");

/** The CSV export: comment lines, the header, one row per waypoint, and the `# sha256:` line. */
export async function buildCsvExport(
  document: Plan,
  report: Report,
  samples: Samples,
  meta: ExportMeta,
): Promise<string> {
  const faults = report.findings.filter((f) => f.severity === "fault").length;
  const cautions = report.findings.length - faults;
  const lines = [
    `# jointproof export: plan "${oneLine(meta.plan.name)}" (${meta.plan.id}) version ${meta.planVersion}, saved ${meta.savedAt}`,
    `# arm: ${oneLine(meta.armRevision.name)} revision ${meta.armRevision.revision} (${meta.armRevision.armId})`,
    `# verdict: ${report.verdict} (${faults} fault${faults === 1 ? "" : "s"}, ${cautions} caution${cautions === 1 ? "" : "s"})`,
    ...report.findings.map(
      (f) =>
        `# finding: ${f.severity} ${f.kind} move ${f.move === null ? "start" : moveNumber(f.move)} joint ${f.joint === null ? "-" : oneLine(document.arm.joints[f.joint]?.name ?? "-")}: ${oneLine(f.message)}`,
    ),
    `# safety: ${oneLine(SAFETY_TEXT)}`,
    `# rateHz: ${samples.rateHz}`,
    `# units: t in s; revolute joints in rad, prismatic joints in m`,
    ["t", ...document.arm.joints.map((j) => csvTextField(j.name))].join(","),
    ...waypointRows(samples).map((row) => row.join(",")),
  ];
  const content = lines.join("\n") + "\n";
  return `${content}# sha256: ${await sha256Hex(content)}\n`;
}

/** True when a parsed JSON document carries an `export` block (a plan document exported by the API). */
export function hasExportBlock(document: unknown): document is { export: Record<string, unknown> } {
  const block = (document as { export?: unknown } | null)?.export;
  return (
    typeof document === "object" &&
    document !== null &&
    typeof block === "object" &&
    block !== null &&
    !Array.isArray(block)
  );
}

/**
 * The plan document inside a JSON export: a copy without the `export` block, which the checksum
 * vouches for and the plan schema does not know. Every other field is left for the plan schema,
 * which refuses any it does not know; this is the one place an export's extra block is removed.
 */
export function planOfExport(document: { export: Record<string, unknown> }): Record<string, unknown> {
  const { export: _block, ...plan } = document;
  return plan;
}

/**
 * Verifies the checksum of a parsed JSON export. The document is not changed: the digest is taken
 * over a shallow copy whose `export` block lacks `sha256` (spreading keeps the keys in file order).
 */
export async function verifyJsonChecksum(document: { export: Record<string, unknown> }): Promise<ChecksumResult> {
  const stored = document.export.sha256;
  if (typeof stored !== "string" || !hexDigest.test(stored)) {
    return {
      ok: false,
      format: "json",
      problem: "export.sha256: is missing or is not 64 lowercase hex digits",
      expected: null,
      actual: null,
    };
  }
  const { sha256: _stored, ...rest } = document.export;
  const actual = await sha256Hex(JSON.stringify({ ...document, export: rest }));
  if (actual !== stored) {
    return {
      ok: false,
      format: "json",
      problem: `export.sha256: does not match the content (expected ${stored}, got ${actual})`,
      expected: stored,
      actual,
    };
  }
  return { ok: true, format: "json", digest: actual };
}

const LF = 0x0a;
const CR = 0x0d;
const checksumLine = /^# sha256: ([0-9a-f]{64})$/;
const latin1 = new TextDecoder("latin1");

/**
 * Verifies a CSV export's last line `# sha256: <hex>` against the bytes before it. Works on bytes,
 * not decoded text, so that any change of encoding or line endings is caught too.
 */
export async function verifyCsvChecksum(input: Uint8Array | string): Promise<ChecksumResult> {
  const bytes = typeof input === "string" ? encoder.encode(input) : input;
  let end = bytes.length;
  if (end > 0 && bytes[end - 1] === LF) end--; // the last line's own line feed is optional
  if (end > 0 && bytes[end - 1] === CR) end--;
  let start = end;
  while (start > 0 && bytes[start - 1] !== LF) start--;
  const match = checksumLine.exec(latin1.decode(bytes.subarray(start, end)));
  if (!match) {
    return {
      ok: false,
      format: "csv",
      problem: 'last line: must be "# sha256: <64 hex digits>" (the export\'s checksum line)',
      expected: null,
      actual: null,
    };
  }
  const stored = match[1];
  const actual = await sha256Hex(bytes.subarray(0, start));
  if (actual !== stored) {
    return {
      ok: false,
      format: "csv",
      problem: `# sha256 (last line): does not match the content (expected ${stored}, got ${actual})`,
      expected: stored,
      actual,
    };
  }
  return { ok: true, format: "csv", digest: actual };
}

/** Tells the export formats apart by content: a JSON export starts with `{` (after any blanks). */
export function exportFormatOf(input: Uint8Array | string): ExportFormat {
  const bytes = typeof input === "string" ? encoder.encode(input) : input;
  for (let i = 0; i < bytes.length; i++) {
    const c = bytes[i];
    if (c === 0x20 || c === 0x09 || c === LF || c === CR) continue;
    if (c === 0xef && bytes[i + 1] === 0xbb && bytes[i + 2] === 0xbf) {
      i += 2; // UTF-8 byte-order mark
      continue;
    }
    return c === 0x7b ? "json" : "csv";
  }
  return "csv";
}

/**
 * Verifies an export file of either format (told by content). A JSON file that is not valid JSON
 * or has no export block is refused with a problem, like a tampered one.
 */
export async function verifyExport(input: Uint8Array | string): Promise<ChecksumResult> {
  if (exportFormatOf(input) === "csv") return verifyCsvChecksum(input);
  let document: unknown;
  try {
    document = JSON.parse(typeof input === "string" ? input : new TextDecoder().decode(input));
  } catch (error) {
    return {
      ok: false,
      format: "json",
      problem: `not valid JSON (${error instanceof Error ? error.message : String(error)})`,
      expected: null,
      actual: null,
    };
  }
  if (!hasExportBlock(document)) {
    return {
      ok: false,
      format: "json",
      problem: "export: is missing (not a JSON export: no export block with a sha256)",
      expected: null,
      actual: null,
    };
  }
  return verifyJsonChecksum(document);
}

/** The verdict an export recorded (`export.report.verdict`), or null when it records none. */
export function recordedVerdict(document: { export: Record<string, unknown> }): string | null {
  const verdict = (document.export.report as { verdict?: unknown } | null | undefined)?.verdict;
  return typeof verdict === "string" ? verdict : null;
}
