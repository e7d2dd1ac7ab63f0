import "server-only";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { authenticate } from "@/lib/auth-request";
import type { Actor } from "@/lib/permissions";

/**
 * The signed-in user for a workspace page, through the same `authenticate` the API uses (the
 * session cookie, re-read from PostgreSQL); anyone else is sent to sign in and brought back.
 */
export async function requirePageActor(returnTo: string): Promise<Actor> {
  const h = await headers();
  const cookie = h.get("cookie");
  const actor = cookie ? await authenticate(new Request("http://workspace.invalid/", { headers: { cookie } })) : null;
  if (!actor) redirect(`/sign-in?callbackUrl=${encodeURIComponent(returnTo)}`);
  return actor;
}
