import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { deleteSubscription, updateSubscription } from "@/lib/services/subscriptions";
import { SubscriptionUpdateSchema } from "@/lib/validations/alerts";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** PATCH /api/subscriptions/:id { localSigmaThreshold?, postTrialSigmaThreshold?, delivery?, paused? } : change or pause one's own subscription. */
export const PATCH = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "alerts:subscribe");
  const { id } = parseOr422(ParamsSchema, await context.params, "subscription id");
  const changes = parseOr422(SubscriptionUpdateSchema, await readJson(request), "subscription change");
  return NextResponse.json({ subscription: await updateSubscription(user, id, changes) });
});

/** DELETE /api/subscriptions/:id : unsubscribe (signed in). */
export const DELETE = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "alerts:subscribe");
  const { id } = parseOr422(ParamsSchema, await context.params, "subscription id");
  await deleteSubscription(user, id);
  return NextResponse.json({ ok: true });
});
