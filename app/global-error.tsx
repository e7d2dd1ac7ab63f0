"use client";

import "./globals.css";

/**
 * The last resort when the root layout itself fails: it replaces the whole document, so it
 * brings its own html and body and uses no other component.
 */
export default function GlobalError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body className="bg-paper font-sans text-ink antialiased">
        <main className="mx-auto max-w-xl px-6 py-20">
          <p className="font-mono text-sm text-ink-faint">Jointproof · error</p>
          <h1 className="mt-2 text-3xl font-semibold tracking-tight">Jointproof could not start this page</h1>
          <p className="mt-4 text-ink-soft">
            Something failed on our side. Nothing you saved was changed. Try again; if it keeps failing, tell the person
            who runs this Jointproof server{error.digest ? ` and give them the reference ${error.digest}` : ""}.
          </p>
          <button
            type="button"
            onClick={reset}
            className="mt-8 rounded-md bg-brand-600 px-4 py-2 text-sm font-medium text-white hover:bg-brand-700"
          >
            Try again
          </button>
        </main>
      </body>
    </html>
  );
}
