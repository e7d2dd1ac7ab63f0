import { describe, expect, it } from "vitest";
import { linkSeverityOf } from "@/components/viewer/link-severity";
import { check } from "@/kinematics";
import { demoPlan, pose } from "./helpers";

describe("stage link tint", () => {
  it("a clearance finding tints the link the engine names, not a joint's link", () => {
    const plan = demoPlan([{ goal: pose(0, 1.2, 2.5), duration: 2 }]);
    const chain = plan.arm.chain!;
    const report = check(plan);
    const handle = chain.joints.findIndex((j) => j.link.name === "handle") + 1;
    expect(handle).toBeGreaterThan(0);
    expect(report.moves[0].findings.some((f) => f.kind === "clearance" && f.link === "handle")).toBe(true);
    const rows = linkSeverityOf(report.moves, chain);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toHaveLength(chain.joints.length + 1);
    expect(rows[0][handle]).toBe("fault");
    expect(rows[0][0]).toBeNull(); // the base stays clear
  });

  it("a joint's speed fault tints the link that joint drives", () => {
    // base 1.0 rad over 0.4 s: speed and acceleration faults on joint 0 → link 1
    const plan = demoPlan([{ goal: pose(1.0), duration: 0.4 }]);
    const rows = linkSeverityOf(check(plan).moves, plan.arm.chain!);
    expect(rows[0][1]).toBe("fault");
    expect(rows[0].filter((s) => s !== null)).toHaveLength(1);
  });
});
