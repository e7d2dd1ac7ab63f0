/**
 * One transaction around several named queries, without threading a `tx` through each of them:
 * inside `inTransaction(fn)`, the shared `db` (db/index.ts) resolves to the open transaction, so a
 * write and its audit entry commit together or not at all. Nested calls join the outer transaction.
 */
import { AsyncLocalStorage } from "node:async_hooks";
import type { Db } from "./index";

const current = new AsyncLocalStorage<Db>();

/** The transaction open in this async context, if any (db/index.ts routes queries to it). */
export function currentTransaction(): Db | undefined {
  return current.getStore();
}

/** Runs `fn` in one transaction on `root`: committed when it resolves, rolled back when it throws. */
export async function runInTransaction<T>(root: Db, fn: () => Promise<T>): Promise<T> {
  if (current.getStore()) return fn();
  return root.transaction((tx) => current.run(tx as unknown as Db, fn));
}
