import NextAuth from "next-auth";
import type { NextRequest } from "next/server";
import { authOptions } from "@/lib/server/auth";

/** The App Router's second argument to a catch-all route handler. */
type Context = { params: Promise<{ nextauth: string[] }> };

type Handler = (request: NextRequest, context: Context) => Promise<Response>;

let handler: Handler | undefined;

/**
 * next-auth 4 in the App Router: one handler for its GET and POST endpoints (sign-in, sign-out,
 * session, csrf). The options are built on the first request rather than at import, because they
 * read the validated environment (APP_URL, NEXTAUTH_SECRET — and env() also insists on DATABASE_URL)
 * and `next build` imports every route module without the server's environment.
 */
function handle(request: NextRequest, context: Context): Promise<Response> {
  handler ??= NextAuth(authOptions()) as Handler;
  return handler(request, context);
}

export { handle as GET, handle as POST };
