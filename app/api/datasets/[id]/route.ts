import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { getDatasetDetail } from "@/lib/services/datasets";

export const dynamic = "force-dynamic";

const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** GET /api/datasets/:id : summary, versions and the analyses that use it. */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  await authorize(request, "datasets:read");
  const { id } = parseOr422(ParamsSchema, await context.params, "dataset id");
  return NextResponse.json({ dataset: await getDatasetDetail(id) });
});
