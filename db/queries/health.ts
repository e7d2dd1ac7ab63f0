import "server-only";
import { pool } from "@/db";

/** True when PostgreSQL answers a trivial query; errors propagate to the caller, which logs them. */
export async function databaseAnswers(): Promise<boolean> {
  const res = await pool.query<{ one: number }>("select 1 as one");
  return res.rows[0]?.one === 1;
}
