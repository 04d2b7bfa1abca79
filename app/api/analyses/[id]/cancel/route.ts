import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { cancelAnalysis } from "@/lib/services/analyses";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** POST /api/analyses/:id/cancel (analyst); audited. */
export const POST = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "analyses:run");
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  await cancelAnalysis(user, id);
  return NextResponse.json({ ok: true });
});
