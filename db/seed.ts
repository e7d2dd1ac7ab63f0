/**
 * Idempotent demo seed (see db/demo.ts for the invented scenario). Run with DATABASE_URL set:
 * `tsx db/seed.ts`. A second run updates the same rows and adds nothing; saved user data is kept.
 * A seed script is not a request handler, so it writes through the Drizzle client directly.
 */
import bcrypt from "bcryptjs";
import { desc, eq } from "drizzle-orm";
import { isDeepStrictEqual } from "node:util";
import { db, pool } from "./index";
import { armRevisions, arms, projectMembers, projects, users } from "./schema";
import { demoArms, demoPeople, demoProjects, demoSignInLines } from "./demo";

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

async function main() {
  await seedPeople();
  await seedProjects();
  await seedArms();
  console.log(`[seed] demo data ready (${await db.$count(users)} users)`);
  console.log("[seed] demo sign-ins:");
  for (const line of demoSignInLines()) console.log(line);
}

try {
  await main();
} catch (err) {
  console.error("[seed] failed:", err instanceof Error ? err.message : err);
  process.exitCode = 1;
} finally {
  await pool.end();
}
