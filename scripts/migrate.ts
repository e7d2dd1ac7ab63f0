// Applies the committed Drizzle migrations (db/migrations) to DATABASE_URL. A second run is a no-op.
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { Pool } from "pg";

const url = process.env.DATABASE_URL;
if (!url) {
  console.error("DATABASE_URL is not set");
  process.exit(2);
}
const pool = new Pool({ connectionString: url, max: 1 });
try {
  await migrate(drizzle(pool), { migrationsFolder: new URL("../db/migrations", import.meta.url).pathname });
  console.log("[jointproof] migrations applied");
} catch (err) {
  console.error("[jointproof] migration failed:", err instanceof Error ? err.message : err);
  process.exitCode = 1;
} finally {
  await pool.end();
}
