import { NextResponse } from "next/server";
import { databaseAnswers } from "@/db/queries/health";
import pkg from "@/package.json";
import { logger } from "@/lib/server/log";
import { DATABASE_RETRY_AFTER_S } from "@/lib/server/route";

export const dynamic = "force-dynamic";

/** Liveness and database reachability: `{ ok, db: "up" | "down", version }` from a real query. */
export async function GET(): Promise<NextResponse> {
  let db: "up" | "down" = "down";
  try {
    if (await databaseAnswers()) db = "up";
  } catch (err) {
    logger.warn(
      { err: { message: err instanceof Error ? err.message : String(err) } },
      "health: database query failed",
    );
  }
  if (db === "up")
    return NextResponse.json({ ok: true, db, version: pkg.version }, { headers: { "Cache-Control": "no-store" } });
  return NextResponse.json(
    { ok: false, db, version: pkg.version },
    { status: 503, headers: { "Cache-Control": "no-store", "Retry-After": String(DATABASE_RETRY_AFTER_S) } },
  );
}
