import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth";

// next-auth 4 in the App Router: one handler for its GET and POST endpoints (sign-in, sign-out, session, csrf).
const handler = NextAuth(authOptions());

export { handler as GET, handler as POST };
