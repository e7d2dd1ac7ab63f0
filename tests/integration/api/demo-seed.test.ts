/**
 * The demo seed (`tsx db/seed.ts`, run by `npm start` on every start) against the real test
 * database: a second run succeeds, adds nothing and removes nothing, keeps what a demo user did in
 * between, and prints the demo course's join code with the sign-ins.
 */
import "./_env";
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { db, pool } from "@/db";
import { assignments, courseEnrolments, courses } from "@/db/schema";
import { demoCourse, demoPeople } from "@/db/demo";
import * as join from "@/app/api/v1/courses/join/route";
import { call, tokenFor } from "./_helpers";

const run = promisify(execFile);

async function seed(): Promise<string> {
  const { stdout } = await run("node_modules/.bin/tsx", ["db/seed.ts"], { env: process.env, timeout: 60_000 });
  return stdout;
}

/** Row count of every table in the public schema (the application's own; pg-boss keeps its own schema). */
async function rowCounts(): Promise<Record<string, number>> {
  const { rows } = await pool.query<{ table_name: string }>(
    "select table_name from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by table_name",
  );
  const out: Record<string, number> = {};
  for (const { table_name } of rows) {
    const { rows: n } = await pool.query<{ n: string }>(
      `select count(*) as n from "${table_name.replace(/"/g, '""')}"`,
    );
    out[table_name] = Number(n[0].n);
  }
  return out;
}

describe("demo seed", () => {
  it(
    "runs twice in a row, keeps every row, and prints the course join code with the sign-ins",
    { timeout: 120_000 },
    async () => {
      await seed();
      const [course] = await db.select().from(courses).where(eq(courses.id, demoCourse.id));
      expect(course).toMatchObject({
        title: "Robot Motion I",
        joinCode: demoCourse.joinCode,
        projectId: demoCourse.projectId,
      });
      const seeded = await db.select().from(assignments).where(eq(assignments.courseId, demoCourse.id));
      expect(seeded.map((a) => a.title).sort()).toEqual(["Gentle pose change", "Reach without faults"]);
      for (const a of seeded) expect(a.dueAt.getTime()).toBeGreaterThan(Date.now());
      const roles = await db
        .select({ userId: courseEnrolments.userId, role: courseEnrolments.role })
        .from(courseEnrolments)
        .where(eq(courseEnrolments.courseId, demoCourse.id));
      expect(roles).toEqual(
        expect.arrayContaining([
          { userId: demoCourse.instructorId, role: "instructor" },
          { userId: demoCourse.studentIds[0], role: "student" },
        ]),
      );

      // Between runs a demo student joins with the printed code, as in the demo walk-through.
      const tomas = demoPeople[1];
      const joined = await call(join.POST, {
        method: "POST",
        path: "/api/v1/courses/join",
        auth: { bearer: await tokenFor(tomas.id) },
        body: { code: course.joinCode },
      });
      expect(joined.status, joined.text).toBe(200);
      const before = await rowCounts();

      const output = await seed();
      expect(await rowCounts()).toEqual(before);
      const [stillJoined] = await db
        .select()
        .from(courseEnrolments)
        .where(and(eq(courseEnrolments.courseId, demoCourse.id), eq(courseEnrolments.userId, tomas.id)));
      expect(stillJoined?.role).toBe("student");

      const lines = output.split("\n");
      const signIns = lines.findIndex((l) => l.includes("demo sign-ins"));
      expect(signIns).toBeGreaterThanOrEqual(0);
      const after = lines.slice(signIns + 1);
      for (const p of demoPeople) expect(after.some((l) => l.includes(`${p.email} / ${p.password}`))).toBe(true);
      expect(after.some((l) => l.includes(`join code: ${demoCourse.joinCode}`))).toBe(true);
    },
  );
});
