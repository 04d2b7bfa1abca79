import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { requestReproduction } from "@/lib/services/analyses";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** POST /api/analyses/:id/reproductions : rerun the saved analysis (referee, analyst). 202. */
export const POST = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "analyses:reproduce");
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  const reproductionId = await requestReproduction(user, id);
  return NextResponse.json({ reproduction: { id: reproductionId } }, { status: 202 });
});
