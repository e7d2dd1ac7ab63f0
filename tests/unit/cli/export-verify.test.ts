// An export → bin/jointproof check verifies its checksum and finds the same verdict. The exports are
// produced by the writer of the one export-format module (lib/shared/export-format.ts) that the API's
// export route uses, so these tests pin the command-line verifier against the real export format.
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { check, parsePlan, samplePlan, type Plan } from "@/kinematics";
import {
  buildCsvExport,
  buildJsonExport,
  csvTextField,
  planOfExport,
  verifyExport,
  type ExportMeta,
} from "@/lib/shared/export-format";
import { SAFETY_TEXT } from "@/lib/shared/safety";

const root = join(__dirname, "..", "..", "..");
const bin = join(root, "bin", "jointproof");
const plans = join(root, "tests", "fixtures", "plans");

function run(args: string[], input?: string) {
  const result = spawnSync(process.execPath, [bin, ...args], { cwd: root, input, encoding: "utf8" });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

const meta: ExportMeta = {
  plan: { id: "3f0c9a52-5b7e-4d1e-9a11-0c2d7e6b4a10", name: "Gentle pose change" },
  planVersion: 3,
  savedAt: "2025-01-15T10:20:30.000Z",
  armRevision: { armId: "7b2e4c1d-0a9f-4e3b-8c5d-2f1a6e9b0c34", name: "Demo bench arm (invented)", revision: 2 },
};

function loadPlan(name: string): Plan {
  const parsed = parsePlan(JSON.parse(readFileSync(join(plans, name), "utf8")));
  if (!parsed.ok) throw new Error(`fixture ${name} does not parse`);
  return parsed.value;
}

/** Both exports of a plan, exactly as the API builds them (waypoints at 100 Hz). */
async function exportsOfPlan(plan: Plan) {
  const report = check(plan);
  const samples = samplePlan(plan, { rateHz: 100 });
  return {
    report,
    json: await buildJsonExport(plan, report, samples, meta),
    csv: await buildCsvExport(plan, report, samples, meta),
  };
}

/** Both exports of a fixture plan. */
function exportsOf(name: string) {
  return exportsOfPlan(loadPlan(name));
}

/** The digest the verifier computed for a tampered file. */
async function computed(text: string): Promise<string | null> {
  const result = await verifyExport(text);
  return result.ok ? result.digest : result.actual;
}

/** Re-seals a JSON export by the documented rule, so that only its content (not its checksum) is wrong. */
function reseal(document: { export: Record<string, unknown> }): string {
  const { sha256: _old, ...rest } = document.export;
  const body = { ...document, export: rest };
  const sha256 = createHash("sha256").update(JSON.stringify(body), "utf8").digest("hex");
  return JSON.stringify({ ...body, export: { ...rest, sha256 } });
}

let scratch: string;
const file = (name: string, text: string) => {
  const path = join(scratch, name);
  writeFileSync(path, text);
  return path;
};

beforeAll(() => {
  scratch = mkdtempSync(join(tmpdir(), "jointproof-export-"));
  run(["--help"]); // builds the cached bundle once
}, 60_000);

describe("jointproof check on a JSON export", () => {
  it("verifies the checksum of an untouched export and finds the same passing verdict", async () => {
    const { json } = await exportsOf("gentle-pass.json");
    expect((await verifyExport(json)).ok).toBe(true); // the export's own verifier agrees it is sealed
    const { code, stdout, stderr } = run(["check", file("pass.json", json)]);
    expect(stderr).toBe("");
    expect(code).toBe(0);
    const digest = JSON.parse(json).export.sha256 as string;
    expect(stdout).toContain(`Export checksum verified: export.sha256 ${digest} matches the content.`);
    expect(stdout).toContain("Verdict agrees with the export: PASS.");
  });

  it("a faulting export still verifies, agrees, and exits 1 for the fault", async () => {
    const { json, report } = await exportsOf("instant-jump.json");
    expect(report.verdict).toBe("fault");
    const { code, stdout } = run(["check", file("fault.json", json)]);
    expect(code).toBe(1);
    expect(stdout).toContain("Export checksum verified");
    expect(stdout).toContain("Verdict agrees with the export: FAULT.");
  });

  it("with --json, stdout is the report alone and the verification lines go to stderr", async () => {
    const { json, report } = await exportsOf("just-long-enough.json");
    const { code, stdout, stderr } = run(["check", file("caution.json", json), "--json"]);
    expect(code).toBe(0);
    expect(JSON.parse(stdout)).toEqual(JSON.parse(JSON.stringify(report)));
    expect(stderr).toContain("Export checksum verified");
    expect(stderr).toContain("Verdict agrees with the export: CAUTION.");
  });

  it("a tampered waypoint makes the checksum fail: exit 2 with the expected and the computed digest", async () => {
    const { json } = await exportsOf("gentle-pass.json");
    const document = JSON.parse(json);
    document.export.waypoints[10][1] += 0.001;
    const tampered = JSON.stringify(document);
    expect((await verifyExport(tampered)).ok).toBe(false);
    const actual = await computed(tampered);
    const { code, stdout, stderr } = run(["check", file("tampered.json", tampered)]);
    expect(code).toBe(2);
    expect(stdout).toBe("");
    expect(stderr.trim()).toBe(
      `export.sha256: does not match the content (expected ${document.export.sha256}, got ${actual})`,
    );
  });

  it("a tampered plan (a longer move duration) also fails the checksum, before any check runs", async () => {
    const document = JSON.parse((await exportsOf("instant-jump.json")).json);
    document.moves[0].duration = 2;
    const { code, stderr } = run(["check", file("tampered-plan.json", JSON.stringify(document))]);
    expect(code).toBe(2);
    expect(stderr).toMatch(
      /^export\.sha256: does not match the content \(expected [0-9a-f]{64}, got [0-9a-f]{64}\)\n$/,
    );
  });

  it("a missing checksum is refused with exit 2", async () => {
    const document = JSON.parse((await exportsOf("gentle-pass.json")).json);
    delete document.export.sha256;
    const { code, stderr } = run(["check", file("unsealed.json", JSON.stringify(document))]);
    expect(code).toBe(2);
    expect(stderr).toContain("export.sha256: is missing");
  });

  it("a sealed export whose recorded verdict differs from the fresh check exits 1 and says so", async () => {
    const document = JSON.parse((await exportsOf("gentle-pass.json")).json);
    document.export.report.verdict = "fault";
    const resealed = reseal(document);
    expect((await verifyExport(resealed)).ok).toBe(true); // the checksum is right; only the verdict is off
    const { code, stdout } = run(["check", file("disagree.json", resealed)]);
    expect(code).toBe(1);
    expect(stdout).toContain("Export checksum verified");
    expect(stdout).toContain("Verdict disagrees with the export: it records FAULT, this check finds PASS.");
  });

  it("a plain plan document (no export block) is checked without any checksum line", async () => {
    const { code, stdout } = run(["check", join(plans, "gentle-pass.json")]);
    expect(code).toBe(0);
    expect(stdout).not.toContain("checksum");
    expect(stdout.startsWith("Plan check for arm")).toBe(true);
  });
});

describe("jointproof verify", () => {
  it("verifies an untouched CSV export and an untouched JSON export", async () => {
    const { json, csv } = await exportsOf("just-long-enough.json");
    expect((await verifyExport(csv)).ok).toBe(true);
    const csvRun = run(["verify", file("ok.csv", csv)]);
    expect(csvRun.code).toBe(0);
    const csvDigest = /# sha256: ([0-9a-f]{64})\n$/.exec(csv)![1];
    expect(csvRun.stdout).toBe(
      `Export checksum verified (CSV): # sha256 (last line) ${csvDigest} matches the content.\n`,
    );
    const jsonRun = run(["verify", file("ok.json", json), "--json"]);
    expect(jsonRun.code).toBe(0);
    expect(JSON.parse(jsonRun.stdout)).toEqual({
      format: "json",
      verified: true,
      sha256: JSON.parse(json).export.sha256,
    });
  });

  it("a CSV export with one digit changed in a waypoint row fails with both digests", async () => {
    const { csv } = await exportsOf("gentle-pass.json");
    const lines = csv.split("\n");
    const row = lines.findIndex((l) => /^0\.5,/.test(l));
    expect(row).toBeGreaterThan(0);
    lines[row] = lines[row].replace(/,(-?\d)/, (_m, d: string) => `,${d === "9" ? "8" : String(Number(d) + 1)}`);
    const tampered = lines.join("\n");
    expect(tampered).not.toBe(csv);
    const { code, stderr } = run(["verify", file("tampered.csv", tampered)]);
    expect(code).toBe(2);
    expect(stderr.trim()).toBe(
      `# sha256 (last line): does not match the content (expected ${/# sha256: ([0-9a-f]{64})\n$/.exec(csv)![1]}, got ${await computed(tampered)})`,
    );
  });

  it("a CSV export rewritten with CRLF line endings no longer matches (the digest is over bytes)", async () => {
    const { csv } = await exportsOf("gentle-pass.json");
    const { code, stderr } = run(["verify", file("crlf.csv", csv.replace(/\n/g, "\r\n"))]);
    expect(code).toBe(2);
    expect(stderr).toContain("does not match the content");
  });

  it("a CSV without its checksum line and a JSON plan without an export block are refused", async () => {
    const { csv } = await exportsOf("gentle-pass.json");
    const unsealed = csv.slice(0, csv.lastIndexOf("# sha256:"));
    const csvRun = run(["verify", file("unsealed.csv", unsealed)]);
    expect(csvRun.code).toBe(2);
    expect(csvRun.stderr).toContain("last line: must be");
    const jsonRun = run(["verify", join(plans, "gentle-pass.json")]);
    expect(jsonRun.code).toBe(2);
    expect(jsonRun.stderr).toContain("export: is missing");
  });

  it("a tampered JSON export fails verify as it fails check", async () => {
    const document = JSON.parse((await exportsOf("gentle-pass.json")).json);
    document.export.rateHz = 50;
    const { code, stderr } = run(["verify", "-"], JSON.stringify(document));
    expect(code).toBe(2);
    expect(stderr).toMatch(/^export\.sha256: does not match the content/);
  });
});

/** Splits CSV text into records of fields per RFC 4180 §2 (quoted fields may hold commas, quotes and line breaks). */
function parseCsvRecords(text: string): string[][] {
  const records: string[][] = [];
  let record: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"' && field === "") quoted = true;
    else if (c === ",") {
      record.push(field);
      field = "";
    } else if (c === "\n") {
      record.push(field);
      records.push(record);
      record = [];
      field = "";
    } else field += c;
  }
  return records;
}

