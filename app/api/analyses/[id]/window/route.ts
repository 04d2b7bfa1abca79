import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { windowEvents } from "@/lib/services/analysis-window";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });
const QuerySchema = z.object({ ra: z.coerce.number().min(0).max(360), dec: z.coerce.number().min(-90).max(90) });

/** GET /api/analyses/:id/window?ra=&dec= : summary of the events inside a window (degrees, ICRS). */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request);
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  const { ra, dec } = parseOr422(QuerySchema, Object.fromEntries(new URL(request.url).searchParams), "window");
  return NextResponse.json(await windowEvents(user, id, ra, dec));
});
