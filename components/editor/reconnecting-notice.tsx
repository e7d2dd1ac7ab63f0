"use client";
import { useQueryClient } from "@tanstack/react-query";
import { useEffect, useSyncExternalStore } from "react";
import { connectionNow, reportReachable, subscribeConnection, type Connection } from "@/lib/client/connection";

const serverView = (): Connection => ({ state: "ok" });

/**
 * While the API answers that its database is unreachable (503), a notice in place of an error:
 * the bench keeps working on the plan in this browser (the live check needs no server), nothing is
 * saved until the database answers, and /api/health is asked again every Retry-After seconds. Once it
 * answers, the notice goes and the page's server data is fetched again.
 */
export function ReconnectingNotice() {
  const connection = useSyncExternalStore(subscribeConnection, connectionNow, serverView);
  const queryClient = useQueryClient();
  const waitS = connection.state === "reconnecting" ? connection.retryAfterS : null;

  useEffect(() => {
    if (waitS === null) return;
    let stopped = false;
    const timer = setInterval(async () => {
      try {
        const res = await fetch("/api/health", { cache: "no-store" });
        if (!stopped && res.ok) {
          reportReachable();
          void queryClient.invalidateQueries();
        }
      } catch {
        // still unreachable: ask again at the next tick
      }
    }, waitS * 1000);
    return () => {
      stopped = true;
      clearInterval(timer);
    };
  }, [waitS, queryClient]);

  if (connection.state !== "reconnecting") return null;
  return (
    <div
      role="status"
      data-testid="reconnecting"
      className="flex flex-wrap items-center gap-2 border-b border-line bg-caution-tint px-4 py-1.5 text-xs text-ink"
    >
      <span className="inline-block h-2 w-2 animate-pulse rounded-full bg-caution" aria-hidden />
      <span>
        Reconnecting: the server cannot reach its database right now, so nothing is saved or loaded. The bench still
        checks your plan in this browser and keeps your edits here; trying again every {connection.retryAfterS} s.
      </span>
    </div>
  );
}
