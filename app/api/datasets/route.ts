import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { HttpError, parseOr422, route } from "@/lib/http";
import { listDatasets } from "@/lib/services/datasets";
import { getSite } from "@/lib/services/sites";
import { receiveUpload } from "@/lib/services/uploads";
import { DatasetListQuerySchema, mappingFromQuery, NewDatasetQuerySchema } from "@/lib/validations/dataset";

export const dynamic = "force-dynamic";

/** GET /api/datasets?q=&siteId=&sort=&dir=&page=&pageSize= : the dataset table. */
export const GET = route(async (request: Request) => {
  // Session and role.
  await authorize(request, "datasets:read");
  // Query.
  const query = parseOr422(DatasetListQuerySchema, Object.fromEntries(new URL(request.url).searchParams), "query");
  // Work and response.
  return NextResponse.json(await listDatasets(query));
});

/**
 * POST /api/datasets?name=&siteId=&timeFormat=&azimuthConvention=&energyUnit=&timeColumn=...&dropBadRows=&blinded=
 * Body: the CSV file (optionally gzip-compressed) as is. Answers 202 with the ingestion job.
 */
export const POST = route(async (request: Request) => {
  // Session and role.
  const user = await authorize(request, "datasets:upload");
  // Query: the dataset's name, site and column mapping.
  const query = parseOr422(NewDatasetQuerySchema, Object.fromEntries(new URL(request.url).searchParams), "upload settings");
  await getSite(query.siteId).catch(() => {
    throw new HttpError(422, "validation_failed", "The chosen site does not exist.", [{ path: "siteId", message: "No such site." }]);
  });
  // Body, streamed into the database; then the job is queued.
  const id = await receiveUpload(request.body, {
    userId: user.id,
    datasetId: null,
    fileName: query.fileName,
    options: {
      mode: "new",
      name: query.name,
      description: query.description,
      siteId: query.siteId,
      mapping: mappingFromQuery(query),
      dropBadRows: query.dropBadRows,
      blinded: query.blinded,
    },
  });
  return NextResponse.json({ job: { id, url: `/api/jobs/${id}` } }, { status: 202 });
});
