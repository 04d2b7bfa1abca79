import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { healpixMapToFits } from "@/lib/analyses/fits";
import { analysisMap } from "@/lib/services/analyses";
import { pixelCentres } from "@/lib/sky/healpix";

export const dynamic = "force-dynamic";
const ParamsSchema = z.object({
  id: z.coerce.number().int().positive(),
  layer: z.enum(["counts", "expected", "excess", "significance", "exposure"]),
});
const QuerySchema = z.object({ format: z.enum(["binary", "csv", "json", "fits"]).default("binary") });

/**
 * GET /api/analyses/:id/maps/:layer?format=binary|csv|json|fits : a result map in RING order,
 * ICRS. binary: little-endian Float32 with Nside, ordering, frame, layer and unit in headers;
 * csv: pixel,ra,dec,value; json: { nside, ordering, coordsys, layer, unit, values } (NaN as
 * null); fits: a binary table with the HEALPix keywords.
 */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string; layer: string }> }) => {
  const user = await authorize(request);
  const { id, layer } = parseOr422(ParamsSchema, await context.params, "map");
  const { format } = parseOr422(QuerySchema, Object.fromEntries(new URL(request.url).searchParams), "query");
  const map = await analysisMap(user, id, layer);
  const values = new Float32Array(map.data.buffer.slice(map.data.byteOffset, map.data.byteOffset + map.data.byteLength));
  const meta = {
    "x-healpix-nside": String(map.nside),
    "x-healpix-ordering": map.ordering,
    "x-healpix-coordsys": map.coordsys,
    "x-siderea-layer": layer,
    "x-siderea-unit": map.unit,
    "cache-control": "private, max-age=300",
  };
  const name = `siderea-analysis-${id}-${layer}-nside${map.nside}`;
  if (format === "json") {
    return NextResponse.json(
      { nside: map.nside, ordering: map.ordering, coordsys: map.coordsys, layer, unit: map.unit, values: Array.from(values, (v) => (Number.isNaN(v) ? null : v)) },
      { headers: { ...meta, "content-disposition": `attachment; filename="${name}.json"` } },
    );
  }
  if (format === "csv") {
    const c = pixelCentres(map.nside, "ring");
    let text = "pixel,ra,dec,value\n";
    for (let p = 0; p < values.length; p++) text += `${p},${c.raDeg[p]!.toFixed(6)},${c.decDeg[p]!.toFixed(6)},${Number.isNaN(values[p]!) ? "" : values[p]}\n`;
    return new Response(text, { headers: { ...meta, "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${name}.csv"` } });
  }
  if (format === "fits") {
    const fits = healpixMapToFits(values, { nside: map.nside, ordering: "RING", coordsys: "C", column: layer, unit: map.unit });
    return new Response(fits.buffer as ArrayBuffer, { headers: { ...meta, "content-type": "application/fits", "content-disposition": `attachment; filename="${name}.fits"` } });
  }
  return new Response(values.buffer as ArrayBuffer, { headers: { ...meta, "content-type": "application/octet-stream" } });
});
