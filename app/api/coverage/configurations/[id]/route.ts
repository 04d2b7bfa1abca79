import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { deleteCoverageConfiguration, getCoverageConfiguration, updateCoverageConfiguration } from "@/lib/services/coverage";
import { CoverageConfigurationSchema } from "@/lib/validations/coverage";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });
type Context = { params: Promise<{ id: string }> };

/** GET /api/coverage/configurations/:id (any signed-in role). */
export const GET = route(async (request: Request, context: Context) => {
  await authorize(request);
  const { id } = parseOr422(ParamsSchema, await context.params, "configuration id");
  return NextResponse.json({ configuration: await getCoverageConfiguration(id) });
});

/** PUT /api/coverage/configurations/:id: replace (its owner, or an admin). */
export const PUT = route(async (request: Request, context: Context) => {
  const user = await authorize(request);
  const { id } = parseOr422(ParamsSchema, await context.params, "configuration id");
  const input = parseOr422(CoverageConfigurationSchema, await readJson(request), "coverage configuration");
  return NextResponse.json({ configuration: await updateCoverageConfiguration(user, id, input) });
});

/** DELETE /api/coverage/configurations/:id (its owner, or an admin). */
export const DELETE = route(async (request: Request, context: Context) => {
  const user = await authorize(request);
  const { id } = parseOr422(ParamsSchema, await context.params, "configuration id");
  await deleteCoverageConfiguration(user, id);
  return new Response(null, { status: 204 });
});
