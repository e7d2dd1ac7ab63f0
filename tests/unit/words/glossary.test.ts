import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { HINTS, hintFor, shapeHint } from "@/lib/shared/glossary";

// The words a student will not know, listed in issue 13's "One vocabulary" paragraph; the peak
// speed ratios in the shape hints are Lynch & Park, Modern Robotics (2017), §9.2.1 (memory):
// cubic 1.5·D/T, quintic 1.875·D/T.
describe("glossary hints", () => {
  it("has a one-sentence hint for caution ratio, cubic, quintic, trapezoid, control period and duration sweep", () => {
    expect(Object.keys(HINTS).sort()).toEqual([
      "cautionRatio",
      "controlPeriod",
      "cubic",
      "durationSweep",
      "quintic",
      "trapezoid",
    ]);
    for (const { hint } of Object.values(HINTS)) {
      expect(hint.length).toBeGreaterThan(20);
      expect(hint.length).toBeLessThanOrEqual(160);
      expect(hint.trim().endsWith(".")).toBe(true);
    }
  });

  it("states the textbook peak-speed ratios of the cubic and the quintic", () => {
    expect(hintFor("cubic")).toContain("1.5 ×");
    expect(hintFor("quintic")).toContain("1.875 ×");
  });

  it("gives a hint for each move shape and none for an unknown one", () => {
    expect(shapeHint("trapezoid")).toBe(HINTS.trapezoid.hint);
    expect(shapeHint("spline")).toBeUndefined();
  });

  it("lists every hinted word in the contributor guide's glossary", () => {
    const guide = readFileSync("DEVELOPERS.md", "utf8");
    const glossary = guide.slice(guide.indexOf("## Glossary"), guide.indexOf("## Decisions"));
    expect(glossary.length).toBeGreaterThan(0);
    for (const { label } of Object.values(HINTS)) expect(glossary).toContain(`**${label}**`);
  });
});
