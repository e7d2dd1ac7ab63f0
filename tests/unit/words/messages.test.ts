import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { check, parseArm, parsePlan, parseRecordingCsv, streamCheck, type Arm, type Report } from "@/kinematics";
import { AppError, type ErrorKind } from "@/lib/server/errors";
import {
  courseRefusal,
  coursePermissions,
  projectPermissions,
  projectRefusal,
  sitePermissions,
  siteRefusal,
  type CourseAction,
  type ProjectAction,
  type SiteAction,
} from "@/lib/server/permissions";
import { repoPath } from "../kinematics/arm/helpers";
import { createVersionSchema } from "@/lib/shared/schemas/api";
import { repairDatasetSchema } from "@/lib/shared/schemas/datasets";
import { commentSchema } from "@/lib/shared/schemas/reviews";
import { ruleProblems } from "@/lib/shared/courses/rules";

// Messages in one voice (DEVELOPERS.md, Glossary): predictions say "would", the gripper is given in
// millimetres, field messages read "must be 0 or greater", joints are named by name, refusals say
// who can grant access. The project's own wording rules; no outside source.

const readJson = (rel: string) => JSON.parse(readFileSync(repoPath(rel), "utf8"));

function planOf(doc: unknown) {
  const parsed = parsePlan(doc);
  if (!parsed.ok) throw new Error(parsed.problems.map((p) => p.message).join("; "));
  return parsed.value;
}

/** Plans that between them raise every plan finding kind, as faults and as cautions. */
function samplePlans() {
  const everyKind = readJson("tests/fixtures/arm-plans/bench-e2e.json");
  everyKind.moves.push(
    { goal: [0, 1.5, 0, 0, 3.3, 0, 0.02], duration: 4 },
    { goal: [0.5, 1.5, 0, 0, 0, 0, 0.05], duration: 0.15 },
    { goal: [0.9, 1.5, 0, 0, 0, 0, 0.02], duration: 0 },
  );
  return [
    everyKind,
    readJson("tests/fixtures/plans/instant-jump.json"),
    readJson("tests/fixtures/plans/just-long-enough.json"),
    readJson("tests/fixtures/arm-plans/clip-surface.json"),
    readJson("tests/fixtures/arm-plans/reach-out-heavy.json"),
  ].map((doc) => ({ plan: planOf(doc), report: check(planOf(doc)) }));
}

function messagesOf(report: Report): string[] {
  return report.findings.map((f) => f.message);
}

