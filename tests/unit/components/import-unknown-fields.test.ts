import { describe, expect, it } from "vitest";
import { importPlanText } from "@/components/editor/import-dialog";
import { check, formatProblem, samplePlan } from "@/kinematics";
import { buildJsonExport } from "@/lib/shared/export-format";
import { demoPlan, pose } from "./helpers";

const meta = {
  plan: { id: "00000000-0000-4000-8000-000000000397", name: "Import probe" },
  planVersion: 1,
  savedAt: "2026-12-02T14:05:00.000Z",
  armRevision: { armId: "00000000-0000-4000-8000-000000000201", name: "Light arm", revision: 1 },
};

describe("bench import and unknown fields", () => {
  it("imports a JSON export (the plan with its export block) as the plan it holds", async () => {
    const exported = demoPlan([{ goal: pose(0.4, -0.2), duration: 2, shape: "cubic" }]);
    const json = await buildJsonExport(exported, check(exported), samplePlan(exported, { rateHz: 20 }), meta);
    const r = importPlanText(json, demoPlan());
    expect(r.ok ? [] : r.problems.map((p) => formatProblem(p))).toEqual([]);
    if (r.ok) expect(r.plan.moves).toEqual(exported.moves);
  });

  it("refuses a file with a misspelt limit, at the field and naming the one meant, as the CLI and the API do", () => {
    const current = demoPlan();
    const joints = current.arm.joints.map((j, i) => {
      if (i !== 2) return j;
      const { maxAcceleration, ...rest } = j;
      return { ...rest, maxAccelaration: maxAcceleration ?? 1 };
    });
    const text = JSON.stringify({ ...current, arm: { ...current.arm, joints }, moves: [] });
    const r = importPlanText(text, current);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map((p) => formatProblem(p))).toEqual([
      'arm.joints[2].maxAccelaration: is not a known field; did you mean "maxAcceleration"?',
    ]);
  });
});
