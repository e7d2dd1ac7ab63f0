// Imported first by every probe: the probes talk to the server tests/e2e/server.ts started, and
// make their users, tokens and session cookies the way that server checks them (same APP_URL,
// hence the same cookie name and origin; same NEXTAUTH_SECRET, exported by scripts/test.sh).
process.env.APP_URL = process.env.JP_TEST_BASE_URL ?? `http://127.0.0.1:${process.env.JP_TEST_PORT ?? 3100}`;
if (!process.env.NEXTAUTH_SECRET) throw new Error("the probes need NEXTAUTH_SECRET (run them through npm test)");
export {};
