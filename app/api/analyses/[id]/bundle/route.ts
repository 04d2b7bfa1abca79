import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { reproductionBundle } from "@/lib/services/analyses";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** GET /api/analyses/:id/bundle : the reproduction bundle (settings, hashes, code version, seed, headline results). */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request);
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  const bundle = await reproductionBundle(user, id);
  return NextResponse.json(bundle, { headers: { "content-disposition": `attachment; filename="siderea-analysis-${id}-bundle.json"` } });
});
