import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { shareAnalysis } from "@/lib/services/analyses";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });
const BodySchema = z.object({ email: z.string().trim().email("Enter the referee's e-mail address.") });

/** POST /api/analyses/:id/share { email } : share with a referee (read and reproduce only); audited. */
export const POST = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "analyses:publish");
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  const { email } = parseOr422(BodySchema, await readJson(request), "share");
  await shareAnalysis(user, id, email);
  return NextResponse.json({ ok: true });
});
