import bcrypt from "bcryptjs";
import { encode } from "next-auth/jwt";
import { getDb } from "@/lib/db";
import { authSecret } from "@/lib/env";
import type { Role } from "@/lib/auth/roles";

/** Creates a user directly in the test database; returns its id. */
export async function makeUser(role: Role, email = `${role}-${Math.random().toString(36).slice(2)}@test.siderea.test`, password = "correct-horse-battery") {
  const user = await getDb().models.User.create({
    email,
    name: `Test ${role}`,
    role,
    passwordHash: await bcrypt.hash(password, 4),
    disabledAt: null,
  });
  return { id: user.id, email, password };
}

/** A real Request carrying a next-auth session cookie for the user, signed with the app's secret. */
export async function requestAs(userId: number | null, url: string, init: RequestInit = {}): Promise<Request> {
  const headers = new Headers(init.headers);
  if (userId !== null) {
    const token = await encode({ token: { sub: String(userId) }, secret: authSecret() });
    headers.set("cookie", `next-auth.session-token=${token}`);
  }
  return new Request(new URL(url, "http://127.0.0.1:3000"), { ...init, headers });
}
