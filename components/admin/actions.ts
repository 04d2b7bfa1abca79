"use server";

import { revalidatePath } from "next/cache";
import { currentUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { HttpError, zodIssues } from "@/lib/http";
import { changeRole, createUser } from "@/lib/services/users";
import { ChangeRoleSchema, CreateUserSchema } from "@/lib/validations/user";

export type ActionResult = { ok: true; message: string } | { ok: false; message: string; fieldErrors?: Record<string, string> };

async function requireAdmin() {
  const user = await currentUser();
  if (!user) return { error: { ok: false, message: "Sign in again: your session has ended." } as ActionResult };
  if (!can(user.role, "users:manage")) return { error: { ok: false, message: "Only administrators manage users." } as ActionResult };
  return { user };
}

function failure(error: unknown): ActionResult {
  if (error instanceof HttpError) {
    const fieldErrors = Object.fromEntries((error.issues ?? []).map((i) => [i.path, i.message]));
    return { ok: false, message: error.message, fieldErrors };
  }
  console.error("admin action failed", error);
  return { ok: false, message: "The change could not be saved; the error was logged." };
}

/** Creates a user (admin only). */
export async function createUserAction(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  const auth = await requireAdmin();
  if ("error" in auth) return auth.error as ActionResult;
  const parsed = CreateUserSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) {
    return { ok: false, message: "Check the highlighted fields.", fieldErrors: Object.fromEntries(zodIssues(parsed.error).map((i) => [i.path, i.message])) };
  }
  try {
    const user = await createUser(parsed.data, auth.user.id);
    revalidatePath("/admin");
    return { ok: true, message: `Created ${user.email} as ${user.role}. Give them the password by a separate channel.` };
  } catch (error) {
    return failure(error);
  }
}

/** Changes a user's role (admin only). */
export async function changeRoleAction(userId: number, role: string): Promise<ActionResult> {
  const auth = await requireAdmin();
  if ("error" in auth) return auth.error as ActionResult;
  const parsed = ChangeRoleSchema.safeParse({ role });
  if (!parsed.success || !Number.isInteger(userId)) return { ok: false, message: "Choose one of the roles." };
  try {
    const user = await changeRole(userId, parsed.data.role, auth.user.id);
    revalidatePath("/admin");
    return { ok: true, message: `${user.email} is now ${user.role}.` };
  } catch (error) {
    return failure(error);
  }
}
