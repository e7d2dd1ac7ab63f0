import "server-only";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { db, inTransaction } from "@/db";
import {
  armRevisions,
  datasetBatches,
  datasetEpisodes,
  datasets,
  projectMembers,
  projects,
  type Dataset,
  type DatasetEpisode,
} from "@/db/schema";

export type NewDataset = typeof datasets.$inferInsert;

export async function createDataset(input: NewDataset): Promise<Dataset> {
  const [row] = await db.insert(datasets).values(input).returning();
  return row;
}

/** The datasets of a project the user is a member of, newest first. */
export async function listDatasets({ projectId, userId }: { projectId: string; userId: string }): Promise<Dataset[]> {
  const rows = await db
    .select({ dataset: datasets })
    .from(datasets)
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, datasets.projectId), eq(projectMembers.userId, userId)))
    .where(eq(datasets.projectId, projectId))
    .orderBy(desc(datasets.createdAt));
  return rows.map((r) => r.dataset);
}

/** One dataset with the user's role in its project and whether the project is archived, if they are a member. */
export async function getDatasetForUser({ datasetId, userId }: { datasetId: string; userId: string }) {
  const [row] = await db
    .select({ dataset: datasets, role: projectMembers.role, archivedAt: projects.archivedAt })
    .from(datasets)
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, datasets.projectId), eq(projectMembers.userId, userId)))
    .innerJoin(projects, eq(projects.id, datasets.projectId))
    .where(eq(datasets.id, datasetId));
  return row;
}

export type DatasetForUser = NonNullable<Awaited<ReturnType<typeof getDatasetForUser>>>;

/** Sets the arm revision and column mapping (only while no audit runs); the dataset row after, or undefined. */
export async function setDatasetMapping({
  datasetId,
  userId,
  armRevisionId,
  mapping,
}: {
  datasetId: string;
  userId: string;
  armRevisionId: string;
  mapping: Record<string, unknown>;
}): Promise<Dataset | undefined> {
  const [row] = await db
    .update(datasets)
    .set({ armRevisionId, mapping })
    .where(
      and(
        eq(datasets.id, datasetId),
        sql`${datasets.status} <> 'auditing'`,
        sql`exists (select 1 from ${projectMembers} where ${projectMembers.projectId} = ${datasets.projectId} and ${projectMembers.userId} = ${userId})`,
      ),
    )
    .returning();
  return row;
}

/**
 * Starts an audit: a new generation, the old results removed, one batch row per `batchSize`
 * episodes. Scoped by membership. Returns the dataset and its batches, or undefined.
 */
export async function startDatasetAudit({
  datasetId,
  userId,
  episodeCount,
  batchSize,
}: {
  datasetId: string;
  userId: string;
  episodeCount: number;
  batchSize: number;
}): Promise<{ dataset: Dataset; batches: number[] } | undefined> {
  return inTransaction(async () => {
    const [row] = await db
      .update(datasets)
      .set({
        generation: sql`${datasets.generation} + 1`,
        status: "auditing",
        episodeCount,
        batchCount: Math.ceil(episodeCount / batchSize),
        auditStartedAt: new Date(),
        auditedAt: null,
      })
      .where(
        and(
          eq(datasets.id, datasetId),
          sql`exists (select 1 from ${projectMembers} where ${projectMembers.projectId} = ${datasets.projectId} and ${projectMembers.userId} = ${userId})`,
        ),
      )
      .returning();
    if (!row) return undefined;
    await db.delete(datasetEpisodes).where(eq(datasetEpisodes.datasetId, datasetId));
    await db.delete(datasetBatches).where(eq(datasetBatches.datasetId, datasetId));
    const batches: number[] = [];
    for (let b = 0; b * batchSize < episodeCount; b++) batches.push(b);
    if (batches.length > 0) {
      await db.insert(datasetBatches).values(
        batches.map((batch) => ({
          datasetId,
          generation: row.generation,
          batch,
          firstEpisode: batch * batchSize,
          episodeCount: Math.min(batchSize, episodeCount - batch * batchSize),
        })),
      );
    } else {
      await db.update(datasets).set({ status: "audited", auditedAt: new Date() }).where(eq(datasets.id, datasetId));
    }
    return { dataset: row, batches };
  });
}

/**
 * For the audit worker (a trusted process acting on a job the API created, not on behalf of a
 * user): the dataset and the batch, when the batch is still of the dataset's current generation
 * and not done. Counts the attempt.
 */
export async function claimDatasetBatchForWorker({
  datasetId,
  generation,
  batch,
}: {
  datasetId: string;
  generation: number;
  batch: number;
}) {
  const [row] = await db
    .update(datasetBatches)
    .set({ attempts: sql`${datasetBatches.attempts} + 1` })
    .where(
      and(
        eq(datasetBatches.datasetId, datasetId),
        eq(datasetBatches.generation, generation),
        eq(datasetBatches.batch, batch),
        eq(datasetBatches.done, false),
        sql`exists (select 1 from ${datasets} where ${datasets.id} = ${datasetId} and ${datasets.generation} = ${generation})`,
      ),
    )
    .returning();
  if (!row) return undefined;
  const [dataset] = await db.select().from(datasets).where(eq(datasets.id, datasetId));
  return dataset ? { dataset, batch: row } : undefined;
}

