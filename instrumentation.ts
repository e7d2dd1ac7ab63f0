/**
 * Runs once when a Next.js server process starts: validate the environment there, so a bad
 * or missing variable stops the server with a clear message instead of failing a request later.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { env } = await import("./lib/server/env");
  env();
}
