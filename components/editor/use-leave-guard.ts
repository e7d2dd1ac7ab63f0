"use client";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useRef, useState } from "react";

/**
 * Warns before leaving a page with unsaved changes: the browser's own prompt on reload, close and
 * typed addresses (`beforeunload`), and for links inside the app a question the page shows (the
 * returned `pending` address, `stay`, `leave`). Links are caught in the capture phase, before the
 * router sees the click. The back button of a single-page app cannot be held this way; the bench's
 * local draft (draft.ts) covers it.
 */
export function useLeaveGuard(active: boolean) {
  const router = useRouter();
  const [pending, setPending] = useState<string | null>(null);
  const bypass = useRef(false);

  useEffect(() => {
    if (!active) return;
    const onBeforeUnload = (event: BeforeUnloadEvent) => {
      if (bypass.current) return;
      event.preventDefault();
      // older browsers show the prompt only when returnValue is set
      event.returnValue = "";
    };
    const onClick = (event: MouseEvent) => {
      if (
        bypass.current ||
        event.defaultPrevented ||
        event.button !== 0 ||
        event.metaKey ||
        event.ctrlKey ||
        event.shiftKey ||
        event.altKey
      )
        return;
      const anchor = (event.target as Element | null)?.closest?.("a[href]");
      if (!(anchor instanceof HTMLAnchorElement) || anchor.target === "_blank" || anchor.hasAttribute("download"))
        return;
      const to = new URL(anchor.href, window.location.href);
      if (to.origin !== window.location.origin) return; // leaving the app: beforeunload asks
      if (to.pathname === window.location.pathname && to.search === window.location.search) return; // a fragment on this page
      event.preventDefault();
      event.stopPropagation();
      setPending(to.pathname + to.search + to.hash);
    };
    window.addEventListener("beforeunload", onBeforeUnload);
    document.addEventListener("click", onClick, true);
    return () => {
      window.removeEventListener("beforeunload", onBeforeUnload);
      document.removeEventListener("click", onClick, true);
    };
  }, [active]);

  const stay = useCallback(() => setPending(null), []);
  const leave = useCallback(() => {
    if (pending === null) return;
    bypass.current = true;
    setPending(null);
    router.push(pending);
  }, [pending, router]);

  return { pending, stay, leave };
}
