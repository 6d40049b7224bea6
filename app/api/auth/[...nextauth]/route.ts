import NextAuth from "next-auth";
import { getAuthOptions } from "@/lib/auth/options";

type Ctx = { params: Promise<{ nextauth: string[] }> };

// Options are built per request so the secret and session length come from the running
// environment, not from build time.
function handler(req: Request, ctx: Ctx) {
  return NextAuth(req as never, ctx as never, getAuthOptions());
}

export { handler as GET, handler as POST };
