/**
 * Cursor paging of the review queue (`GET /api/v1/reviews?limit=&cursor=`). The queue has more
 * orders than the other lists: waiting first (the default), or one chosen column with the waiting
 * order breaking its ties. Its cursor has the same outer format as every list's (base64url of the
 * JSON pair `[key, id]`, lib/server/paging.ts), and its key carries what the next page starts
 * after: the order it was made for, the row's submission time (microseconds, as PostgreSQL prints
 * it), its state and its value in the chosen column. A cursor of another order, or one that does
 * not decode, is a 400.
 */
import { z } from "zod";
import { queueQuerySchema } from "@/lib/shared/schemas/reviews";
import { encodeCursor, pageQueryShape, UUID, validTimestamp } from "./paging";

const STATUSES = ["submitted", "returned", "approved"] as const;
const VERDICTS = ["pass", "caution", "fault"] as const;

export type QueueSortColumn = z.infer<typeof queueQuerySchema>["sort"];
type Status = (typeof STATUSES)[number];

/** The queue's order: a chosen column and direction, or null for waiting first, oldest first. */
export type QueueOrder = { sort: QueueSortColumn; order: "asc" | "desc" } | null;

/** The row a queue cursor names: where the next page starts. */
export type QueueAfter = {
  /** Its submission time, `YYYY-MM-DDTHH:MM:SS.ffffffZ` in UTC. */
  submittedKey: string;
  status: Status;
  /** Its value in the chosen column (the student's name, the verdict, …); "" in the default order. */
  value: string;
  id: string;
};

const SEPARATOR = "|";
// A name of 120 characters, each escaped in JSON as \uXXXX, still fits.
const CURSOR_MAX_CHARS = 2048;

/** The order's name inside a cursor, so a cursor of one order is refused by another. */
function orderTag(order: QueueOrder): string {
  return order ? `${order.sort}.${order.order}` : "waiting";
}

/** The cursor key of a queue row: order, submission time, state, then the column's value (which may hold anything, so it comes last). */
export function queueCursorKey(order: QueueOrder, row: Omit<QueueAfter, "id">): string {
  return [orderTag(order), row.submittedKey, row.status, row.value].join(SEPARATOR);
}

export function encodeQueueCursor(order: QueueOrder, row: QueueAfter): string {
  return encodeCursor({ key: queueCursorKey(order, row), id: row.id });
}

/** The row a cursor names, or null when it is not a cursor of the queue in this order. */
export function decodeQueueCursor(cursor: string, order: QueueOrder): QueueAfter | null {
  if (cursor.length > CURSOR_MAX_CHARS || !/^[A-Za-z0-9_-]+$/.test(cursor)) return null;
  let pair: unknown;
  try {
    pair = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8"));
  } catch {
    return null;
  }
  if (!Array.isArray(pair) || pair.length !== 2 || typeof pair[0] !== "string" || typeof pair[1] !== "string")
    return null;
  const [key, id] = pair as [string, string];
  if (!UUID.test(id)) return null;
  const parts = key.split(SEPARATOR);
  if (parts.length < 4) return null;
  const [tag, submittedKey, status] = parts;
  const value = parts.slice(3).join(SEPARATOR);
  if (tag !== orderTag(order) || !validTimestamp(submittedKey)) return null;
  if (!(STATUSES as readonly string[]).includes(status)) return null;
  const valueFits =
    order === null || order.sort === "submittedAt"
      ? value === ""
      : order.sort === "status"
        ? value === status
        : order.sort === "verdict"
          ? (VERDICTS as readonly string[]).includes(value)
          : value.length > 0; // a name or title: never empty in the database
  if (!valueFits) return null;
  return { submittedKey, status: status as Status, value, id: id.toLowerCase() };
}

const CURSOR_MESSAGE = "must be the nextCursor of an earlier page of this queue, with the same sort and order";

/**
 * `GET /reviews`: the queue's filters, an optional sort (none: waiting first, oldest first), and a
 * page. The cursor is checked against the order in `reviewQueuePageQuery`; here it is only text, so
 * the OpenAPI document shows it as the other lists' cursors.
 */
export const reviewQueueQueryFields = z.strictObject({
  courseId: queueQuerySchema.shape.courseId,
  assignmentId: queueQuerySchema.shape.assignmentId,
  status: queueQuerySchema.shape.status,
  verdict: queueQuerySchema.shape.verdict,
  sort: queueQuerySchema.shape.sort
    .unwrap()
    .optional()
    .describe(
      "The column to sort by; ties and the default order: waiting for review first, then the longest wait first.",
    ),
  order: queueQuerySchema.shape.order
    .unwrap()
    .optional()
    .describe("Direction of `sort` (default asc); only with `sort`."),
  limit: pageQueryShape({ key: "text", id: "uuid" }).limit,
  cursor: z
    .string({ error: CURSOR_MESSAGE })
    .optional()
    .describe("The `nextCursor` of the previous page, with the same sort and order; omit for the first page."),
});

export type ReviewQueuePageQuery = {
  filter: { courseId?: string; assignmentId?: string; status?: Status; verdict?: (typeof VERDICTS)[number] };
  order: QueueOrder;
  limit: number;
  after?: QueueAfter;
};

/** The query string of `GET /reviews`, the cursor decoded for the order it asks for. */
export const reviewQueuePageQuery = reviewQueueQueryFields.transform((q, ctx): ReviewQueuePageQuery => {
  if (q.order !== undefined && q.sort === undefined) {
    ctx.addIssue({ code: "custom", path: ["order"], message: "applies only with sort; omit it for waiting first" });
    return z.NEVER;
  }
  const order: QueueOrder = q.sort ? { sort: q.sort, order: q.order ?? "asc" } : null;
  let after: QueueAfter | undefined;
  if (q.cursor !== undefined) {
    const decoded = decodeQueueCursor(q.cursor, order);
    if (!decoded) {
      ctx.addIssue({ code: "custom", path: ["cursor"], message: CURSOR_MESSAGE });
      return z.NEVER;
    }
    after = decoded;
  }
  return {
    filter: { courseId: q.courseId, assignmentId: q.assignmentId, status: q.status, verdict: q.verdict },
    order,
    limit: q.limit,
    after,
  };
});
