/**
 * Dataset settings from the environment, validated once (zod), failing fast with one line per problem.
 */
import { z } from "zod";

const datasetEnvSchema = z.object({
  /** Largest dataset upload, bytes (default 2 GiB; a single recording's limit is UPLOAD_LIMIT_BYTES). */
  DATASET_UPLOAD_LIMIT_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(2 * 1024 ** 3),
  /** Episodes per audit job. */
  DATASET_BATCH_SIZE: z.coerce.number().int().min(1).max(10_000).default(25),
  /** Worker processes `run-workers.ts` starts on this machine. */
  DATASET_WORKERS: z.coerce.number().int().min(1).max(64).default(1),
  /** Seconds a batch job may run before pg-boss treats it as lost and retries it. */
  DATASET_JOB_EXPIRE_S: z.coerce.number().int().min(1).max(3600).default(300),
  /** Retries of a batch job after the first attempt. */
  DATASET_RETRY_LIMIT: z.coerce.number().int().min(0).max(50).default(5),
  /** How often (s) a worker looks for lost jobs and batches left without a job. */
  DATASET_SWEEP_S: z.coerce.number().int().min(1).max(3600).default(30),
});

export type DatasetEnv = z.infer<typeof datasetEnvSchema>;

let cached: DatasetEnv | undefined;

export function datasetEnv(): DatasetEnv {
  if (cached) return cached;
  const parsed = datasetEnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid dataset environment:\n${lines.join("\n")}`);
  }
  cached = parsed.data;
  return cached;
}