describe("engine messages", () => {
  const samples = samplePlans();
  const kinds = new Set(samples.flatMap(({ report }) => report.findings.map((f) => f.kind)));

  it("cover every plan finding kind in these samples (so the checks below see each)", () => {
    expect([...kinds].sort()).toEqual(
      ["accel-over", "clearance", "effort-over", "jump", "range", "speed-over", "tool-speed"].sort(),
    );
  });

  it("say what would happen on the hardware with 'would', never 'will'", () => {
    const all = samples.flatMap(({ report }) => messagesOf(report));
    expect(all.length).toBeGreaterThan(10);
    for (const m of all) expect(m, m).not.toMatch(/\bwill\b/i);
    expect(all.some((m) => /the controller would (refuse|stop)/.test(m))).toBe(true);
  });

  it("name every joint by its name, never by its index", () => {
    for (const { plan, report } of samples)
      for (const f of report.findings) {
        expect(f.message, f.message).not.toMatch(/\bjoint \d/);
        if (f.joint !== null) expect(f.message).toContain(`joint "${plan.arm.joints[f.joint].name}"`);
      }
  });

  it("call a revolute joint's effort 'torque' in N·m, never a bare 'effort'", () => {
    const efforts = samples.flatMap(({ plan, report }) =>
      report.findings
        .filter((f) => f.kind === "effort-over" && f.move !== null && f.joint !== null)
        .map((f) => ({ f, joint: plan.arm.joints[f.joint as number] })),
    );
    expect(efforts.length).toBeGreaterThan(0);
    for (const { f, joint } of efforts) {
      expect(joint.type).toBe("revolute");
      expect(f.message).toMatch(/: peak torque [\d.]+ N·m at /);
      expect(f.message).not.toMatch(/peak effort/);
    }
  });

  it("give the gripper's travel in millimetres (the plan stores metres)", () => {
    const { plan, report } = samples[0];
    const gripper = plan.arm.joints.findIndex((j) => j.name === "gripper");
    const range = report.findings.find((f) => f.kind === "range" && f.joint === gripper);
    expect(range?.value).toBeCloseTo(0.05, 12);
    expect(range?.message).toContain('joint "gripper" at 50 mm, beyond its travel max of 45 mm');
    expect(range?.message).toContain("Choose a value from 0 mm to 45 mm");
    expect(range?.message).not.toMatch(/\d m\b/);
  });

  it("give a recording's gripper values in millimetres too", () => {
    const armDoc = readJson("tests/fixtures/recordings/demo-arm.json");
    const parsedArm = parseArm(armDoc);
    if (!parsedArm.ok) throw new Error("arm fixture");
    const arm: Arm = parsedArm.value;
    const header = ["t", ...arm.joints.map((j) => j.name)].join(",");
    const rows = Array.from({ length: 5 }, (_, k) =>
      [k / 1000, ...arm.joints.map((j) => (j.name === "gripper" ? 0.05 : 0))].join(","),
    );
    const csv = parseRecordingCsv(new TextEncoder().encode([header, ...rows].join("\n") + "\n"));
    if (!csv.recording) throw new Error("recording");
    const report = streamCheck(arm, csv.recording);
    const range = report.findings.find((f) => f.kind === "range");
    expect(range?.message).toContain("50 mm");
    expect(range?.message).toContain("0 mm to 45 mm");
    for (const f of report.findings) expect(f.message).not.toMatch(/\bwill\b/);
  });

  it("read 'must be 0 or greater' for a negative duration and a negative payload mass", () => {
    const doc = readJson("tests/fixtures/arm-plans/bench-e2e.json");
    doc.moves[0].duration = -1;
    doc.payload = { mass: -0.2 };
    const parsed = parsePlan(doc);
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    const byPath = new Map(parsed.problems.map((p) => [p.path.join("."), p.message]));
    expect(byPath.get("moves.0.duration")).toBe("must be 0 or greater");
    expect(byPath.get("payload.mass")).toBe("must be 0 or greater");
    for (const p of parsed.problems) expect(p.message).not.toMatch(/non-negative|>=|at least 0\b/);
  });
});

describe("API field messages", () => {
  it("read 'must be 0 or greater' for a negative index or time, not zod's '>=0'", () => {
    const results = [
      commentSchema.safeParse({ body: "x", moveIndex: -1, jointIndex: -2, timeS: -0.5 }),
      repairDatasetSchema.safeParse({ episodes: [-1] }),
      createVersionSchema.safeParse({ baseVersion: -1, document: {} }),
    ];
    for (const r of results) {
      expect(r.success).toBe(false);
      if (r.success) continue;
      const negative = r.error.issues.filter((i) => i.code === "too_small");
      expect(negative.length).toBeGreaterThan(0);
      for (const issue of negative) expect(issue.message).toBe("must be 0 or greater");
      for (const issue of r.error.issues) expect(issue.message).not.toMatch(/>=|Too small/);
    }
  });
});

describe("assignment rule messages", () => {
  it("give the pose tolerance with its units and say what to change", () => {
    const plan = planOf(readJson("tests/fixtures/plans/gentle-pass.json"));
    const far = plan.start.map((v) => v + 0.5);
    const problems = ruleProblems(plan, "rev", {
      requiredArmRevisionId: "rev",
      requiredStart: far,
      requiredGoals: [far],
      poseTolerance: 0.001,
    });
    const texts = problems.map((p) => p.message);
    expect(texts).toEqual([
      "The plan does not start at the required start pose (within 0.001 rad, or 1 mm for the gripper, per joint); set the start pose to the assignment's.",
      "Required goal pose 1 of 1 is not reached (in order, within 0.001 rad, or 1 mm for the gripper, per joint); add a move whose goal is that pose.",
    ]);
  });
});