describe("export format round trip", () => {
  it("both files carry the safety caution and name the waypoint rate rateHz, inside what the checksum covers", async () => {
    const { json, csv } = await exportsOf("gentle-pass.json");
    const document = JSON.parse(json) as { export: { safety: string; rateHz: number } };
    expect(document.export.safety).toBe(SAFETY_TEXT);
    expect(document.export.rateHz).toBe(100);
    const lines = csv.split("\n");
    expect(lines).toContain(`# safety: ${SAFETY_TEXT}`);
    expect(lines).toContain("# rateHz: 100");
    expect(lines.some((l) => l.startsWith("# rate_hz"))).toBe(false);
    // the caution is sealed: removing it breaks the checksum
    expect((await verifyExport(csv.replace(/^# safety: .*\n/m, ""))).ok).toBe(false);
  });

  it("a JSON export reads back as the same plan and the same report, and its checksum verifies", async () => {
    const plan = loadPlan("just-long-enough.json");
    const { json, report } = await exportsOfPlan(plan);
    const back = parsePlan(planOfExport(JSON.parse(json)));
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(back.value).toEqual(plan);
    expect(JSON.parse(json).export.report).toEqual(JSON.parse(JSON.stringify(report)));
    expect(await verifyExport(json)).toMatchObject({ ok: true, format: "json" });
  });

  it("a CSV export's waypoint rows read back to the sampled positions, and its checksum verifies", async () => {
    const plan = loadPlan("gentle-pass.json");
    const { csv } = await exportsOfPlan(plan);
    const samples = samplePlan(plan, { rateHz: 100 });
    const records = parseCsvRecords(csv).filter((r) => !r[0].startsWith("#"));
    expect(records[0]).toEqual(["t", ...plan.arm.joints.map((j) => j.name)]);
    expect(records).toHaveLength(1 + samples.count);
    const n = samples.jointCount;
    for (const k of [0, 57, samples.count - 1]) {
      expect(Number(records[1 + k][0])).toBe(samples.timeS[k]); // shortest round-trip decimals: exact
      for (let j = 0; j < n; j++) expect(Number(records[1 + k][1 + j])).toBe(samples.position[k * n + j]);
    }
    expect(await verifyExport(csv)).toMatchObject({ ok: true, format: "csv" });
  });
});

describe("CSV export text fields (RFC 4180 §2 quoting; formula prefixes neutralised as common practice for CSV exports)", () => {
  const awkward = ["a,b", 'x"y', "two\nlines", "=SUM(A1)", "+1", "-x", "@me"];

  it("quotes a field holding a comma, a quote, CR or LF and doubles its quotes", () => {
    expect(csvTextField("a,b")).toBe('"a,b"');
    expect(csvTextField('x"y')).toBe('"x""y"');
    expect(csvTextField("two\nlines")).toBe('"two\nlines"');
    expect(csvTextField("cr\rhere")).toBe('"cr\rhere"');
    expect(csvTextField("elbow")).toBe("elbow");
  });

  it("puts a ' before a name a spreadsheet would run as a formula (=, +, -, @, tab, CR at the start)", () => {
    expect(["=SUM(A1)", "+1", "-x", "@me", "\tx"].map(csvTextField)).toEqual([
      "'=SUM(A1)",
      "'+1",
      "'-x",
      "'@me",
      "'\tx",
    ]);
    expect(csvTextField("\rx")).toBe('"\'\rx"');
    expect(csvTextField("wrist-pitch")).toBe("wrist-pitch"); // a '-' inside a name is harmless
  });

  it("keeps the header one record with one field per joint, and the command-line verifier still accepts the file", async () => {
    const plan = loadPlan("gentle-pass.json");
    const renamed: Plan = {
      ...plan,
      arm: { ...plan.arm, joints: plan.arm.joints.map((j, i) => ({ ...j, name: awkward[i] })) },
    };
    const { csv } = await exportsOfPlan(renamed);
    const header = parseCsvRecords(csv).find((r) => r[0] === "t");
    expect(header).toEqual(["t", "a,b", 'x"y', "two\nlines", "'=SUM(A1)", "'+1", "'-x", "'@me"]);
    // no line of the file starts a formula
    for (const line of csv.split("\n")) expect(/^[=+\-@\t\r]/.test(line)).toBe(false);
    expect(await verifyExport(csv)).toMatchObject({ ok: true });
    const { code, stdout } = run(["verify", file("awkward.csv", csv)]);
    expect(code).toBe(0);
    expect(stdout).toContain("Export checksum verified (CSV)");
  });
});
