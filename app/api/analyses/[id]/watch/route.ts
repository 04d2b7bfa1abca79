import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { setWatch, watchInfo } from "@/lib/services/alerts";
import { WatchSchema } from "@/lib/validations/alerts";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** GET /api/analyses/:id/watch : whether it is watched, its reruns and the caller's subscription (by role). */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request);
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  return NextResponse.json({ watch: await watchInfo(user, id) });
});

/** POST /api/analyses/:id/watch { watched, dedupRadiusDeg?, updateStepSigma? } : analysts watch a finished hotspot scan; audited. */
export const POST = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  // Session and role.
  const user = await authorize(request, "analyses:run");
  // Params and body.
  const { id } = parseOr422(ParamsSchema, await context.params, "analysis id");
  const input = parseOr422(WatchSchema, await readJson(request), "watch");
  // Work and response.
  return NextResponse.json({ watch: await setWatch(user, id, input) });
});
