"use server";

import { revalidatePath } from "next/cache";
import { currentUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { HttpError, zodIssues } from "@/lib/http";
import { createSite, updateSite } from "@/lib/services/sites";
import { SiteSchema } from "@/lib/validations/site";

export type SiteActionResult =
  | { ok: true; message: string; siteId: number }
  | { ok: false; message: string; fieldErrors?: Record<string, string> };

/** Creates a site (id absent) or updates one (admin, analyst). */
export async function saveSiteAction(_prev: SiteActionResult | null, form: FormData): Promise<SiteActionResult> {
  const user = await currentUser();
  if (!user) return { ok: false, message: "Sign in again: your session has ended." };
  if (!can(user.role, "sites:manage")) return { ok: false, message: "Your role cannot edit sites." };
  const parsed = SiteSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) {
    return { ok: false, message: "Check the highlighted fields.", fieldErrors: Object.fromEntries(zodIssues(parsed.error).map((i) => [i.path, i.message])) };
  }
  const id = Number(form.get("id"));
  try {
    const site = Number.isInteger(id) && id > 0 ? await updateSite(id, parsed.data, user.id) : await createSite(parsed.data, user.id);
    revalidatePath("/data/sites");
    return { ok: true, message: `Saved ${site.name}.`, siteId: site.id };
  } catch (error) {
    if (error instanceof HttpError) {
      return { ok: false, message: error.message, fieldErrors: Object.fromEntries((error.issues ?? []).map((i) => [i.path, i.message])) };
    }
    console.error("saving a site failed", error);
    return { ok: false, message: "The site could not be saved; the error was logged." };
  }
}
