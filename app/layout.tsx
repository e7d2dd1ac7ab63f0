import type { Metadata } from "next";
import Image from "next/image";
import Link from "next/link";
import "./globals.css";
import { SignOutButton } from "@/components/site/sign-out-button";
import { optionalPageUser } from "@/lib/server/page-actor";
import { capabilities } from "@/lib/server/permissions";
import { mono, sans } from "./fonts";

export const metadata: Metadata = {
  title: { default: "Jointproof", template: "%s · Jointproof" },
  description: "Plan joint moves for small robot arms and check them against the arm's limits before the arm moves.",
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  const user = await optionalPageUser();
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="flex min-h-screen flex-col antialiased">
        <a
          href="#main"
          className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:bg-panel focus:px-3 focus:py-2"
        >
          Skip to content
        </a>
        <header className="border-b border-line bg-panel">
          <nav aria-label="Main" className="mx-auto flex h-14 max-w-6xl items-center gap-6 px-6">
            <Link href="/" className="flex items-center gap-2 font-semibold tracking-tight text-brand-700">
              <Image src="/icon.svg" alt="" width={22} height={22} unoptimized />
              Jointproof
            </Link>
            <div className="flex flex-1 items-center gap-5 text-sm text-ink-soft">
              {user && (
                <>
                  <Link href="/projects" className="hover:text-ink">
                    Projects
                  </Link>
                  <Link href="/courses" className="hover:text-ink">
                    Courses
                  </Link>
                  {capabilities(user.actor, { kind: "site" }).canCreateCourse && (
                    <Link href="/reviews" className="hover:text-ink">
                      Reviews
                    </Link>
                  )}
                </>
              )}
              <Link href="/api-docs" className="hover:text-ink">
                API
              </Link>
            </div>
            {user ? (
              <div className="flex items-center gap-4">
                <span className="text-sm text-ink-soft" title={user.email}>
                  {user.name} <span className="text-ink-faint">· {user.actor.siteRole}</span>
                </span>
                <Link href="/settings/tokens" className="text-sm text-ink-soft hover:text-ink">
                  API tokens
                </Link>
                <SignOutButton />
              </div>
            ) : (
              <div className="flex items-center gap-4 text-sm">
                <Link href="/bench" className="text-ink-soft hover:text-ink">
                  Try-out bench
                </Link>
                <Link href="/sign-up" className="text-ink-soft hover:text-ink">
                  Sign up
                </Link>
                <Link href="/sign-in" className="font-medium text-brand-600 hover:text-brand-700">
                  Sign in
                </Link>
              </div>
            )}
          </nav>
        </header>
        <main id="main" className="flex-1">
          {children}
        </main>
        <footer className="border-t border-line bg-panel text-sm text-ink-soft">
          <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-6 py-4">
            <p>
              A passing check is a prediction, not a guarantee.{" "}
              <Link href="/safety" className="font-medium text-copper-600 underline underline-offset-2">
                Safety before you run a plan
              </Link>
            </p>
            <p className="text-ink-faint">Jointproof</p>
          </div>
        </footer>
      </body>
    </html>
  );
}
