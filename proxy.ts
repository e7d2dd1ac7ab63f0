/**
 * Next.js 16 proxy (formerly middleware): adds the security headers to every response. It is not
 * an access check — route handlers authenticate and authorise every request themselves.
 */
import { NextResponse, type NextRequest } from "next/server";
import { securityHeaders } from "@/lib/server/security";

export function proxy(_request: NextRequest) {
  const response = NextResponse.next();
  for (const [name, value] of Object.entries(securityHeaders(process.env.NODE_ENV === "development"))) {
    response.headers.set(name, value);
  }
  return response;
}

export const config = {
  matcher: ["/((?!_next/static|_next/image).*)"],
};
