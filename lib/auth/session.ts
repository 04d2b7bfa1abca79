import "server-only";
import { getToken } from "next-auth/jwt";
import { authSecret } from "@/lib/env";
import { forbidden, unauthenticated } from "@/lib/http";
import { findActiveUser, type PublicUser } from "@/lib/services/users";
import { can, type Permission } from "./roles";

/** Parses a Cookie header into a Map (name -> value). */
function parseCookies(header: string | null): Map<string, string> {
  const cookies = new Map<string, string>();
  for (const part of (header ?? "").split(";")) {
    const eq = part.indexOf("=");
    if (eq > 0) cookies.set(part.slice(0, eq).trim(), decodeURIComponent(part.slice(eq + 1).trim()));
  }
  return cookies;
}

/**
 * The signed-in user of a request, read from the session token and re-checked against the
 * database, so a role change or a disabled account takes effect at the next request.
 */
export async function userFromHeaders(headers: Headers): Promise<PublicUser | null> {
  const token = await getToken({
    req: { headers: Object.fromEntries(headers.entries()), cookies: parseCookies(headers.get("cookie")) } as never,
    secret: authSecret(),
  });
  const id = Number(token?.sub);
  if (!Number.isInteger(id) || id <= 0) return null;
  return findActiveUser(id);
}

/**
 * The one authorisation helper of route handlers: returns the user when signed in and
 * allowed, throws 401 when not signed in and 403 when the role lacks the permission.
 */
export async function authorize(request: Request | Headers, permission?: Permission): Promise<PublicUser> {
  const user = await userFromHeaders(request instanceof Headers ? request : request.headers);
  if (!user) throw unauthenticated();
  if (permission && !can(user.role, permission)) throw forbidden();
  return user;
}
