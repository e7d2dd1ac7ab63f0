import type { Metadata } from "next";
import Link from "next/link";

export const metadata: Metadata = { title: "Page not found" };

const link = "rounded-md border border-line bg-panel px-4 py-2 text-sm font-medium text-ink hover:border-brand-500";

/** The 404 page: what happened and where to go next. */
export default function NotFound() {
  return (
    <section className="mx-auto max-w-xl px-6 py-20">
      <p className="font-mono text-sm text-ink-faint">404</p>
      <h1 className="mt-2 text-3xl font-semibold tracking-tight text-ink">This page does not exist</h1>
      <p className="mt-4 text-ink-soft">
        The address may be mistyped, or the project or plan it pointed to was deleted, or it belongs to a project you
        are not a member of. If someone sent you the link, ask the project&apos;s owner to add you.
      </p>
      <div className="mt-8 flex flex-wrap gap-3">
        <Link
          href="/projects"
          className="rounded-md bg-brand-600 px-4 py-2 text-sm font-medium text-white hover:bg-brand-700"
        >
          Your projects
        </Link>
        <Link href="/bench" className={link}>
          Try-out bench
        </Link>
        <Link href="/" className={link}>
          Start page
        </Link>
      </div>
    </section>
  );
}
