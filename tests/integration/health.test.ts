import { afterAll, describe, expect, it } from "vitest";
import { GET } from "@/app/api/health/route";
import { pool } from "@/db";

describe("GET /api/health", () => {
  afterAll(async () => {
    await pool.end();
  });

  it("reports the database as up from a real query against the test database", async () => {
    const res = await GET();
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toEqual({ ok: true, db: "up", version: expect.stringMatching(/^\d+\.\d+\.\d+$/) });
    // The same pool really reaches PostgreSQL: the server answers with its own version.
    const v = await pool.query<{ server_version: string }>("show server_version");
    expect(v.rows[0].server_version).toMatch(/^\d+/);
  });
});
