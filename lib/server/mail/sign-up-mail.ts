/**
 * The e-mail an account's owner gets when someone signs up with their address: sign-up answers
 * the same for new and existing addresses (no account probing), so the owner is told instead.
 */
import "server-only";
import { queueMail } from "@/db/queries/mail";
import { enqueueMail } from "./queue";
import { appLink, escapeHtml, type MailContent } from "./templates";

/** Window of the per-address dedupe: at most one such note per address in it. */
const NOTE_WINDOW_MS = 15 * 60_000;

function existingAccountNote(): MailContent {
  const signIn = appLink("/sign-in");
  const reset = appLink("/forgot-password");
  const paragraphs = [
    "Someone asked to create a Jointproof account with this e-mail address, which already has one. No second account was made and nothing about your account changed.",
    "If it was you, sign in instead; if you have forgotten the password, reset it. If it was not you, you can ignore this message.",
  ];
  const foot = "You receive this because of your account on Jointproof.";
  return {
    subject: "Sign-up attempt with your address",
    text: [...paragraphs, `Sign in: ${signIn}`, `Reset the password: ${reset}`, "", "--", foot].join("\n\n"),
    html: [
      "<!doctype html>",
      '<html lang="en"><body style="font-family: system-ui, sans-serif; color: #1d2430; line-height: 1.5">',
      ...paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
      `<p><a href="${escapeHtml(signIn)}" style="color: #185b6e">Sign in</a> · <a href="${escapeHtml(reset)}" style="color: #185b6e">Reset the password</a></p>`,
      `<p style="color: #4a5261; font-size: 0.875em">${escapeHtml(foot)}</p>`,
      "</body></html>",
    ].join("\n"),
  };
}

/** Queues the note for an existing account's address (at most one per address per 15 minutes). */
export async function notifyExistingAccountSignUp({ email }: { email: string }): Promise<void> {
  const bucket = Math.floor(Date.now() / NOTE_WINDOW_MS);
  const ids = await queueMail([
    {
      kind: "sign-up-existing",
      dedupeKey: `sign-up-existing:${email.toLowerCase()}:${bucket}`,
      toAddress: email.toLowerCase(),
      ...existingAccountNote(),
    },
  ]);
  await enqueueMail(ids);
}
