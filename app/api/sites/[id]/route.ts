import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { getSite, updateSite } from "@/lib/services/sites";
import { SiteSchema } from "@/lib/validations/site";

export const dynamic = "force-dynamic";

const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });
type Context = { params: Promise<{ id: string }> };

/** GET /api/sites/:id */
export const GET = route(async (request: Request, context: Context) => {
  await authorize(request, "datasets:read");
  const { id } = parseOr422(ParamsSchema, await context.params, "site id");
  return NextResponse.json({ site: await getSite(id) });
});

/** PUT /api/sites/:id: replace the site's settings (admin, analyst); changes are audited. */
export const PUT = route(async (request: Request, context: Context) => {
  // Session and role.
  const actor = await authorize(request, "sites:manage");
  // Params and body.
  const { id } = parseOr422(ParamsSchema, await context.params, "site id");
  const input = parseOr422(SiteSchema, await readJson(request), "site");
  // Work and response.
  return NextResponse.json({ site: await updateSite(id, input, actor.id) });
});
