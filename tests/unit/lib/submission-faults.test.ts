import { describe, expect, it } from "vitest";
import { hasFaults, reportFaults } from "@/lib/shared/courses/faults";

const finding = (severity: string) => ({
  kind: "speed-over",
  severity,
  move: 0,
  joint: 0,
  value: 2,
  limit: 1,
  message: "m",
});

describe("which submissions need a confirmed approval", () => {
  it("a fault verdict, a fault finding, or a report that cannot be read", () => {
    expect(hasFaults({ verdict: "fault", report: { verdict: "fault", findings: [finding("fault")] } })).toBe(true);
    // a stored verdict column that disagrees with its report: either fault is enough
    expect(hasFaults({ verdict: "pass", report: { verdict: "fault", findings: [] } })).toBe(true);
    expect(hasFaults({ verdict: "caution", report: { verdict: "caution", findings: [finding("fault")] } })).toBe(true);
    expect(hasFaults({ verdict: "pass", report: "not a report" })).toBe(true);
  });

  it("not a passing or caution-only check", () => {
    expect(hasFaults({ verdict: "pass", report: { verdict: "pass", findings: [] } })).toBe(false);
    expect(hasFaults({ verdict: "caution", report: { verdict: "caution", findings: [finding("caution")] } })).toBe(
      false,
    );
  });

  it("lists the fault findings in the report's order and skips unreadable ones", () => {
    const faults = reportFaults({
      verdict: "fault",
      findings: [finding("caution"), finding("fault"), { severity: "fault" }],
    });
    expect(faults).toEqual([{ kind: "speed-over", move: 0, joint: 0, message: "m" }]);
  });
});
