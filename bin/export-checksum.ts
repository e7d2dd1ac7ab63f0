/**
 * Checksum verification of exports (issue 5), for `jointproof check EXPORT.json` and
 * `jointproof verify EXPORT.json|EXPORT.csv`. Node-only (node:crypto), so it lives in bin/, not in
 * the engine.
 *
 * The rules are the export format's (lib/server/export.ts), restated here because the checker must
 * verify files on machines that have only the checkout's engine and CLI:
 * - JSON: `export.sha256` is the hex SHA-256 (FIPS 180-4) of the UTF-8 bytes of `JSON.stringify` of
 *   the whole document without `export.sha256`, keys in file order.
 * - CSV: the last line is `# sha256: <hex>`, the SHA-256 of every byte before that line.
 */
import { createHash } from "node:crypto";

/** The outcome of a checksum verification. */
export type ChecksumResult =
  | { ok: true; digest: string }
  | { ok: false; problem: string };

/** Which export format a file holds. */
export type ExportFormat = "json" | "csv";

const hexDigest = /^[0-9a-f]{64}$/;

function sha256Hex(data: string | Uint8Array): string {
  return createHash("sha256").update(data).digest("hex");
}

/** True when a parsed JSON document carries an `export` block (a plan document exported by the API). */
export function hasExportBlock(document: unknown): document is { export: Record<string, unknown> } {
  const block = (document as { export?: unknown } | null)?.export;
  return typeof document === "object" && document !== null && typeof block === "object" && block !== null && !Array.isArray(block);
}

/**
 * Verifies the checksum of a parsed JSON export. The document is not changed: the digest is taken
 * over a shallow copy whose `export` block lacks `sha256` (spreading keeps the keys in file order).
 */
export function verifyJsonChecksum(document: { export: Record<string, unknown> }): ChecksumResult {
  const stored = document.export.sha256;
  if (typeof stored !== "string" || !hexDigest.test(stored)) {
    return { ok: false, problem: "export.sha256: is missing or is not 64 lowercase hex digits" };
  }
  const { sha256: _stored, ...rest } = document.export;
  const actual = sha256Hex(JSON.stringify({ ...document, export: rest }));
  if (actual !== stored) {
    return { ok: false, problem: `export.sha256: does not match the content (expected ${stored}, got ${actual})` };
  }
  return { ok: true, digest: actual };
}

const LF = 0x0a;
const CR = 0x0d;
const checksumLine = /^# sha256: ([0-9a-f]{64})$/;

/**
 * Verifies a CSV export's last line `# sha256: <hex>` against the bytes before it. Works on bytes,
 * not decoded text, so that any change of encoding or line endings is caught too.
 */
export function verifyCsvChecksum(bytes: Uint8Array): ChecksumResult {
  let end = bytes.length;
  if (end > 0 && bytes[end - 1] === LF) end--; // the last line's own line feed is optional
  if (end > 0 && bytes[end - 1] === CR) end--;
  let start = end;
  while (start > 0 && bytes[start - 1] !== LF) start--;
  const last = Buffer.from(bytes.buffer, bytes.byteOffset + start, end - start).toString("latin1");
  const match = checksumLine.exec(last);
  if (!match) return { ok: false, problem: 'last line: must be "# sha256: <64 hex digits>" (the export\'s checksum line)' };
  const stored = match[1];
  const actual = sha256Hex(bytes.subarray(0, start));
  if (actual !== stored) {
    return { ok: false, problem: `# sha256 (last line): does not match the content (expected ${stored}, got ${actual})` };
  }
  return { ok: true, digest: actual };
}

/** Tells the export formats apart by content: a JSON export starts with `{` (after any blanks). */
export function exportFormatOf(bytes: Uint8Array): ExportFormat {
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

/** The verdict an export recorded (`export.report.verdict`), or null when it records none. */
export function recordedVerdict(document: { export: Record<string, unknown> }): string | null {
  const verdict = (document.export.report as { verdict?: unknown } | null | undefined)?.verdict;
  return typeof verdict === "string" ? verdict : null;
}
