import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { datasetCountMap } from "@/lib/services/dataset-maps";

export const dynamic = "force-dynamic";

const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });
const QuerySchema = z.object({
  nside: z.coerce.number().int().refine((n) => [1, 2, 4, 8, 16, 32, 64, 128, 256, 512, 1024].includes(n), "Nside is a power of 2 from 1 to 1024."),
  version: z.coerce.number().int().positive().optional(),
});

/**
 * GET /api/datasets/:id/map?nside=64&version= : event counts per pixel as little-endian
 * Float32 in RING order (ICRS); Nside, ordering and frame travel in headers.
 */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  await authorize(request, "datasets:read");
  const { id } = parseOr422(ParamsSchema, await context.params, "dataset id");
  const { nside, version } = parseOr422(QuerySchema, Object.fromEntries(new URL(request.url).searchParams), "query");
  const map = await datasetCountMap(id, nside, version);
  const body = map.values.buffer.slice(map.values.byteOffset, map.values.byteOffset + map.values.byteLength) as ArrayBuffer;
  return new Response(body, {
    headers: {
      "content-type": "application/octet-stream",
      "x-healpix-nside": String(map.nside),
      "x-healpix-ordering": "RING",
      "x-healpix-coordsys": "C",
      "x-siderea-layer": "counts",
      "x-siderea-unit": "events",
      "x-siderea-blinded": String(map.blinded),
      "x-siderea-dataset-version": String(map.version),
      "cache-control": "private, max-age=60",
    },
  });
});
