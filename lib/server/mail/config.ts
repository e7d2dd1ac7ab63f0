/**
 * Mail settings from the environment, validated once (zod), failing fast with one line per
 * problem. `npm start` and `npm test` point SMTP_* at the local fake (scripts/fakes/smtp.ts).
 */
import { z } from "zod";

const mailEnvSchema = z.object({
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  /** `true` for implicit TLS (port 465); otherwise STARTTLS is used when the server offers it. */
  SMTP_SECURE: z
    .enum(["true", "false"])
    .default("false")
    .transform((v) => v === "true"),
  SMTP_USER: z.string().min(1).optional(),
  SMTP_PASS: z.string().min(1).optional(),
  SMTP_FROM: z.string().min(3).default("Jointproof <no-reply@example.com>"),
  /** Attempts after the first before a message is given up (pg-boss retryLimit). */
  MAIL_RETRY_LIMIT: z.coerce.number().int().min(0).max(50).default(10),
  /** First retry delay in seconds; each later one doubles (pg-boss retryBackoff, with jitter). */
  MAIL_RETRY_DELAY_S: z.coerce.number().int().min(1).max(3600).default(5),
  /** Folder where the local SMTP fake stores what it receives (default: $JP_FAKES_DIR/mail). */
  MAIL_FAKE_DIR: z.string().min(1).optional(),
  JP_FAKES_DIR: z.string().min(1).optional(),
});

export type MailEnv = z.infer<typeof mailEnvSchema>;

let cached: MailEnv | undefined;

export function mailEnv(): MailEnv {
  if (cached) return cached;
  const parsed = mailEnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid mail environment:\n${lines.join("\n")}`);
  }
  cached = parsed.data;
  return cached;
}

/** The fake's mail folder, or undefined when neither MAIL_FAKE_DIR nor JP_FAKES_DIR is set. */
export function fakeMailDir(): string | undefined {
  const e = mailEnv();
  return e.MAIL_FAKE_DIR ?? (e.JP_FAKES_DIR ? `${e.JP_FAKES_DIR}/mail` : undefined);
}
