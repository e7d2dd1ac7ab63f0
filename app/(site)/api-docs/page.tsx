import type { Metadata } from "next";
import Link from "next/link";
import { apiOperations } from "@/lib/server/openapi";
import { PAGE_LIMIT_DEFAULT, PAGE_LIMIT_MAX } from "@/lib/server/paging";

export const metadata: Metadata = { title: "API reference" };

/** A readable reference of /api/v1, from the same list that generates openapi.json. */
export default function ApiDocsPage() {
  const operations = apiOperations();
  const tags = [...new Set(operations.map((o) => o.tag))];
  return (
    <article className="mx-auto max-w-4xl px-6 py-12 text-ink">
      <h1 className="text-3xl font-semibold tracking-tight">API reference</h1>
      <p className="mt-3 text-ink-soft">
        Everything the workbench does with plans is available over HTTP under{" "}
        <code className="font-mono text-sm">/api/v1</code>. The machine-readable description is{" "}
        <Link href="/api/v1/openapi.json" className="font-medium text-brand-600 underline underline-offset-2">
          OpenAPI 3.1 at /api/v1/openapi.json
        </Link>
        .
      </p>

      <aside
        role="note"
        className="mt-6 rounded border border-copper-500/40 bg-caution-tint px-4 py-3 text-sm text-ink"
      >
        <p className="font-semibold">Before a plan leaves Jointproof</p>
        <p className="mt-1">
          A check predicts controller faults and collisions from a model of the arm. A pass is not proof that a motion
          is safe. Before an exported plan runs on hardware, fix the arm firmly to its table, clear people and objects
          out of its reach, keep the emergency stop at hand, run new plans slowly the first time, confirm that the arm
          model matches the real arm and tool (the two tool variants differ in weight), and follow your lab&apos;s
          safety rules, the arm maker&apos;s instructions and the standards that apply to you, such as ISO 10218 and
          local codes.{" "}
          <Link href="/safety" className="font-medium underline underline-offset-2">
            More on safety
          </Link>
        </p>
      </aside>

      <section className="mt-10 space-y-3">
        <h2 className="text-xl font-semibold">Signing requests</h2>
        <p className="text-ink-soft">
          Create a personal token under{" "}
          <Link href="/settings/tokens" className="text-brand-600 underline underline-offset-2">
            Settings → API tokens
          </Link>{" "}
          or with <code className="font-mono text-sm">POST /api/v1/tokens</code>. It is shown once; only its SHA-256 is
          stored. Send it as a Bearer token (RFC 6750); it has exactly your permissions and stops working the moment you
          revoke it.
        </p>
        <pre className="overflow-x-auto rounded bg-brand-900 p-4 font-mono text-sm text-brand-50">
          {`curl -H "Authorization: Bearer $JOINTPROOF_TOKEN" \\
     -H "Content-Type: application/json" \\
     --data @plan.json http://127.0.0.1:3000/api/v1/check`}
        </pre>
      </section>

      <section className="mt-10 space-y-3">
        <h2 className="text-xl font-semibold">Errors</h2>
        <p className="text-ink-soft">
          Every error has one shape. <code className="font-mono text-sm">issues</code> names each field that was
          refused, by its path.
        </p>
        <pre className="overflow-x-auto rounded bg-brand-900 p-4 font-mono text-sm text-brand-50">
          {`{ "error": { "code": "bad_request:validation",
             "message": "The request body is not valid.",
             "issues": [ { "path": "document.moves[2].duration", "message": "must be 0 or greater" } ] } }`}
        </pre>
        <p className="text-ink-soft">
          Saving a version states <code className="font-mono text-sm">baseVersion</code>, the version your edit started
          from. If someone saved in between, the answer is <strong>409</strong> with{" "}
          <code className="font-mono text-sm">latestVersion</code>: load it and merge, or save your work as a new plan.
          Nothing is overwritten.
        </p>
      </section>

      <section className="mt-10 space-y-3">
        <h2 className="text-xl font-semibold">Lists, a page at a time</h2>
        <p className="text-ink-soft">
          The lists of projects, plans, members and the audit log answer one page with{" "}
          <code className="font-mono text-sm">nextCursor</code>. Ask for the next page with{" "}
          <code className="font-mono text-sm">?cursor=</code> and that value, until it is{" "}
          <code className="font-mono text-sm">null</code>; <code className="font-mono text-sm">?limit=</code> sets the
          page size ({PAGE_LIMIT_DEFAULT} by default, at most {PAGE_LIMIT_MAX}). Every row comes once, in a fixed order;
          a cursor that is not from the same list is refused with 400.
        </p>
        <pre className="overflow-x-auto rounded bg-brand-900 p-4 font-mono text-sm text-brand-50">
          {`GET /api/v1/projects?limit=2
{ "projects": [ … two projects … ], "nextCursor": "WyIyMDI2LTEyLTAy…" }`}
        </pre>
      </section>

      <section className="mt-10 space-y-3">
        <h2 className="text-xl font-semibold">Numbering</h2>
        <p className="text-ink-soft">
          Screens and messages count moves, episodes and lines from 1 (&ldquo;Move 1&rdquo; is the first move). JSON
          stays 0-based: a finding&apos;s <code className="font-mono text-sm">move: 0</code> and the field path{" "}
          <code className="font-mono text-sm">moves[0]</code> both name Move 1.
        </p>
      </section>

      <section className="mt-10 space-y-3">
        <h2 className="text-xl font-semibold">Exports</h2>
        <p className="text-ink-soft">
          <code className="font-mono text-sm">GET …/versions/:n/export?format=json|csv&amp;rateHz=…</code> returns the
          waypoint list sampled at the rate you choose (default: the arm&apos;s control rate), the check report and the
          arm revision. A JSON export is itself a plan document, so{" "}
          <code className="font-mono text-sm">bin/jointproof check export.json</code> re-checks it; its{" "}
          <code className="font-mono text-sm">export.sha256</code> is the SHA-256 of the JSON text of the whole file
          without that field. A CSV export ends with <code className="font-mono text-sm"># sha256: …</code>, the SHA-256
          of every byte before that line.
        </p>
      </section>

      {tags.map((tag) => (
        <section key={tag} className="mt-10">
          <h2 className="text-xl font-semibold">{tag}</h2>
          <table className="mt-3 w-full border-collapse text-sm">
            <thead>
              <tr className="border-b border-line text-left text-ink-faint">
                <th className="py-2 pr-3 font-medium">Method</th>
                <th className="py-2 pr-3 font-medium">Path</th>
                <th className="py-2 pr-3 font-medium">What it does</th>
                <th className="py-2 font-medium">Answers</th>
              </tr>
            </thead>
            <tbody>
              {operations
                .filter((o) => o.tag === tag)
                .map((o) => (
                  <tr key={`${o.method} ${o.path}`} className="border-b border-line/60 align-top">
                    <td className="py-2 pr-3">
                      <span className="font-mono text-xs font-semibold text-ink uppercase">{o.method}</span>
                    </td>
                    <td className="py-2 pr-3 font-mono text-xs">/api/v1{o.path}</td>
                    <td className="py-2 pr-3 text-ink-soft">{o.summary}</td>
                    <td className="py-2 font-mono text-xs text-ink-faint tabular-nums">
                      {[o.ok, ...o.errors].join(" ")}
                    </td>
                  </tr>
                ))}
            </tbody>
          </table>
        </section>
      ))}
    </article>
  );
}