export type EpisodeResult = Omit<typeof datasetEpisodes.$inferInsert, "datasetId" | "generation" | "updatedAt">;

/**
 * Stores a batch's results and marks it done, in one transaction, only if the batch is still not
 * done and of the current generation (so a retried or duplicated job counts nothing twice). Episode
 * rows are upserted by (dataset, index). When the last batch is done the dataset becomes `audited`.
 * Returns whether the results were stored.
 */
export async function storeDatasetBatchResults({
  datasetId,
  generation,
  batch,
  episodes,
}: {
  datasetId: string;
  generation: number;
  batch: number;
  episodes: EpisodeResult[];
}): Promise<boolean> {
  return inTransaction(async () => {
    const [marked] = await db
      .update(datasetBatches)
      .set({ done: true, doneAt: new Date() })
      .where(
        and(
          eq(datasetBatches.datasetId, datasetId),
          eq(datasetBatches.generation, generation),
          eq(datasetBatches.batch, batch),
          eq(datasetBatches.done, false),
          sql`exists (select 1 from ${datasets} where ${datasets.id} = ${datasetId} and ${datasets.generation} = ${generation})`,
        ),
      )
      .returning({ batch: datasetBatches.batch });
    if (!marked) return false;
    if (episodes.length > 0) {
      await db
        .insert(datasetEpisodes)
        .values(episodes.map((e) => ({ ...e, datasetId, generation })))
        .onConflictDoUpdate({
          target: [datasetEpisodes.datasetId, datasetEpisodes.index],
          set: {
            episode: sql`excluded.episode`,
            generation: sql`excluded.generation`,
            samples: sql`excluded.samples`,
            durationS: sql`excluded.duration_s`,
            verdict: sql`excluded.verdict`,
            findingCount: sql`excluded.finding_count`,
            faultCount: sql`excluded.fault_count`,
            worstKind: sql`excluded.worst_kind`,
            worstMessage: sql`excluded.worst_message`,
            findings: sql`excluded.findings`,
            problems: sql`excluded.problems`,
            repaired: null,
            repairedVerdict: null,
            repairedFindings: null,
            updatedAt: new Date(),
          },
        });
    }
    await db
      .update(datasets)
      .set({ status: "audited", auditedAt: new Date() })
      .where(
        and(
          eq(datasets.id, datasetId),
          eq(datasets.generation, generation),
          sql`not exists (select 1 from ${datasetBatches} where ${datasetBatches.datasetId} = ${datasetId} and ${datasetBatches.generation} = ${generation} and ${datasetBatches.done} = false)`,
        ),
      );
    return true;
  });
}

/** Batches not done of the dataset's current generation (the worker's sweep re-enqueues them). */
export async function listOpenDatasetBatchesForWorker(): Promise<
  { datasetId: string; generation: number; batch: number }[]
> {
  return db
    .select({ datasetId: datasetBatches.datasetId, generation: datasetBatches.generation, batch: datasetBatches.batch })
    .from(datasetBatches)
    .innerJoin(
      datasets,
      and(eq(datasets.id, datasetBatches.datasetId), eq(datasets.generation, datasetBatches.generation)),
    )
    .where(eq(datasetBatches.done, false));
}

/** Audit progress: batches done of the current generation. */
export async function getDatasetProgress({ datasetId, userId }: { datasetId: string; userId: string }) {
  const [row] = await db
    .select({
      done: sql<number>`count(*) filter (where ${datasetBatches.done})::int`,
      total: sql<number>`count(*)::int`,
    })
    .from(datasetBatches)
    .innerJoin(
      datasets,
      and(eq(datasets.id, datasetBatches.datasetId), eq(datasets.generation, datasetBatches.generation)),
    )
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, datasets.projectId), eq(projectMembers.userId, userId)))
    .where(eq(datasetBatches.datasetId, datasetId));
  return row ?? { done: 0, total: 0 };
}

/** The episode rows for the dataset table (no findings, no repaired bytes), in dataset order. */
export async function listDatasetEpisodes({ datasetId, userId }: { datasetId: string; userId: string }) {
  return db
    .select({
      index: datasetEpisodes.index,
      episode: datasetEpisodes.episode,
      samples: datasetEpisodes.samples,
      durationS: datasetEpisodes.durationS,
      verdict: datasetEpisodes.verdict,
      findingCount: datasetEpisodes.findingCount,
      faultCount: datasetEpisodes.faultCount,
      worstKind: datasetEpisodes.worstKind,
      worstMessage: datasetEpisodes.worstMessage,
      repairedVerdict: datasetEpisodes.repairedVerdict,
    })
    .from(datasetEpisodes)
    .innerJoin(datasets, eq(datasets.id, datasetEpisodes.datasetId))
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, datasets.projectId), eq(projectMembers.userId, userId)))
    .where(and(eq(datasetEpisodes.datasetId, datasetId), eq(datasetEpisodes.generation, datasets.generation)))
    .orderBy(asc(datasetEpisodes.index));
}

