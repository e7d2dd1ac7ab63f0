/**
 * Whether every checker of this process is busy and its queue full, read without waiting, and the
 * error a route answers then. The check pool (lib/server/check-pool.ts) registers how to tell once it
 * has started; the early answer in lib/server/busy-early.ts reads it for each request before the
 * framework runs. Dependency-free apart from the error type, so the instrumentation hook can import
 * it without the engine.
 */
import { AppError } from "./errors";

/** Seconds a client is told to wait after a check was stopped or the pool was full. */
export const CHECK_RETRY_AFTER_S = 5;

const shared = globalThis as typeof globalThis & { jointproofCheckersFull?: () => boolean };

/** Registers (or, with undefined, forgets) the pool's own test of a full queue. */
export function registerCheckersFull(test: (() => boolean) | undefined): void {
  shared.jointproofCheckersFull = test;
}

/** True when the pool has started and a new check could only be answered "busy". */
export function checkersFull(): boolean {
  return shared.jointproofCheckersFull?.() ?? false;
}

/** The 503 for a check that found every checker busy (Retry-After from `details.retryAfterS`). */
export function checkersBusyError(): AppError {
  return new AppError(
    "unavailable:check-busy",
    `Every checker is busy; nothing was checked or saved. Try again in ${CHECK_RETRY_AFTER_S} s.`,
    { details: { retryAfterS: CHECK_RETRY_AFTER_S } },
  );
}
