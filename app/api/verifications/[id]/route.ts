import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { getVerification } from "@/lib/services/verifications";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** GET /api/verifications/:id : status and, when done, { match, data, differences }. */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "analyses:reproduce");
  const { id } = parseOr422(ParamsSchema, await context.params, "verification id");
  return NextResponse.json({ verification: await getVerification(user, id) }, { headers: { "cache-control": "no-store" } });
});
