import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { HttpError, parseOr422, route } from "@/lib/http";
import { getDb } from "@/lib/db";
import { receiveUpload } from "@/lib/services/uploads";
import { AppendQuerySchema } from "@/lib/validations/dataset";

export const dynamic = "force-dynamic";

const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** POST /api/datasets/:id/batches?dropBadRows= : append a batch (same site and column mapping). Body: the CSV file. */
export const POST = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  // Session and role.
  const user = await authorize(request, "datasets:upload");
  // Params and query.
  const { id } = parseOr422(ParamsSchema, await context.params, "dataset id");
  const query = parseOr422(AppendQuerySchema, Object.fromEntries(new URL(request.url).searchParams), "upload settings");
  const dataset = await getDb().models.Dataset.findByPk(id, { attributes: ["id", "status"] });
  if (!dataset) throw new HttpError(404, "not_found", "No such dataset.");
  if (dataset.status !== "ready") throw new HttpError(409, "conflict", "The dataset is still being ingested; append when it is ready.");
  // Body, then the job.
  const jobId = await receiveUpload(request.body, {
    userId: user.id,
    datasetId: id,
    fileName: query.fileName,
    options: { mode: "append", dropBadRows: query.dropBadRows },
  });
  return NextResponse.json({ job: { id: jobId, url: `/api/jobs/${jobId}` } }, { status: 202 });
});
