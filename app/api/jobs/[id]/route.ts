import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { notFound, route } from "@/lib/http";
import { getJob } from "@/lib/services/uploads";

export const dynamic = "force-dynamic";

/** GET /api/jobs/:id : progress (rows read, rows stored) and outcome of an ingestion job. */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  await authorize(request, "datasets:read");
  const job = await getJob((await context.params).id);
  if (!job) throw notFound("job");
  return NextResponse.json({ job }, { headers: { "cache-control": "no-store" } });
});
