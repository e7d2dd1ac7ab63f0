"use client";

import Link from "next/link";
import { Button } from "@/components/ui/button";

/**
 * The error page for a page that failed while rendering. It shows no internal detail (that is in
 * the server log); the digest lets the log line be found.
 */
export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <section className="mx-auto max-w-xl px-6 py-20">
      <p className="font-mono text-sm text-ink-faint">Error</p>
      <h1 className="mt-2 text-3xl font-semibold tracking-tight text-ink">This page could not be shown</h1>
      <p className="mt-4 text-ink-soft">
        Something failed on our side while preparing it. Nothing you saved was changed. Try again; if it keeps failing,
        tell the person who runs this Jointproof server
        {error.digest ? (
          <>
            {" "}
            and give them the reference <code className="font-mono text-sm text-ink">{error.digest}</code>
          </>
        ) : null}
        .
      </p>
      <div className="mt-8 flex flex-wrap gap-3">
        <Button variant="primary" onClick={reset}>
          Try again
        </Button>
        <Link
          href="/projects"
          className="inline-flex h-9 items-center rounded-md border border-line bg-panel px-3.5 text-sm font-medium text-ink hover:border-brand-500"
        >
          Your projects
        </Link>
      </div>
    </section>
  );
}