describe("permission refusals", () => {
  it("say who can grant a project action, not the action's code", () => {
    const refusal = projectRefusal("viewer", "version:create");
    expect(refusal).toBe(
      "As a viewer of this project you cannot save a new version of a plan in this project. Ask the project's owner to make you an editor.",
    );
    expect(projectRefusal("editor", "member:manage")).toContain("Ask the project's owner to make you an owner.");
  });

  it("word every refusal in every table without an internal code, naming who to ask", () => {
    const texts: string[] = [];
    for (const [role, allowed] of Object.entries(projectPermissions))
      for (const action of Object.keys(projectActionsProbe) as ProjectAction[])
        if (!allowed.has(action)) texts.push(projectRefusal(role as keyof typeof projectPermissions, action));
    for (const [role, allowed] of Object.entries(coursePermissions))
      for (const action of Object.keys(courseActionsProbe) as CourseAction[])
        if (!allowed.has(action)) texts.push(courseRefusal(role as keyof typeof coursePermissions, action));
    for (const [role, allowed] of Object.entries(sitePermissions))
      for (const action of Object.keys(siteActionsProbe) as SiteAction[])
        if (!allowed.has(action)) texts.push(siteRefusal(role as keyof typeof sitePermissions, action));
    expect(texts.length).toBeGreaterThan(20);
    for (const t of texts) {
      expect(t, t).not.toMatch(/[a-z-]+:[a-z-]+/); // no `version:create`
      expect(t, t).not.toMatch(/does not allow/);
      expect(t, t).toMatch(/\b(Ask|ask|join)\b/);
    }
  });

  it("tell a student refused an instructor's course action to ask an instructor", () => {
    expect(courseRefusal("student", "review:decide")).toBe(
      "As a student of this course you cannot approve or return submissions. Only the course's instructors can; ask one of them to do it or to add you as an instructor.",
    );
  });

  it("tell an account refused a site action to ask the site's administrator", () => {
    expect(siteRefusal("student", "project:create-course")).toContain("Ask the site's administrator");
  });
});

describe("default error messages", () => {
  it("say what to do next for every kind, without an HTTP status or an internal code", () => {
    const kinds: ErrorKind[] = [
      "bad_request",
      "unauthorized",
      "forbidden",
      "not_found",
      "conflict",
      "payload_too_large",
      "unsupported_media_type",
      "unprocessable",
      "rate_limited",
      "internal",
      "unavailable",
    ];
    for (const kind of kinds) {
      const message = new AppError(kind).message;
      expect(message, kind).not.toMatch(/HTTP|\b[45]\d\d\b|_/);
      expect(message, kind).toMatch(/\b(fix|sign in|ask|reload|send|change|wait|try)\b/i);
    }
    expect(new AppError("forbidden:plan").message).toContain("ask the owner of the project or course");
  });
});

/** Every action of each table, typed so that a new action must be listed here (and so worded above). */
const projectActionsProbe: Record<ProjectAction, true> = {
  "project:read": true,
  "project:rename": true,
  "project:archive": true,
  "member:list": true,
  "member:manage": true,
  "arm:read": true,
  "arm:write": true,
  "plan:read": true,
  "plan:create": true,
  "plan:delete": true,
  "version:create": true,
  "recording:read": true,
  "recording:create": true,
  "dataset:read": true,
  "dataset:create": true,
  "dataset:audit": true,
  "dataset:repair": true,
  "audit:read": true,
};
const courseActionsProbe: Record<CourseAction, true> = {
  "course:read": true,
  "course:manage": true,
  "course:read-join-code": true,
  "roster:read": true,
  "roster:manage": true,
  "assignment:read": true,
  "assignment:create": true,
  "submission:create": true,
  "submission:read-own": true,
  "submission:read-all": true,
  "review:comment": true,
  "review:decide": true,
  "grades:export": true,
};
const siteActionsProbe: Record<SiteAction, true> = {
  "project:create": true,
  "project:create-course": true,
  "token:manage": true,
  "check:run": true,
  "arm:read-builtin": true,
  "user:list": true,
  "user:manage": true,
};
