import "server-only";
import { headers } from "next/headers";
import { getActiveUserById } from "@/db/queries/users";
import { authenticate } from "@/lib/auth-request";
import type { Actor } from "@/lib/permissions";

export type PageUser = { actor: Actor; name: string; email: string };

/**
 * The signed-in user for a page that also serves visitors (the shared header), through the
 * same `authenticate` the API uses; `null` for anyone not signed in or no longer active.
 */
export async function optionalPageUser(): Promise<PageUser | null> {
  const cookie = (await headers()).get("cookie");
  if (!cookie) return null;
  const actor = await authenticate(new Request("http://page.invalid/", { headers: { cookie } }));
  if (!actor) return null;
  const user = await getActiveUserById({ id: actor.userId });
  return user ? { actor, name: user.name, email: user.email } : null;
}
