import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { checkHealth } from "@/lib/services/health";
import { codeVersion } from "@/lib/version";

export const dynamic = "force-dynamic";

/** GET /api/health: app and database status; 503 when the database does not answer. No sign-in needed. */
export const GET = route(async () => {
  const health = await checkHealth(codeVersion());
  return NextResponse.json(health, { status: health.status === "ok" ? 200 : 503, headers: { "cache-control": "no-store" } });
});
