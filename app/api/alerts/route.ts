import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { listAlerts } from "@/lib/services/alerts";

export const dynamic = "force-dynamic";
const QuerySchema = z.object({ analysisId: z.coerce.number().int().positive().optional() });

/** GET /api/alerts?analysisId= : alerts of the analyses the caller may read, newest first. */
export const GET = route(async (request: Request) => {
  const user = await authorize(request, "alerts:subscribe");
  const query = parseOr422(QuerySchema, Object.fromEntries(new URL(request.url).searchParams), "query");
  return NextResponse.json({ alerts: await listAlerts(user, { analysisId: query.analysisId }) });
});
