import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { createAnalysis, listAnalyses } from "@/lib/services/analyses";
import { NewAnalysisSchema } from "@/lib/validations/analysis";

export const dynamic = "force-dynamic";

/** GET /api/analyses : the analyses the caller may see. */
export const GET = route(async (request: Request) => {
  const user = await authorize(request);
  const rows = await listAnalyses(user);
  return NextResponse.json({
    analyses: rows.map((a) => ({ id: a.id, name: a.name, kind: a.kind, status: a.status, progress: a.progress, datasetId: a.datasetId, datasetVersion: a.datasetVersion, publishedAt: a.publishedAt, createdAt: a.createdAt })),
  });
});

/** POST /api/analyses { name, purpose, settings } : queue a new analysis (analyst). 202 with its id. */
export const POST = route(async (request: Request) => {
  // Session and role.
  const user = await authorize(request, "analyses:run");
  // Body.
  const input = parseOr422(NewAnalysisSchema, await readJson(request), "analysis");
  // Work and response.
  const analysis = await createAnalysis(input, user);
  return NextResponse.json({ analysis: { id: analysis.id, url: `/api/analyses/${analysis.id}`, settingsHash: analysis.settingsHash } }, { status: 202 });
});
