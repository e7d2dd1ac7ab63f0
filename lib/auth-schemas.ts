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
  name: z.string({ error: "is required" }).trim().min(1, { error: "is required" }).max(120, { error: "must be at most 120 characters" }),
  password: passwordSchema,
  siteRole: z.enum(["student", "researcher"], { error: 'must be "student" or "researcher"' }).default("student"),
});

export type SignUpInput = z.infer<typeof signUpSchema>;
