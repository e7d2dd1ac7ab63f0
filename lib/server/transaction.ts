/**
 * Route handlers' doorway to one transaction around several named queries (db/transaction.ts):
 * a write and its audit entry commit together or not at all. App code never opens the database
 * client itself, so the helper is re-exported here.
 */
import "server-only";
export { inTransaction } from "@/db";
