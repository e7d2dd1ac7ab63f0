/** The SMTP client (nodemailer) built from the mail settings, made once per process. */
import nodemailer, { type Transporter } from "nodemailer";
import type { MailOutboxRow } from "@/db/schema/mail";
import { mailEnv } from "./config";

let transporter: Transporter | undefined;

function getTransport(): Transporter {
  if (transporter) return transporter;
  const e = mailEnv();
  transporter = nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER && e.SMTP_PASS ? { user: e.SMTP_USER, pass: e.SMTP_PASS } : undefined,
    // A server that is down must fail the attempt quickly, so the queue can retry it later.
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 15_000,
  });
  return transporter;
}

/**
 * The Message-ID of an outbox row: fixed per row, so that if a message is ever handed over twice
 * (a worker dying between the server's acceptance and our "sent" mark) receivers can tell.
 */
export function messageIdFor(outboxId: string): string {
  return `<${outboxId}@mail.jointproof.invalid>`;
}

/** Hands one outbox message to the SMTP server; resolves with its Message-ID when accepted. */
export async function deliver(
  row: Pick<MailOutboxRow, "id" | "kind" | "toAddress" | "subject" | "text" | "html">,
): Promise<string> {
  const messageId = messageIdFor(row.id);
  await getTransport().sendMail({
    from: mailEnv().SMTP_FROM,
    to: row.toAddress,
    subject: row.subject,
    text: row.text,
    html: row.html,
    messageId,
    headers: { "X-Jointproof-Kind": row.kind },
  });
  return messageId;
}

/** Closes pooled connections (tests, worker shutdown). */
export function closeTransport(): void {
  transporter?.close();
  transporter = undefined;
}
