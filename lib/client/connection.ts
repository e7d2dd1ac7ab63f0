/**
 * Whether the API can reach its database, as the browser last heard: the API answers 503
 * (`unavailable:database`, with Retry-After) while the database is unreachable. The API client
 * reports each answer here; the bench shows a "reconnecting" notice from it instead of an error page
 * and asks /api/health again until the database answers.
 */

/** What the client knows about the server's database. */
export type Connection = { state: "ok" } | { state: "reconnecting"; since: number; retryAfterS: number };

const ok: Connection = { state: "ok" };
let current: Connection = ok;
const listeners = new Set<() => void>();

function set(next: Connection): void {
  current = next;
  for (const listener of listeners) listener();
}

/** The API answered that the database is unreachable; `retryAfterS` from its Retry-After header. */
export function reportUnavailable(retryAfterS: number): void {
  const wait = Number.isFinite(retryAfterS) && retryAfterS > 0 ? Math.min(retryAfterS, 60) : 2;
  set(
    current.state === "reconnecting"
      ? { ...current, retryAfterS: wait }
      : { state: "reconnecting", since: Date.now(), retryAfterS: wait },
  );
}

/** The API answered a request normally: the database is reachable again. */
export function reportReachable(): void {
  if (current.state !== "ok") set(ok);
}

export function connectionNow(): Connection {
  return current;
}

/** Subscribes to changes (for React's useSyncExternalStore); returns the unsubscribe. */
export function subscribeConnection(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** True for an answer that means "the database is unreachable": our 503 shape, or a bare 503 from in front of us. */
export function meansUnreachable(status: number, code: string | undefined): boolean {
  return status === 503 && (code === undefined || code === "unavailable:database");
}
