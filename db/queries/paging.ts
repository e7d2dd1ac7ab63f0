import "server-only";
import { asc, desc, sql, type AnyColumn, type SQL } from "drizzle-orm";
import type { PageAfter } from "@/lib/server/paging";

/**
 * The SQL half of cursor paging (lib/server/paging.ts has the cursor format): every paged list
 * orders by a sort key then the row's id, and the next page starts strictly past the row the
 * cursor names, compared as a row value `(key, id)` so ties on the key are never skipped or repeated.
 */
export type PageOrder = {
  /** The sort column (a timestamp or a text). */
  key: AnyColumn;
  /** The tie-breaking id column. */
  id: AnyColumn;
  direction: "newest first" | "ascending";
  /** How the cursor's two strings are cast back to the columns' types. */
  keyType: "timestamptz" | "text";
  idType: "uuid" | "bigint";
};

/** The order of the lists newest first by a timestamp column, a uuid breaking ties. */
export function newestFirst(key: AnyColumn, id: AnyColumn): PageOrder {
  return { key, id, direction: "newest first", keyType: "timestamptz", idType: "uuid" };
}

/** A timestamp column as a page key: UTC ISO with microseconds (a JS Date would round them). */
export function timestampPageKey(column: AnyColumn): SQL<string> {
  return sql<string>`to_char(${column} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`;
}

/** The `where` condition of the rows past the cursor, or undefined on the first page. */
export function pastCursor(order: PageOrder, after: PageAfter | undefined): SQL | undefined {
  if (!after) return undefined;
  const comparison = sql.raw(order.direction === "newest first" ? "<" : ">");
  const key = sql`${after.key}::${sql.raw(order.keyType)}`;
  const id = sql`${after.id}::${sql.raw(order.idType)}`;
  return sql`(${order.key}, ${order.id}) ${comparison} (${key}, ${id})`;
}

/** The `order by` of a paged list: key then id, both in the list's direction. */
export function pageOrderBy(order: PageOrder): [SQL, SQL] {
  const by = order.direction === "newest first" ? desc : asc;
  return [by(order.key), by(order.id)];
}
