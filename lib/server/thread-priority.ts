/**
 * Lowers the scheduling priority (raises the nice value) of the calling thread only. The check pool's
 * worker threads call it as they start, so that on a machine whose cores are all busy checking, the
 * request thread (health, pages, every other route) is still scheduled first and answers at once.
 *
 * Linux keeps a nice value per thread (setpriority(2), "Bugs": per-thread under NPTL, not per process
 * as POSIX says); the thread's own id comes from /proc/thread-self, a link to "<pid>/task/<tid>". On
 * any other system, or where /proc is not mounted, nothing changes and null is returned.
 */
import { readlinkSync } from "node:fs";
import { getPriority, setPriority } from "node:os";

/** The nice value checker threads run at: 10, half-way to the lowest priority (19). */
export const CHECKER_NICE = 10;

/** This thread's id (Linux), or null when it cannot be read. */
export function ownThreadId(): number | null {
  try {
    const tid = Number(readlinkSync("/proc/thread-self").split("/").pop());
    return Number.isInteger(tid) && tid > 0 ? tid : null;
  } catch {
    return null;
  }
}

/**
 * Sets the calling thread's nice value to at least `nice` (never raises its priority) and returns the
 * thread id and the nice value it now has, or null when the system keeps no per-thread value here.
 */
export function lowerOwnThreadPriority(nice = CHECKER_NICE): { tid: number; nice: number } | null {
  const tid = ownThreadId();
  if (tid === null) return null;
  try {
    if (getPriority(tid) < nice) setPriority(tid, nice);
    return { tid, nice: getPriority(tid) };
  } catch {
    return null;
  }
}
