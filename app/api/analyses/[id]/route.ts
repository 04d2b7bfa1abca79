import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { analysisDetail } from "@/lib/services/analysis-detail";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** GET /api/analyses/:id : settings, status and progress, summary, audit trail, reproductions. */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request);
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  return NextResponse.json({ analysis: await analysisDetail(user, id) }, { headers: { "cache-control": "no-store" } });
});
