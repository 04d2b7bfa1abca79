import "server-only";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import type { PublicUser } from "@/lib/services/users";
import { can, type Permission } from "./roles";
import { userFromHeaders } from "./session";

/** For server components and server actions: the signed-in user, or null. */
export async function currentUser(): Promise<PublicUser | null> {
  return userFromHeaders(await headers());
}

/**
 * For pages: redirects to sign-in when nobody is signed in; returns `forbidden: true`
 * when the role lacks the permission, so the page can render the refusal.
 */
export async function requirePageUser(permission?: Permission): Promise<{ user: PublicUser; forbidden: boolean }> {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  return { user, forbidden: permission ? !can(user.role, permission) : false };
}
