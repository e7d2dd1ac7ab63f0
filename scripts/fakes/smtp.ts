/**
 * The local SMTP fake for development and tests: an smtp-server on loopback that accepts every
 * message (no auth, no TLS — it never leaves 127.0.0.1) and stores each as a JSON file under a
 * folder, and the reader that the development mail page and the tests use.
 */
import { randomUUID } from "node:crypto";
import { mkdir, readdir, readFile, rm, writeFile } from "node:fs/promises";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";

/** One received message as stored. */
export type FakeMessage = {
  id: string;
  receivedAt: string;
  envelope: { from: string | null; to: string[] };
  messageId: string | null;
  kind: string | null;
  subject: string;
  from: string;
  to: string;
  text: string;
  html: string;
};

export type FakeSmtp = { host: string; port: number; dir: string; stop: () => Promise<void> };

function addressText(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return "";
  return (Array.isArray(a) ? a : [a]).map((x) => x.text).join(", ");
}

/** Starts the fake on `host:port` (port 0 picks a free one) and stores messages under `dir`. */
export async function startFakeSmtp({
  port = 0,
  host = "127.0.0.1",
  dir,
}: {
  port?: number;
  host?: string;
  dir: string;
}): Promise<FakeSmtp> {
  await mkdir(dir, { recursive: true });
  const server = new SMTPServer({
    disabledCommands: ["AUTH", "STARTTLS"],
    authOptional: true,
    logger: false,
    banner: "jointproof local mail fake",
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("error", callback);
      stream.on("end", () => {
        void (async () => {
          const raw = Buffer.concat(chunks);
          const parsed = await simpleParser(raw);
          const kindHeader = parsed.headers.get("x-jointproof-kind");
          const message: FakeMessage = {
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            envelope: {
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
              to: session.envelope.rcptTo.map((r) => r.address),
            },
            messageId: parsed.messageId ?? null,
            kind: typeof kindHeader === "string" ? kindHeader : null,
            subject: parsed.subject ?? "",
            from: addressText(parsed.from),
            to: addressText(parsed.to),
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : "",
          };
          // Time first so a plain sort of the names is the order of arrival.
          const name = `${message.receivedAt.replace(/[:.]/g, "-")}-${message.id}.json`;
          await writeFile(path.join(dir, name), JSON.stringify(message, null, 2));
        })().then(
          () => callback(),
          (err: Error) => callback(err),
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const address = server.server.address() as AddressInfo;
  return {
    host,
    port: address.port,
    dir,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** Every message stored under `dir`, oldest first; an absent folder is an empty mailbox. */
export async function readFakeMailbox(dir: string): Promise<FakeMessage[]> {
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith(".json")).sort();
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw err;
  }
  const out: FakeMessage[] = [];
  for (const name of names) out.push(JSON.parse(await readFile(path.join(dir, name), "utf8")) as FakeMessage);
  return out;
}

/** Empties the mailbox folder. */
export async function clearFakeMailbox(dir: string): Promise<void> {
  await rm(dir, { recursive: true, force: true });
  await mkdir(dir, { recursive: true });
}

/**
 * Starts the fake from the environment, for scripts/fakes/start.ts: SMTP_PORT (default 2525) on
 * 127.0.0.1, storing under MAIL_FAKE_DIR or $JP_FAKES_DIR/mail.
 */
export async function startFakeSmtpFromEnv(env: NodeJS.ProcessEnv = process.env): Promise<FakeSmtp> {
  const dir = env.MAIL_FAKE_DIR ?? (env.JP_FAKES_DIR ? path.join(env.JP_FAKES_DIR, "mail") : undefined);
  if (!dir) throw new Error("Set MAIL_FAKE_DIR or JP_FAKES_DIR for the local SMTP fake's mail folder.");
  return startFakeSmtp({ port: Number(env.SMTP_PORT ?? 2525), dir });
}
