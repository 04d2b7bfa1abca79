import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth/options";

type Context = { params: Promise<{ nextauth: string[] }> };

// next-auth's App Router handler, created per request so configuration is read at run time.
function handler(request: Request, context: Context) {
  return NextAuth(request as never, context as never, authOptions());
}

export { handler as GET, handler as POST };
