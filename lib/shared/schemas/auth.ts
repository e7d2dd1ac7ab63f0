/**
 * The account inputs: one zod schema each, shared by the sign-in and sign-up forms, the
 * next-auth credentials provider and the API.
 */
import { z } from "zod";

export const emailSchema = z
  .string({ error: "is required" })
  .trim()
  .toLowerCase()
  .max(254, { error: "must be at most 254 characters" })
  .email({ error: "must be an e-mail address" });

/** bcrypt reads at most 72 bytes of a password, so longer ones are refused rather than silently cut. */
export const passwordSchema = z
  .string({ error: "is required" })
  .min(10, { error: "must be at least 10 characters" })
  .refine((p) => new TextEncoder().encode(p).length <= 72, { error: "must be at most 72 bytes" });

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ error: "is required" }).min(1, { error: "is required" }).max(200),
});

/** Self sign-up picks student or researcher; instructor and admin are granted by an admin. */
export const signUpSchema = z.object({
  email: emailSchema,
  name: z
    .string({ error: "is required" })
    .trim()
    .min(1, { error: "is required" })
    .max(120, { error: "must be at most 120 characters" }),
  password: passwordSchema,
  siteRole: z.enum(["student", "researcher"], { error: 'must be "student" or "researcher"' }).default("student"),
});

export type SignUpInput = z.infer<typeof signUpSchema>;

/**
 * The one-time token from a password-reset or verification link (32 random bytes, base64url:
 * 43 characters). Bounded so that a pasted page of text is refused before it is hashed.
 */
export const accountTokenSchema = z
  .string({ error: "is required" })
  .trim()
  .min(1, { error: "is required" })
  .max(200, { error: "must be the token from the e-mail link" })
  .regex(/^[A-Za-z0-9_-]+$/, { error: "must be the token from the e-mail link" });

/** `POST /api/v1/accounts/password-reset`: ask for a reset link. */
export const passwordResetRequestSchema = z.strictObject({ email: emailSchema });

/** `POST /api/v1/accounts/password-reset/confirm`: set a new password with the link's token. */
export const passwordResetConfirmSchema = z.strictObject({ token: accountTokenSchema, password: passwordSchema });

/** `POST /api/v1/accounts/verify-email`: confirm an address with the link's token. */
export const verifyEmailSchema = z.strictObject({ token: accountTokenSchema });

/** What a used, expired or unknown account token is answered with. */
export const EXPIRED_LINK_MESSAGE = "The link has expired or was already used.";
