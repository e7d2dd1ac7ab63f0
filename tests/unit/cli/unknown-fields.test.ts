import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { check, formatProblem, parsePlan, samplePlan } from "@/kinematics";
import { buildJsonExport, sha256Hex } from "@/lib/shared/export-format";

const root = join(__dirname, "..", "..", "..");
const bin = join(root, "bin", "jointproof");
const fixture = (name: string) => JSON.parse(readFileSync(join(root, "tests", "fixtures", "plans", name), "utf8"));

function run(args: string[]) {
  const result = spawnSync(process.execPath, [bin, ...args], { cwd: root, encoding: "utf8" });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

let scratch: string;
function writeScratch(name: string, value: unknown): string {
  const path = join(scratch, name);
  writeFileSync(path, typeof value === "string" ? value : JSON.stringify(value, null, 2));
  return path;
}

/** gentle-pass.json with a 1 rad/s² acceleration limit on joints[2] under `key`: spelt right, the plan faults. */
function withElbowLimit(key: string) {
  const document = fixture("gentle-pass.json");
  const joint = document.arm.joints[2];
  delete joint.maxAcceleration;
  joint[key] = 1;
  return document;
}

beforeAll(() => {
  scratch = mkdtempSync(join(tmpdir(), "jointproof-unknown-"));
  run(["--help"]); // builds the cached bundle once
}, 60_000);

describe("jointproof check refuses unknown fields with the engine's own problem lines", () => {
  it("a 1 rad/s² acceleration limit spelt right makes the plan fault (exit 1)", () => {
    const { code, stdout } = run(["check", writeScratch("right.json", withElbowLimit("maxAcceleration"))]);
    expect(code).toBe(1);
    expect(stdout).toContain("accel-over");
  });

  it('"maxAccelaration" is refused with exit 2 and the line the API gives, instead of a pass without the limit', () => {
    const document = withElbowLimit("maxAccelaration");
    const { code, stdout, stderr } = run(["check", writeScratch("misspelt.json", document)]);
    expect(code).toBe(2);
    expect(stdout).toBe("");
    expect(stderr).toContain('arm.joints[2].maxAccelaration: is not a known field; did you mean "maxAcceleration"?');
    // the same schema and formatter as the API and the bench
    const parsed = parsePlan(document);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) for (const p of parsed.problems) expect(stderr).toContain(formatProblem(p));
  });

  it('"keepOutt" is refused with exit 2, naming "keepOut"', () => {
    const document = { ...fixture("gentle-pass.json"), keepOutt: [{ min: [0.2, -0.1, 0], max: [0.4, 0.1, 0.3] }] };
    const { code, stderr } = run(["check", writeScratch("keep-outt.json", document)]);
    expect(code).toBe(2);
    expect(stderr).toContain('keepOutt: is not a known field; did you mean "keepOut"?');
  });

  it("an export still checks with its export block, and a resealed export with a misspelt field is refused (the checksum vouches for no field)", async () => {
    const parsed = parsePlan(withElbowLimit("maxAcceleration"));
    if (!parsed.ok) throw new Error("fixture does not parse");
    const plan = parsed.value;
    const meta = {
      plan: { id: "00000000-0000-4000-8000-000000000398", name: "Probe" },
      planVersion: 1,
      savedAt: "2026-12-02T14:05:00.000Z",
      armRevision: { armId: "00000000-0000-4000-8000-000000000201", name: plan.arm.name, revision: 1 },
    };
    const json = await buildJsonExport(plan, check(plan), samplePlan(plan, { rateHz: 20 }), meta);
    const untouched = run(["check", writeScratch("export.json", json)]);
    expect(untouched.stdout).toContain("Export checksum verified");
    expect(untouched.code).toBe(1); // the fault, agreeing with the export

    // rename the limit and seal the export again, as anyone can: still refused at the field
    const doctored = JSON.parse(json);
    const joint = doctored.arm.joints[2];
    joint.maxAccelaration = joint.maxAcceleration;
    delete joint.maxAcceleration;
    delete doctored.export.sha256;
    doctored.export.sha256 = await sha256Hex(JSON.stringify(doctored));
    const resealed = run(["check", writeScratch("resealed.json", doctored)]);
    expect(resealed.code).toBe(2);
    expect(resealed.stderr).toContain(
      'arm.joints[2].maxAccelaration: is not a known field; did you mean "maxAcceleration"?',
    );
  });

  it("jointproof scan refuses an arm file with a misspelt limit, naming the field and the file", () => {
    const arm = withElbowLimit("maxAccelaration").arm;
    const armFile = writeScratch("arm.json", arm);
    const log = writeScratch(
      "log.csv",
      `t,${arm.joints.map((j: { name: string }) => j.name).join(",")}\n0,${arm.joints.map(() => 0).join(",")}\n0.001,${arm.joints.map(() => 0).join(",")}\n`,
    );
    const { code, stderr } = run(["scan", log, "--arm", armFile]);
    expect(code).toBe(2);
    expect(stderr).toContain(
      `${armFile}: joints[2].maxAccelaration: is not a known field; did you mean "maxAcceleration"?`,
    );
  });
});
