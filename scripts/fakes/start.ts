/**
 * Local fakes of the outside services, for `npm start` and `npm test` only. Today: an
 * S3-compatible object store (s3rver) on 127.0.0.1:$S3_PORT (default 54330), files under
 * $JP_FAKES_DIR/s3; and, when SMTP_HOST is this machine, an SMTP server (scripts/fakes/smtp.ts)
 * on 127.0.0.1:$SMTP_PORT (default 54331) that stores each message under $MAIL_FAKE_DIR.
 * Prints `fakes ready` once every fake listens; runs until SIGTERM or SIGINT, then closes each
 * fake and exits 0.
 */
import { mkdirSync } from "node:fs";
import { join, resolve } from "node:path";
import S3rver from "s3rver";
import { startFakeSmtp, type FakeSmtp } from "./smtp";

type Fake = { name: string; start: () => Promise<void>; stop: () => Promise<void> };

const host = "127.0.0.1";
const dir = resolve(process.env.JP_FAKES_DIR ?? ".data/fakes");
const s3Port = Number(process.env.S3_PORT ?? 54330);
const bucket = process.env.S3_BUCKET ?? "jointproof";

function s3Fake(): Fake {
  const directory = join(dir, "s3");
  mkdirSync(directory, { recursive: true });
  const server = new S3rver({
    address: host,
    port: s3Port,
    directory,
    silent: true,
    // Path-style URLs only (http://127.0.0.1:port/bucket/key), as lib/server/storage.ts sends them.
    vhostBuckets: false,
    configureBuckets: [{ name: bucket, configs: [] }],
  });
  return {
    name: `S3 on http://${host}:${s3Port} (bucket ${bucket})`,
    start: () =>
      new Promise<void>((resolveStart, reject) => {
        // s3rver reports a busy port as an 'error' event, not through run(); catch it here.
        const onError = (err: Error) => reject(err);
        process.once("uncaughtException", onError);
        server.run().then(
          () => {
            process.off("uncaughtException", onError);
            resolveStart();
          },
          (err: Error) => {
            process.off("uncaughtException", onError);
            reject(err);
          },
        );
      }),
    stop: () =>
      new Promise<void>((done) => {
        // Idle keep-alive connections would hold close() open for seconds.
        (server as unknown as { httpServer?: import("node:http").Server }).httpServer?.closeAllConnections();
        server.close(() => done());
      }),
  };
}

function smtpFake(): Fake {
  const port = Number(process.env.SMTP_PORT ?? 54331);
  const mailDir = resolve(process.env.MAIL_FAKE_DIR ?? join(dir, "mail"));
  let running: FakeSmtp | undefined;
  return {
    name: `SMTP on ${host}:${port} (messages under ${mailDir})`,
    start: async () => {
      running = await startFakeSmtp({ host, port, dir: mailDir });
    },
    stop: async () => {
      await running?.stop();
    },
  };
}

// A real mail server named in SMTP_HOST gets no fake in front of it.
const smtpIsLocal = !process.env.SMTP_HOST || process.env.SMTP_HOST === host;
const fakes: Fake[] = smtpIsLocal ? [s3Fake(), smtpFake()] : [s3Fake()];

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  console.log(`[fakes] ${signal}: closing`);
  // A fake that does not close within 3 s (a client holding a connection) is not waited for.
  await Promise.race([Promise.allSettled(fakes.map((f) => f.stop())), new Promise((r) => setTimeout(r, 3000))]);
  process.exit(0);
}
process.on("SIGTERM", () => void stop("SIGTERM"));
process.on("SIGINT", () => void stop("SIGINT"));

try {
  for (const fake of fakes) {
    await fake.start();
    console.log(`[fakes] ${fake.name}`);
  }
  console.log("fakes ready");
} catch (err) {
  console.error("[fakes] failed to start:", err instanceof Error ? err.message : err);
  await Promise.allSettled(fakes.map((f) => f.stop()));
  process.exit(1);
}
