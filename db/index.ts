import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { env } from "@/lib/server/env";
import * as schema from "./schema";
import { currentTransaction, runInTransaction } from "./transaction";

export type Db = NodePgDatabase<typeof schema>;

/**
 * One pg Pool per server process, made on first use rather than at import, so that
 * `next build` (which imports route modules) needs no database. In development Next
 * reloads modules, so the pool is kept on globalThis to avoid a new pool per reload.
 */
const globalForDb = globalThis as unknown as { jointproofPool?: Pool; jointproofDb?: Db };
let realPool: Pool | undefined;
let realDb: Db | undefined;

function getPool(): Pool {
  realPool ??= globalForDb.jointproofPool;
  if (!realPool) {
    realPool = new Pool({ connectionString: env().DATABASE_URL, max: 10, idleTimeoutMillis: 30_000 });
    // An idle client's error (the server restarting, say) must not crash the process.
    realPool.on("error", (err) => console.error("[db] idle client error:", err.message));
    if (process.env.NODE_ENV === "development") globalForDb.jointproofPool = realPool;
  }
  return realPool;
}

function getDb(): Db {
  realDb ??= drizzle(getPool(), { schema });
  return realDb;
}

/** Forwards every property to the lazily made target, with methods bound to it. */
function lazy<T extends object>(target: () => T): T {
  return new Proxy({} as T, {
    get(_shell, prop) {
      const real = target();
      const value = Reflect.get(real, prop, real);
      return typeof value === "function" ? value.bind(real) : value;
    },
  });
}

/** The shared pg Pool (for raw queries such as the health check). */
export const pool: Pool = lazy(getPool);

/**
 * The Drizzle client over the shared pool, with the whole schema for relational queries; inside
 * `inTransaction` (below) it is that transaction.
 */
export const db: Db = lazy(() => currentTransaction() ?? getDb());

/** Runs `fn` in one transaction: every query made through `db` inside it commits together or not at all. */
export function inTransaction<T>(fn: () => Promise<T>): Promise<T> {
  return runInTransaction(getDb(), fn);
}

export { schema };
