/**
 * Shared set-up for the course tests: the real local SMTP fake on loopback (restartable on the
 * same port, for "mail server down"), the mailer pointed at it through the environment, and the
 * real pg-boss worker in this process against the test database.
 */
import { mkdtemp } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { readFakeMailbox, startFakeSmtp, type FakeMessage, type FakeSmtp } from "@/scripts/fakes/smtp";
import type { MailWorker } from "@/lib/server/mail/worker";

export type MailHarness = {
  dir: string;
  port: number;
  /** Stops the fake (the mail server goes down). */
  down: () => Promise<void>;
  /** Starts it again on the same port. */
  up: () => Promise<void>;
  messages: () => Promise<FakeMessage[]>;
  /** Waits until some message matches, up to `timeoutMs`. */
  waitFor: (match: (m: FakeMessage) => boolean, timeoutMs?: number) => Promise<FakeMessage>;
  close: () => Promise<void>;
};

/** Starts the fake on a free loopback port and points SMTP_* at it; call before the mailer is first used. */
export async function startMailHarness(): Promise<MailHarness> {
  const dir = await mkdtemp(path.join(tmpdir(), "jp-mail-"));
  let fake: FakeSmtp | undefined = await startFakeSmtp({ dir });
  const port = fake.port;
  process.env.SMTP_HOST = "127.0.0.1";
  process.env.SMTP_PORT = String(port);
  process.env.MAIL_RETRY_DELAY_S = "1";
  process.env.MAIL_FAKE_DIR = dir;
  const messages = () => readFakeMailbox(dir);
  return {
    dir,
    port,
    down: async () => {
      await fake?.stop();
      fake = undefined;
    },
    up: async () => {
      fake = await startFakeSmtp({ dir, port });
    },
    messages,
    waitFor: async (match, timeoutMs = 25_000) => {
      const until = Date.now() + timeoutMs;
      for (;;) {
        const found = (await messages()).find(match);
        if (found) return found;
        if (Date.now() > until)
          throw new Error(
            `no matching e-mail within ${timeoutMs} ms; received: ${(await messages()).map((m) => `${m.to}: ${m.subject}`).join(" | ") || "none"}`,
          );
        await new Promise((r) => setTimeout(r, 200));
      }
    },
    close: async () => {
      await fake?.stop();
    },
  };
}

export type MailWithWorker = { mail: MailHarness; worker: MailWorker; stop: () => Promise<void> };

/** The SMTP fake first (the mailer reads SMTP_* on first use), then the real pg-boss worker in this process. */
export async function startMailWithWorker(): Promise<MailWithWorker> {
  const mail = await startMailHarness();
  const { startMailWorker } = await import("@/lib/server/mail/worker");
  const worker = await startMailWorker({ pollingIntervalSeconds: 0.5, sweepIntervalMs: 1_000 });
  return {
    mail,
    worker,
    stop: async () => {
      await worker.stop();
      const { stopBoss } = await import("@/lib/server/mail/queue");
      await stopBoss();
      await mail.close();
    },
  };
}