/** Findings of every episode of the current audit (for the summary counts by kind). */
export async function countDatasetFindingsByKind({
  datasetId,
  userId,
}: {
  datasetId: string;
  userId: string;
}): Promise<Record<string, number>> {
  const rows = await db.execute<{ kind: string; count: number }>(sql`
    select f->>'kind' as kind, count(*)::int as count
    from ${datasetEpisodes} e
    join ${datasets} d on d.id = e.dataset_id and d.generation = e.generation
    join ${projectMembers} m on m.project_id = d.project_id and m.user_id = ${userId}
    cross join lateral jsonb_array_elements(e.findings) f
    where e.dataset_id = ${datasetId}
    group by 1`);
  return Object.fromEntries(rows.rows.map((r) => [r.kind, r.count]));
}

/** One episode's full row, if the user is a member of its dataset's project. */
export async function getDatasetEpisodeForUser({
  datasetId,
  index,
  userId,
}: {
  datasetId: string;
  index: number;
  userId: string;
}): Promise<DatasetEpisode | undefined> {
  const [row] = await db
    .select({ episode: datasetEpisodes })
    .from(datasetEpisodes)
    .innerJoin(
      datasets,
      and(eq(datasets.id, datasetEpisodes.datasetId), eq(datasets.generation, datasetEpisodes.generation)),
    )
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, datasets.projectId), eq(projectMembers.userId, userId)))
    .where(and(eq(datasetEpisodes.datasetId, datasetId), eq(datasetEpisodes.index, index)));
  return row?.episode;
}

/** Stores a repaired episode and its audit, for the current generation; false when the episode is gone. */
export async function saveDatasetEpisodeRepair({
  datasetId,
  index,
  userId,
  repaired,
  verdict,
  findings,
}: {
  datasetId: string;
  index: number;
  userId: string;
  repaired: Buffer;
  verdict: string;
  findings: unknown;
}): Promise<boolean> {
  const rows = await db
    .update(datasetEpisodes)
    .set({ repaired, repairedVerdict: verdict, repairedFindings: findings, updatedAt: new Date() })
    .where(
      and(
        eq(datasetEpisodes.datasetId, datasetId),
        eq(datasetEpisodes.index, index),
        sql`exists (select 1 from ${datasets} d join ${projectMembers} m on m.project_id = d.project_id and m.user_id = ${userId} where d.id = ${datasetId} and d.generation = ${datasetEpisodes.generation})`,
      ),
    )
    .returning({ index: datasetEpisodes.index });
  return rows.length > 0;
}

/** The repaired bytes of every repaired episode of the current audit, by index. */
export async function listDatasetRepairs({
  datasetId,
  userId,
}: {
  datasetId: string;
  userId: string;
}): Promise<Map<number, Buffer>> {
  const rows = await db
    .select({ index: datasetEpisodes.index, repaired: datasetEpisodes.repaired })
    .from(datasetEpisodes)
    .innerJoin(
      datasets,
      and(eq(datasets.id, datasetEpisodes.datasetId), eq(datasets.generation, datasetEpisodes.generation)),
    )
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, datasets.projectId), eq(projectMembers.userId, userId)))
    .where(and(eq(datasetEpisodes.datasetId, datasetId), sql`${datasetEpisodes.repaired} is not null`));
  return new Map(rows.map((r) => [r.index, r.repaired!]));
}

/** For the audit worker: the arm revision a dataset is audited against. */
export async function getDatasetArmForWorker({
  datasetId,
}: {
  datasetId: string;
}): Promise<{ id: string; description: unknown } | undefined> {
  const [row] = await db
    .select({ id: armRevisions.id, description: armRevisions.description })
    .from(datasets)
    .innerJoin(armRevisions, eq(armRevisions.id, datasets.armRevisionId))
    .where(eq(datasets.id, datasetId));
  return row;
}

/** The arm revision of a dataset, if the user is a member of its project. */
export async function getDatasetArmForUser({
  datasetId,
  userId,
}: {
  datasetId: string;
  userId: string;
}): Promise<{ id: string; description: unknown } | undefined> {
  const [row] = await db
    .select({ id: armRevisions.id, description: armRevisions.description })
    .from(datasets)
    .innerJoin(armRevisions, eq(armRevisions.id, datasets.armRevisionId))
    .innerJoin(projectMembers, and(eq(projectMembers.projectId, datasets.projectId), eq(projectMembers.userId, userId)))
    .where(eq(datasets.id, datasetId));
  return row;
}
