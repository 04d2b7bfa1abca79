"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { HealpixOrder } from "@/lib/sky/healpix";

/** A HEALPix map as the sky map draws it: values per pixel in ICRS, NaN = no data. */
export interface FetchedHealpixMap {
  nside: number;
  order: HealpixOrder;
  values: Float32Array;
  /** What the values are (x-siderea-layer), e.g. "counts". */
  layer: string;
  /** Their unit (x-siderea-unit), e.g. "events". */
  unit: string;
  /** True when the server says the sky is blinded (x-siderea-blinded). */
  blinded: boolean;
}

const LITTLE_ENDIAN = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

/**
 * Reads a binary map response: the body is little-endian Float32, one value per pixel; the
 * headers give x-healpix-nside, x-healpix-ordering (RING or NESTED), x-healpix-coordsys (must be
 * C = ICRS), x-siderea-layer and x-siderea-unit. Throws an Error with a readable message when a
 * header is missing or wrong or when the body is not 12 Nside^2 x 4 bytes long.
 */
export function parseHealpixMap(headers: Headers, body: ArrayBuffer): FetchedHealpixMap {
  const nsideText = headers.get("x-healpix-nside");
  const nside = Number(nsideText);
  if (!(Number.isInteger(nside) && nside >= 1 && nside <= 8192 && (nside & (nside - 1)) === 0)) {
    throw new Error(`The map has no valid Nside (x-healpix-nside: ${nsideText ?? "missing"}).`);
  }
  const ordering = (headers.get("x-healpix-ordering") ?? "").toUpperCase();
  if (ordering !== "RING" && ordering !== "NESTED") throw new Error(`Unknown pixel ordering "${ordering || "missing"}" (expected RING or NESTED).`);
  const coordsys = (headers.get("x-healpix-coordsys") ?? "").toUpperCase();
  if (coordsys !== "C") throw new Error(`The map is in frame "${coordsys || "missing"}"; the sky map needs ICRS (C).`);
  const npix = 12 * nside * nside;
  if (body.byteLength !== npix * 4) {
    throw new Error(`The map body has ${body.byteLength} bytes; Nside ${nside} needs ${npix * 4} (12 Nside\u00b2 Float32 values).`);
  }
  let values: Float32Array;
  if (LITTLE_ENDIAN) values = new Float32Array(body.slice(0));
  else {
    const view = new DataView(body);
    values = new Float32Array(npix);
    for (let i = 0; i < npix; i++) values[i] = view.getFloat32(4 * i, true);
  }
  return {
    nside,
    order: ordering === "RING" ? "ring" : "nested",
    values,
    layer: headers.get("x-siderea-layer") ?? "values",
    unit: headers.get("x-siderea-unit") ?? "",
    blinded: headers.get("x-siderea-blinded") === "true",
  };
}

async function fetchHealpixMap(url: string, signal: AbortSignal): Promise<FetchedHealpixMap> {
  const response = await fetch(url, { credentials: "same-origin", signal });
  if (!response.ok) {
    let message = `The map could not be loaded (HTTP ${response.status}).`;
    try {
      const body = (await response.json()) as { error?: { message?: string } };
      if (body.error?.message) message = body.error.message;
    } catch {
      // not JSON: keep the status message
    }
    throw new Error(message);
  }
  return parseHealpixMap(response.headers, await response.arrayBuffer());
}

/**
 * Fetches a binary HEALPix map (see parseHealpixMap) with react-query. Pass null to fetch
 * nothing. While a new URL loads, the previous map stays as `data` (isPlaceholderData true).
 */
export function useHealpixMap(url: string | null) {
  return useQuery({
    queryKey: ["healpix-map", url],
    queryFn: ({ signal }) => fetchHealpixMap(url!, signal),
    enabled: url !== null,
    placeholderData: keepPreviousData,
    staleTime: 60_000,
  });
}
