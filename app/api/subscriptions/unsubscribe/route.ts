import { NextResponse } from "next/server";
import { parseOr422, readJson, route } from "@/lib/http";
import { unsubscribeWithToken } from "@/lib/services/subscriptions";
import { UnsubscribeSchema } from "@/lib/validations/alerts";

export const dynamic = "force-dynamic";

/**
 * POST /api/subscriptions/unsubscribe : uses the signed link of an alert e-mail, no sign-in.
 * The token comes in the JSON body `{ token }` (the unsubscribe page) or in the query with a
 * form body `List-Unsubscribe=One-Click` (mail clients, RFC 8058). 200 done, 400 not a valid
 * link, 409 already used, 410 expired.
 */
export const POST = route(async (request: Request) => {
  const type = request.headers.get("content-type") ?? "";
  const fromQuery = new URL(request.url).searchParams.get("token");
  const body = type.includes("application/json") ? await readJson(request) : { token: fromQuery ?? "" };
  const { token } = parseOr422(UnsubscribeSchema, body, "unsubscribe link");
  const { what } = await unsubscribeWithToken(token);
  return NextResponse.json({ ok: true, message: `You no longer receive ${what}.` });
});
