import { z } from "zod";

/**
 * Server environment, validated once when the server starts (instrumentation.ts) and cached.
 * A missing or malformed variable fails fast with one line per problem, naming the variable.
 */
const envSchema = z
  .object({
    DATABASE_URL: z.string().url("must be a postgres:// URL"),
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    /** Signs session cookies; at least 32 characters. scripts/start.sh makes one under .data/ for local use. */
    NEXTAUTH_SECRET: z.string().min(32, "must be at least 32 characters").optional(),
    /** The public base URL of the app, used in links (e-mail, exports). */
    APP_URL: z.string().url().default("http://127.0.0.1:3000"),
    /**
     * Further origins (comma-separated, `scheme://host[:port]`) allowed to send state-changing requests
     * with a session cookie, besides APP_URL's own; e.g. a second host name of the same deployment.
     */
    ALLOWED_ORIGINS: z
      .string()
      .default("")
      .transform((v, ctx) => {
        const out: string[] = [];
        for (const part of v
          .split(",")
          .map((p) => p.trim())
          .filter(Boolean)) {
          try {
            const u = new URL(part);
            if (u.origin !== part.replace(/\/$/, "")) throw new Error();
            out.push(u.origin);
          } catch {
            ctx.addIssue({ code: "custom", message: `"${part}" is not an origin (scheme://host[:port])` });
          }
        }
        return out;
      }),
    /**
     * Proxies whose X-Forwarded-For is believed (comma-separated IP addresses). Empty: the header is
     * ignored and the connection's address is the client's. Set it to your reverse proxy's address.
     */
    TRUSTED_PROXIES: z
      .string()
      .default("")
      .transform((v) =>
        v
          .split(",")
          .map((p) => p.trim())
          .filter(Boolean),
      ),
    /** Shows the development mail page in a production build (only for an admin on a loopback-only server). */
    JP_DEV_MAIL: z.enum(["0", "1"]).optional(),
    /** Largest JSON request body the API reads, in bytes. */
    API_BODY_LIMIT_BYTES: z.coerce.number().int().positive().default(1_048_576),
    /** Largest upload (recording, URDF file) the API accepts, in bytes; checked before the body is read whole. */
    UPLOAD_LIMIT_BYTES: z.coerce
      .number()
      .int()
      .positive()
      .default(50 * 1_048_576),
    /** S3-compatible object storage for uploads. `npm start` and `npm test` point these at the local fake (scripts/fakes/start.ts). */
    S3_ENDPOINT: z.string().url().optional(),
    /** Port of the local fake on 127.0.0.1 (scripts/fakes/start.ts); used as the endpoint when S3_ENDPOINT is unset. */
    S3_PORT: z.coerce.number().int().min(1).max(65535).optional(),
    S3_REGION: z.string().min(1).default("us-east-1"),
    S3_BUCKET: z.string().min(3).default("jointproof"),
    S3_ACCESS_KEY_ID: z.string().min(1).optional(),
    S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
    /** Path-style URLs (`endpoint/bucket/key`), which local fakes and most S3-compatible services need. */
    S3_FORCE_PATH_STYLE: z
      .enum(["true", "false"])
      .default("true")
      .transform((v) => v === "true"),
  })
  .superRefine((e, ctx) => {
    // Without a secret next-auth cannot sign sessions; in production that is a start-up error, not a silent fail-closed.
    if (e.NODE_ENV === "production" && !e.NEXTAUTH_SECRET) {
      ctx.addIssue({
        code: "custom",
        path: ["NEXTAUTH_SECRET"],
        message: "is required in production (at least 32 characters)",
      });
    }
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
