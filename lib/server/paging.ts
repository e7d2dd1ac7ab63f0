/**
 * Cursor paging for the list endpoints (`?limit=&cursor=`): each list has a fixed, total order
 * (a sort key, then the row's id to break ties), and a cursor names the last row of a page by
 * those two values, so the next page starts right after it — every row once, in the same
 * order, however many rows are added before the cursor meanwhile. Cursors are opaque to
 * clients (base64url of a small JSON pair); a cursor that does not decode is a 400.
 */
import { z } from "zod";
import { listProjectsQuery } from "@/lib/shared/schemas/api";

export const PAGE_LIMIT_DEFAULT = 50;
export const PAGE_LIMIT_MAX = 200;

/** The last row of a page: its sort key (an ISO timestamp with microseconds, or a text) and its id. */
export type PageAfter = { key: string; id: string };

/** One page of a list and the cursor of the next one (null on the last page). */
export type Page<T> = { items: T[]; nextCursor: string | null };

export type CursorKind = { key: "timestamp" | "text"; id: "uuid" | "serial" };

/** PostgreSQL `to_char(… at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')`: microseconds kept, unlike a JS Date. */
const TIMESTAMP = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})\.\d{6}Z$/;
/** A uuid as a cursor carries it. */
export const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const SERIAL = /^[1-9]\d{0,17}$/;

/** A timestamp key that PostgreSQL will read back as the same instant (no 30 February). */
export function validTimestamp(key: string): boolean {
  const m = TIMESTAMP.exec(key);
  if (!m) return false;
  const [y, mo, d, h, mi, s] = m.slice(1).map(Number);
  const date = new Date(Date.UTC(y, mo - 1, d, h, mi, s));
  return (
    date.getUTCFullYear() === y &&
    date.getUTCMonth() === mo - 1 &&
    date.getUTCDate() === d &&
    h < 24 &&
    mi < 60 &&
    s < 60
  );
}

export function encodeCursor(after: PageAfter): string {
  return Buffer.from(JSON.stringify([after.key, after.id]), "utf8").toString("base64url");
}

/** The row a cursor names, or null when it is not a cursor of this list. */
export function decodeCursor(cursor: string, kind: CursorKind): PageAfter | null {
  if (!/^[A-Za-z0-9_-]{1,1024}$/.test(cursor)) return null;
  let value: unknown;
  try {
    value = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8"));
  } catch {
    return null;
  }
  if (!Array.isArray(value) || value.length !== 2 || typeof value[0] !== "string" || typeof value[1] !== "string")
    return null;
  const [key, id] = value as [string, string];
  if (kind.key === "timestamp" ? !validTimestamp(key) : key.length === 0 || key.length > 320) return null;
  if (!(kind.id === "uuid" ? UUID : SERIAL).test(id)) return null;
  return { key, id };
}

const CURSOR_MESSAGE = "must be the nextCursor of an earlier page of this list";

/** The `limit` and `cursor` query fields of one list, the cursor decoded to the row it names. */
export function pageQueryShape(kind: CursorKind) {
  return {
    limit: z.coerce
      .number({ error: "must be a whole number" })
      .int({ error: "must be a whole number" })
      .min(1, { error: "must be 1 or greater" })
      .max(PAGE_LIMIT_MAX, { error: `must be ${PAGE_LIMIT_MAX} or less` })
      .default(PAGE_LIMIT_DEFAULT)
      .describe(`Rows per page (1–${PAGE_LIMIT_MAX}, default ${PAGE_LIMIT_DEFAULT}).`),
    cursor: z
      .string()
      .transform((text, ctx): PageAfter => {
        const after = decodeCursor(text, kind);
        if (after) return after;
        ctx.addIssue({ code: "custom", message: CURSOR_MESSAGE });
        return z.NEVER;
      })
      .optional()
      .describe("The `nextCursor` of the previous page; omit for the first page."),
  };
}

export const timestampCursor: CursorKind = { key: "timestamp", id: "uuid" };

/** `?limit=&cursor=` of the lists ordered by a time, newest first (projects, plans). */
export const timePageQuery = z.strictObject(pageQueryShape(timestampCursor));
/** `?limit=&cursor=` of the members list (by e-mail). */
export const memberPageQuery = z.strictObject(pageQueryShape({ key: "text", id: "uuid" }));
/** `?limit=&cursor=` of the audit log (newest first; entries have serial ids). */
export const auditPageQuery = z.strictObject(pageQueryShape({ key: "timestamp", id: "serial" }));

/**
 * Rows fetched as `limit + 1` → one page: the extra row only tells that a next page exists; the
 * cursor names the last row shown.
 */
export function toPage<R extends { pageKey: string }, T>(
  rows: R[],
  limit: number,
  idOf: (row: R) => string,
  shape: (row: R) => T,
): Page<T> {
  const more = rows.length > limit;
  const shown = more ? rows.slice(0, limit) : rows;
  const last = shown[shown.length - 1];
  return {
    items: shown.map(shape),
    nextCursor: more && last ? encodeCursor({ key: last.pageKey, id: idOf(last) }) : null,
  };
}

/** `GET /projects`: the archived filter and a page. */
export const projectsPageQuery = z.strictObject({ ...listProjectsQuery.shape, ...pageQueryShape(timestampCursor) });
