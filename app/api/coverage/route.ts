import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { computeCoverage } from "@/lib/services/coverage";
import { CoverageQuerySchema } from "@/lib/validations/coverage";

export const dynamic = "force-dynamic";

/**
 * GET /api/coverage?lat=..&zenithMax=..&nside=..[&frame=equatorial|galactic][&decStep=..][&areaKm2=..&liveTimeYr=..][&format=json|binary]
 * json: the Sommers relative exposure curve, covered band, sky fraction, absolute figures and
 * the map's metadata; binary: the map as little-endian Float32 in RING order with Nside,
 * ordering and frame in headers (as the analyses' map endpoint). Cached (ETag, Cache-Control).
 */
export const GET = route(async (request: Request) => {
  // session: any signed-in role (the planner shows no data)
  await authorize(request);
  // query
  const q = parseOr422(CoverageQuerySchema, Object.fromEntries(new URL(request.url).searchParams), "coverage query");
  // work
  const result = computeCoverage(q);
  // response
  const headers = {
    etag: result.etag,
    "cache-control": "private, max-age=86400",
    "x-healpix-nside": String(q.nside),
    "x-healpix-ordering": "RING",
    "x-healpix-coordsys": q.frame === "equatorial" ? "C" : "G",
    "x-siderea-unit": "relative exposure",
  };
  if (request.headers.get("if-none-match") === result.etag) return new Response(null, { status: 304, headers });
  if (q.format === "binary") {
    const body = result.map.buffer.slice(result.map.byteOffset, result.map.byteOffset + result.map.byteLength) as ArrayBuffer;
    return new Response(body, { headers: { ...headers, "content-type": "application/octet-stream" } });
  }
  return NextResponse.json(result.json, { headers });
});
