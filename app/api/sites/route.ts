import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { createSite, listSites } from "@/lib/services/sites";
import { SiteSchema } from "@/lib/validations/site";

export const dynamic = "force-dynamic";

/** GET /api/sites: every site (any role that reads data or manages sites). */
export const GET = route(async (request: Request) => {
  // Session and role: site positions are not secret, but only data roles need them.
  await authorize(request, "datasets:read");
  return NextResponse.json({ sites: await listSites() });
});

/** POST /api/sites: create a site (admin, analyst). */
export const POST = route(async (request: Request) => {
  // Session and role.
  const actor = await authorize(request, "sites:manage");
  // Body.
  const input = parseOr422(SiteSchema, await readJson(request), "site");
  // Work and response.
  return NextResponse.json({ site: await createSite(input, actor.id) }, { status: 201 });
});
