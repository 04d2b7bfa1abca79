import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { createSubscription, listSubscriptions } from "@/lib/services/subscriptions";
import { SubscriptionSchema } from "@/lib/validations/alerts";

export const dynamic = "force-dynamic";

/** GET /api/subscriptions : the caller's subscriptions. */
export const GET = route(async (request: Request) => {
  const user = await authorize(request, "alerts:subscribe");
  return NextResponse.json({ subscriptions: await listSubscriptions(user) });
});

/** POST /api/subscriptions { analysisId | null, localSigmaThreshold, postTrialSigmaThreshold, delivery } : subscribe; 201. */
export const POST = route(async (request: Request) => {
  // Session and role.
  const user = await authorize(request, "alerts:subscribe");
  // Body.
  const input = parseOr422(SubscriptionSchema, await readJson(request), "subscription");
  // Work and response.
  return NextResponse.json({ subscription: await createSubscription(user, input) }, { status: 201 });
});
