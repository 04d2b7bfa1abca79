import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { analysisMap } from "@/lib/services/analyses";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({
  id: z.coerce.number().int().positive(),
  layer: z.enum(["counts", "expected", "excess", "significance", "exposure"]),
});

/**
 * GET /api/analyses/:id/maps/:layer : the result map as little-endian Float32, RING order,
 * ICRS; Nside, ordering, frame, layer and unit in headers.
 */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string; layer: string }> }) => {
  const user = await authorize(request);
  const { id, layer } = parseOr422(ParamsSchema, await context.params, "map");
  const map = await analysisMap(user, id, layer);
  return new Response(new Uint8Array(map.data), {
    headers: {
      "content-type": "application/octet-stream",
      "x-healpix-nside": String(map.nside),
      "x-healpix-ordering": map.ordering,
      "x-healpix-coordsys": map.coordsys,
      "x-siderea-layer": layer,
      "x-siderea-unit": map.unit,
      "cache-control": "private, max-age=300",
    },
  });
});
