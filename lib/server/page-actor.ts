import "server-only";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { getActiveUserById } from "@/db/queries/users";
import { authenticate } from "@/lib/server/auth-request";
import type { Actor } from "@/lib/server/permissions";

/**
 * Who is asking, for server components: the session cookie of the incoming request read through
 * the same `authenticate` the API uses (re-read from PostgreSQL), so pages and routes agree.
 */
async function pageActor(): Promise<Actor | null> {
  const cookie = (await headers()).get("cookie");
  if (!cookie) return null;
  return authenticate(new Request("http://page.invalid/", { headers: { cookie } }));
}

/** The signed-in user for a workspace page; anyone else is sent to sign in and brought back to `returnTo`. */
export async function requirePageActor(returnTo: string): Promise<Actor> {
  const actor = await pageActor();
  if (!actor) redirect(`/sign-in?callbackUrl=${encodeURIComponent(returnTo)}`);
  return actor;
}

export type PageUser = { actor: Actor; name: string; email: string };

/** The signed-in user for a page that also serves visitors (the shared header); `null` for anyone else. */
export async function optionalPageUser(): Promise<PageUser | null> {
  const actor = await pageActor();
  if (!actor) return null;
  const user = await getActiveUserById({ id: actor.userId });
  return user ? { actor, name: user.name, email: user.email } : null;
}
