import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { readJson, route } from "@/lib/http";
import { createVerification } from "@/lib/services/verifications";

export const dynamic = "force-dynamic";

/** POST /api/verifications : body = a reproduction bundle (JSON). Then send the events to /api/verifications/:id/events. */
export const POST = route(async (request: Request) => {
  const user = await authorize(request, "analyses:reproduce");
  const id = await createVerification(user, await readJson(request));
  return NextResponse.json({ verification: { id, events: `/api/verifications/${id}/events`, url: `/api/verifications/${id}` } }, { status: 201 });
});
