/**
 * Idempotent demo seed (see db/demo.ts for the invented scenario). Run with DATABASE_URL set:
 * `tsx db/seed.ts`. A second run updates the same rows and adds nothing; saved user data is kept.
 * A seed script is not a request handler, so it writes through the Drizzle client directly.
 */
import bcrypt from "bcryptjs";
import { and, desc, eq, sql } from "drizzle-orm";
import { isDeepStrictEqual } from "node:util";
import { db, pool } from "./index";
import { createHash } from "node:crypto";
import { summarize } from "../lib/server/check";
import { putObject } from "../lib/server/storage";
import { check, parseRecordingCsv, planSchema } from "../kinematics";
import {
  armRevisions,
  arms,
  assignments,
  courseEnrolments,
  courses,
  planVersions,
  plans,
  projectMembers,
  projects,
  recordings,
  users,
} from "./schema";
import { demoArms, demoCourse, demoPeople, demoPlans, demoProjects, demoRecording, demoSignInLines } from "./demo";

async function seedPeople() {
  for (const p of demoPeople) {
    const [existing] = await db.select().from(users).where(eq(users.id, p.id));
    if (!existing) {
      await db.insert(users).values({
        id: p.id,
        email: p.email,
        name: p.name,
        siteRole: p.role,
        passwordHash: await bcrypt.hash(p.password, 10),
        emailVerifiedAt: new Date(),
      });
      continue;
    }
    const passwordOk = await bcrypt.compare(p.password, existing.passwordHash);
    await db
      .update(users)
      .set({
        email: p.email,
        name: p.name,
        siteRole: p.role,
        disabledAt: null,
        ...(passwordOk ? {} : { passwordHash: await bcrypt.hash(p.password, 10) }),
      })
      .where(eq(users.id, p.id));
  }
}

async function seedProjects() {
  for (const p of demoProjects) {
    await db
      .insert(projects)
      .values({ id: p.id, name: p.name, kind: p.kind, createdBy: p.createdBy })
      .onConflictDoUpdate({ target: projects.id, set: { name: p.name, kind: p.kind } });
    for (const m of p.members) {
      await db
        .insert(projectMembers)
        .values({ projectId: p.id, userId: m.userId, role: m.role })
        .onConflictDoUpdate({ target: [projectMembers.projectId, projectMembers.userId], set: { role: m.role } });
    }
  }
}

/** Built-in arms: a changed description becomes a new revision, never an edit of an old one. */
async function seedArms() {
  for (const a of demoArms) {
    await db
      .insert(arms)
      .values({ id: a.id, name: a.name, projectId: null })
      .onConflictDoUpdate({ target: arms.id, set: { name: a.name } });
    const [latest] = await db
      .select()
      .from(armRevisions)
      .where(eq(armRevisions.armId, a.id))
      .orderBy(desc(armRevisions.revision))
      .limit(1);
    if (latest && isDeepStrictEqual(latest.description, a.description)) continue;
    await db.insert(armRevisions).values({
      armId: a.id,
      revision: (latest?.revision ?? 0) + 1,
      description: a.description,
      note: latest ? "Demo arm description updated" : "Demo arm",
    });
  }
}

/**
 * Demo plans: created once with their versions, each checked by the engine against the arm's
 * latest revision. A plan that already exists is left alone (users may have saved versions since).
 */
async function seedPlans() {
  for (const p of demoPlans) {
    const [existing] = await db.select({ id: plans.id }).from(plans).where(eq(plans.id, p.id));
    if (existing) continue;
    const [revision] = await db
      .select()
      .from(armRevisions)
      .where(eq(armRevisions.armId, p.armId))
      .orderBy(desc(armRevisions.revision))
      .limit(1);
    await db.transaction(async (tx) => {
      await tx.insert(plans).values({
        id: p.id,
        projectId: p.projectId,
        armId: p.armId,
        name: p.name,
        createdBy: p.authorId,
        latestVersion: p.versions.length,
      });
      for (const [i, v] of p.versions.entries()) {
        const document = planSchema.parse({
          format: "jointproof.plan",
          version: 1,
          arm: revision.description,
          start: v.start,
          moves: v.moves,
        });
        const report = check(document);
        await tx.insert(planVersions).values({
          planId: p.id,
          number: i + 1,
          document,
          armRevisionId: revision.id,
          verdict: report.verdict,
          summary: summarize(document, report),
          note: v.note,
          authorId: p.authorId,
        });
      }
    });
  }
}

