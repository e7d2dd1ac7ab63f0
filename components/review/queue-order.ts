/**
 * The review queue's orders, shared by the server page (first render) and the queue's table in the
 * browser: waiting submissions first, and the ranks the database's enums sort by.
 */
import type { SubmissionStatus } from "./status-words";

/**
 * The queue's order when none is chosen: waiting submissions first, each group oldest first (the
 * longest wait on top); an id breaks ties so the order is stable.
 */
export function waitingFirst<T extends { id: string; status: SubmissionStatus; submittedAt: string }>(
  rows: readonly T[],
): T[] {
  const rank = (s: SubmissionStatus) => (s === "submitted" ? 0 : 1);
  return rows
    .slice()
    .sort(
      (a, b) =>
        rank(a.status) - rank(b.status) ||
        Date.parse(a.submittedAt) - Date.parse(b.submittedAt) ||
        a.id.localeCompare(b.id),
    );
}

/** A submission state's place when the queue is sorted by status: the order of the database enum `submission_status`. */
export const statusRank: Record<SubmissionStatus, number> = { submitted: 0, returned: 1, approved: 2 };

/** A verdict's place when the queue is sorted by verdict: the order of the database enum `verdict`, mildest first. */
export const verdictRank: Record<"pass" | "caution" | "fault", number> = { pass: 0, caution: 1, fault: 2 };
