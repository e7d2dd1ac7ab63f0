/**
 * A small audited dataset in a test project, for the authorisation matrix: two invented episodes of
 * the project's arm as one Parquet file in the object store, mapped with the defaults and audited
 * in this process (the same batch code the workers run).
 */
import { and, eq } from "drizzle-orm";
import { db } from "@/db";
import { armRevisions, arms, projectMembers } from "@/db/schema";
import { createDataset, startDatasetAudit } from "@/db/queries/datasets";
import { armSchema, writeEpisodesParquet, type Arm } from "@/kinematics";
import { runDatasetBatch } from "@/lib/server/datasets/audit-batch";
import { putObject } from "@/lib/server/storage";

/** Two episodes of 20 frames at 30 Hz for `arm`: one still, one with a glitch in its first joint at frame 10. */
export function matrixParquet(arm: Arm): Uint8Array {
  const n = arm.joints.length;
  const rest = arm.joints.map((j) => (j.min <= 0 && j.max >= 0 ? 0 : (j.min + j.max) / 2));
  const episode = (id: string, glitch: boolean) => {
    const count = 20;
    const timeS = Float64Array.from({ length: count }, (_, k) => k / 30);
    const position = new Float64Array(count * n);
    for (let k = 0; k < count; k++) for (let j = 0; j < n; j++) position[k * n + j] = rest[j];
    if (glitch) position[10 * n] += 0.5;
    return { id, recording: { names: arm.joints.map((j) => j.name), jointCount: n, count, timeS, position } };
  };
  return writeEpisodesParquet(arm, [episode("still", false), episode("glitch", true)]);
}

/** Creates and audits the dataset in the project (its first arm, its first owner); returns the dataset id. */
export async function auditedDataset(projectId: string): Promise<string> {
  const [owner] = await db
    .select({ userId: projectMembers.userId })
    .from(projectMembers)
    .where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.role, "owner")))
    .limit(1);
  const [revision] = await db
    .select({ id: armRevisions.id, description: armRevisions.description })
    .from(armRevisions)
    .innerJoin(arms, eq(arms.id, armRevisions.armId))
    .where(eq(arms.projectId, projectId))
    .limit(1);
  const arm = armSchema.parse(revision.description);
  const bytes = matrixParquet(arm);
  const key = `datasets/${projectId}/matrix-${Math.random().toString(36).slice(2)}`;
  await putObject(key, bytes, "application/octet-stream");
  const dataset = await createDataset({
    projectId,
    name: "Matrix dataset",
    objectKey: key,
    fileKind: "parquet",
    sizeBytes: bytes.byteLength,
    sha256: "0".repeat(64),
    armRevisionId: revision.id,
    mapping: {},
    createdBy: owner.userId,
  });
  const started = await startDatasetAudit({
    datasetId: dataset.id,
    userId: owner.userId,
    episodeCount: 2,
    batchSize: 25,
  });
  if (!started) throw new Error("fixture audit not started");
  for (const batch of started.batches)
    await runDatasetBatch({ datasetId: dataset.id, generation: started.dataset.generation, batch });
  return dataset.id;
}