/**
 * The demo course with its two assignments and enrolments. Upserts by fixed id, so a second run
 * changes nothing a user made: enrolments are only added, submissions are never touched, and the
 * join code stays whatever the course has. A due date that has passed is moved on again, so the
 * demo always has open assignments. Returns the course's join code.
 */
async function seedCourse(): Promise<string> {
  const c = demoCourse;
  const [revision] = await db
    .select({ id: armRevisions.id })
    .from(armRevisions)
    .where(and(eq(armRevisions.armId, c.armId), eq(armRevisions.revision, c.armRevision)));
  if (!revision) throw new Error(`demo course: arm ${c.armId} has no revision ${c.armRevision}`);
  const [course] = await db
    .insert(courses)
    .values({
      id: c.id,
      title: c.title,
      term: c.term,
      joinCode: c.joinCode,
      projectId: c.projectId,
      createdBy: c.instructorId,
      limits: c.limits,
      requiredArmRevisionId: revision.id,
    })
    .onConflictDoUpdate({ target: courses.id, set: { title: c.title, term: c.term, limits: c.limits } })
    .returning({ joinCode: courses.joinCode });
  await db
    .insert(courseEnrolments)
    .values([
      { courseId: c.id, userId: c.instructorId, role: "instructor" as const },
      ...c.studentIds.map((userId) => ({ courseId: c.id, userId, role: "student" as const })),
    ])
    .onConflictDoNothing();
  for (const a of c.assignments) {
    const dueAt = new Date(Date.now() + a.dueInDays * 86_400_000);
    await db
      .insert(assignments)
      .values({
        id: a.id,
        courseId: c.id,
        title: a.title,
        instructions: a.instructions,
        dueAt,
        requiredArmRevisionId: revision.id,
        requiredStart: a.requiredStart ?? null,
        requiredGoals: a.requiredGoals ?? null,
        createdBy: c.instructorId,
      })
      .onConflictDoUpdate({
        target: assignments.id,
        set: {
          title: a.title,
          instructions: a.instructions,
          dueAt: sql`case when ${assignments.dueAt} < now() then excluded.due_at else ${assignments.dueAt} end`,
        },
      });
  }
  return course.joinCode;
}

/** The demo recording: the file into object storage, then its row. Skipped (with a note) while storage is down. */
async function seedRecording() {
  const [existing] = await db.select({ id: recordings.id }).from(recordings).where(eq(recordings.id, demoRecording.id));
  if (existing) return;
  const bytes = new TextEncoder().encode(demoRecording.csv());
  const parsed = parseRecordingCsv(bytes);
  if (!parsed.recording)
    throw new Error(`demo recording is invalid: ${parsed.problems.map((p) => p.message).join("; ")}`);
  try {
    await putObject(demoRecording.objectKey, bytes, "text/csv");
  } catch (err) {
    console.log(
      `[seed] object storage not reachable (${err instanceof Error ? err.message : err}); the demo recording is added on a later run`,
    );
    return;
  }
  const r = parsed.recording;
  await db.insert(recordings).values({
    id: demoRecording.id,
    projectId: demoRecording.projectId,
    armId: demoRecording.armId,
    name: demoRecording.name,
    objectKey: demoRecording.objectKey,
    contentType: "text/csv",
    sizeBytes: bytes.byteLength,
    sha256: createHash("sha256").update(bytes).digest("hex"),
    sampleCount: r.count,
    jointCount: r.jointCount,
    durationS: r.timeS[r.count - 1] - r.timeS[0],
    createdBy: demoRecording.createdBy,
  });
}

async function main() {
  await seedPeople();
  await seedProjects();
  await seedArms();
  await seedPlans();
  const joinCode = await seedCourse();
  await seedRecording();
  console.log(`[seed] demo data ready (${await db.$count(users)} users)`);
  console.log("[seed] demo sign-ins:");
  for (const line of demoSignInLines(joinCode)) console.log(line);
}

try {
  await main();
} catch (err) {
  console.error("[seed] failed:", err instanceof Error ? err.message : err);
  process.exitCode = 1;
} finally {
  await pool.end();
}
