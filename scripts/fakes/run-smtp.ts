/**
 * The local SMTP fake as its own process (`tsx scripts/fakes/run-smtp.ts`), for set-ups that do
 * not start it from scripts/fakes/start.ts. Prints "smtp fake ready" once listening.
 */
import { startFakeSmtpFromEnv } from "./smtp";

const fake = await startFakeSmtpFromEnv();
console.log(`smtp fake ready on ${fake.host}:${fake.port}, storing under ${fake.dir}`);
const stop = () => void fake.stop().then(() => process.exit(0));
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
