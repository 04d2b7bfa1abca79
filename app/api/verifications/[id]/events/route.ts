import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { attachVerificationEvents } from "@/lib/services/verifications";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** POST /api/verifications/:id/events : body = the events CSV (canonical columns); 202, the check runs as a job. */
export const POST = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "analyses:reproduce");
  const { id } = parseOr422(ParamsSchema, await context.params, "verification id");
  await attachVerificationEvents(user, id, request.body);
  return NextResponse.json({ ok: true }, { status: 202 });
});
