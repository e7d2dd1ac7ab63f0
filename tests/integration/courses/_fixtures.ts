/** Real rows for the course tests: a student's plan versions, the demo arm's revision. */
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { createPlan, createPlanVersion } from "@/db/queries/plans";
import { createProject } from "@/db/queries/projects";
import { createAssignment, createCourse, enrolStudent } from "@/db/queries/courses";
import { armRevisions } from "@/db/schema";
import { check } from "@/kinematics";
import { planSchema } from "@/kinematics";
import { demoArm } from "../api/_helpers";

/** Revision 1 of the light demo arm, as seeded. */
export async function demoArmRevision(): Promise<{ id: string; revision: number }> {
  const [row] = await db
    .select({ id: armRevisions.id, revision: armRevisions.revision })
    .from(armRevisions)
    .where(and(eq(armRevisions.armId, demoArm.id), eq(armRevisions.revision, 1)));
  if (!row) throw new Error("the demo arm is not seeded");
  return row;
}

/**
 * One move of the base joint by 1 rad (quintic). Its peak speed is 1.875 rad / duration
 * (derived: the quintic rest-to-rest blend's peak rate is 15/8 at mid-move).
 */
export function baseMovePlan(durationS: number): Record<string, unknown> {
  const n = demoArm.description.joints.length;
  const goal = new Array(n).fill(0);
  goal[0] = 1;
  return {
    format: "jointproof.plan",
    version: 1,
    arm: demoArm.description,
    start: new Array(n).fill(0),
    moves: [{ goal, duration: durationS, shape: "quintic" }],
  };
}

/** A personal project and plan of the student's, with the given documents saved as versions 1, 2, … */
export async function studentPlan(
  userId: string,
  documents: Record<string, unknown>[],
): Promise<{ planId: string; projectId: string }> {
  const project = await createProject({ name: "My assignment work", kind: "personal", userId });
  const plan = await createPlan({ projectId: project.id, armId: demoArm.id, name: "Base sweep", userId });
  const revision = await demoArmRevision();
  for (const [i, document] of documents.entries()) {
    const parsed = planSchema.parse(document);
    const report = check(parsed);
    const saved = await createPlanVersion({
      planId: plan.id,
      baseVersion: i,
      document: parsed,
      armRevisionId: revision.id,
      verdict: report.verdict,
      summary: { verdict: report.verdict },
      note: null,
      authorId: userId,
    });
    if ("conflict" in saved) throw new Error("unexpected version conflict");
  }
  return { planId: plan.id, projectId: project.id };
}

/** A course taught by `instructorId` with one assignment on the demo arm (70% speed), and `studentIds` enrolled. */
export async function courseWithAssignment(
  instructorId: string,
  studentIds: string[],
  dueAt = new Date(Date.now() + 86_400_000),
) {
  const course = await createCourse({
    userId: instructorId,
    title: "Robot Motion I",
    term: "Autumn",
    limits: { speedPercent: 70 },
  });
  for (const id of studentIds) await enrolStudent({ courseId: course.id, userId: id });
  const revision = await demoArmRevision();
  const assignment = await createAssignment({
    courseId: course.id,
    userId: instructorId,
    title: "Base sweep",
    instructions: "",
    dueAt,
    requiredArmRevisionId: revision.id,
    poseTolerance: 0.001,
  });
  if (!assignment) throw new Error("assignment not created");
  return { course, assignment };
}
