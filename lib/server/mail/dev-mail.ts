/**
 * The development mail view: what the local SMTP fake received and the outbox's state. Only in
 * development and tests — in production it does not exist (404) unless JP_DEV_MAIL=1.
 */
import "server-only";
import { listOutbox } from "@/db/queries/mail";
import { fakeMailDir } from "./config";
import { readFakeMailbox, type FakeMessage } from "../../../scripts/fakes/smtp";

export function devMailEnabled(): boolean {
  return process.env.NODE_ENV !== "production" || process.env.JP_DEV_MAIL === "1";
}

export type DevMailView = {
  dir: string | null;
  messages: FakeMessage[];
  outbox: { id: string; kind: string; toAddress: string; subject: string; status: string; attempts: number; lastError: string | null; createdAt: string; sentAt: string | null }[];
};

/** Newest first. */
export async function loadDevMail(): Promise<DevMailView> {
  const dir = fakeMailDir() ?? null;
  const messages = dir ? (await readFakeMailbox(dir)).reverse() : [];
  const outbox = (await listOutbox({ limit: 200 })).map((r) => ({
    id: r.id,
    kind: r.kind,
    toAddress: r.toAddress,
    subject: r.subject,
    status: r.status,
    attempts: r.attempts,
    lastError: r.lastError,
    createdAt: r.createdAt.toISOString(),
    sentAt: r.sentAt?.toISOString() ?? null,
  }));
  return { dir, messages, outbox };
}
