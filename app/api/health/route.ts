import { NextResponse } from "next/server";
import { databaseAnswers } from "@/db/queries/health";
import pkg from "@/package.json";

export const dynamic = "force-dynamic";

/** Liveness and database reachability: `{ ok, db: "up" | "down", version }` from a real query. */
export async function GET(): Promise<NextResponse> {
  let db: "up" | "down" = "down";
  try {
    if (await databaseAnswers()) db = "up";
  } catch (err) {
    console.error("[health] database query failed:", err instanceof Error ? err.message : err);
  }
  return NextResponse.json({ ok: db === "up", db, version: pkg.version }, { status: db === "up" ? 200 : 503 });
}
