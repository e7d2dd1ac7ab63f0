import { z } from "zod";

/**
 * Server environment, validated once on first use. A missing or malformed
 * variable fails fast with one line per problem, naming the variable.
 */
const envSchema = z.object({
  DATABASE_URL: z.string().url("must be a postgres:// URL"),
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  /** Signs session cookies; at least 32 characters. scripts/start.sh makes one under .data/ for local use. */
  NEXTAUTH_SECRET: z.string().min(32, "must be at least 32 characters").optional(),
  /** The public base URL of the app, used in links (e-mail, exports). */
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

/** Returns the validated environment; throws with every problem listed when it is invalid. */
export function env(): Env {
  if (cached) return cached;
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid environment:\n${lines.join("\n")}`);
  }
  cached = parsed.data;
  return cached;
}
