import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { authSecret } from "@/lib/env";
import { isRole } from "@/lib/auth/roles";
import { blockedForSeconds, limiterKeys, recordFailure, recordSuccess } from "@/lib/services/sign-in-limiter";
import { verifyPassword } from "@/lib/services/users";
import { SignInSchema } from "@/lib/validations/user";

/** Messages the sign-in page shows; they never say whether an account exists. */
export const SIGN_IN_ERRORS = {
  invalid: "The e-mail address or password is incorrect.",
  rateLimited: "Too many failed attempts. Wait a little and try again.",
} as const;

function clientAddress(headers: Record<string, unknown> | undefined): string {
  const forwarded = headers?.["x-forwarded-for"];
  const first = typeof forwarded === "string" ? forwarded.split(",")[0]?.trim() : undefined;
  return first || "unknown";
}

/** next-auth settings; built per call so the secret is read at request time, not at build time. */
export function authOptions(): NextAuthOptions {
  return {
  secret: authSecret(),
  session: { strategy: "jwt", maxAge: 8 * 60 * 60 },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials, req) {
        const parsed = SignInSchema.safeParse(credentials);
        if (!parsed.success) throw new Error("invalid");
        const { email, password } = parsed.data;
        const keys = limiterKeys(email, clientAddress(req?.headers as Record<string, unknown> | undefined));
        const wait = await blockedForSeconds(keys);
        if (wait > 0) throw new Error(`rate-limited:${wait}`);
        const user = await verifyPassword(email, password);
        if (!user) {
          await recordFailure(keys);
          throw new Error("invalid");
        }
        await recordSuccess(email);
        return { id: String(user.id), email: user.email, name: user.name, role: user.role };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user && "role" in user && isRole(user.role)) token.role = user.role;
      return token;
    },
    async session({ session, token }) {
      if (session.user) {
        session.user.id = token.sub ?? "";
        session.user.role = isRole(token.role) ? token.role : "member";
      }
      return session;
    },
  },
};
}
