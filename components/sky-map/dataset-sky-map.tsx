"use client";

import { useState } from "react";
import { pixelSpacingDeg } from "@/lib/sky/healpix";
import { SkyMap } from "./sky-map";
import { DEFAULT_SKY_MAP_SETTINGS, SkyMapControls, type SkyMapSettings } from "./sky-map-controls";
import { useHealpixMap } from "./use-healpix-map";

const NSIDES = [32, 64, 128] as const;
type DatasetMapNside = (typeof NSIDES)[number];

/**
 * A dataset's event counts on the sky: fetches /api/datasets/:id/map (Float32 counts per RING
 * pixel, ICRS), lets the user pick Nside 32/64/128 and the view, and draws the counts with the
 * sequential scale, the galactic plane and the field-of-view edge (decBand, ICRS degrees).
 */
export function DatasetSkyMap({ datasetId, decBand, initialNside = 64, width, exportName }: {
  datasetId: number;
  decBand?: { minDeg: number; maxDeg: number };
  initialNside?: DatasetMapNside;
  width?: number;
  exportName?: string;
}) {
  const [nside, setNside] = useState<DatasetMapNside>(initialNside);
  const [settings, setSettings] = useState<SkyMapSettings>(DEFAULT_SKY_MAP_SETTINGS);
  const query = useHealpixMap(`/api/datasets/${datasetId}/map?nside=${nside}`);
  const map = query.data;

  return (
    <section aria-label="Event counts on the sky" className="space-y-3">
      <div className="flex flex-wrap items-end gap-x-5 gap-y-3">
        <SkyMapControls value={settings} onChange={setSettings} />
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-slate-700">Pixels (Nside)</span>
          <select className="rounded-md border border-slate-300 bg-white px-2 py-1 text-sm" value={nside}
            onChange={(e) => setNside(Number(e.target.value) as DatasetMapNside)}>
            {NSIDES.map((n) => <option key={n} value={n}>{n} ({pixelSpacingDeg(n).toFixed(2)}° pixels)</option>)}
          </select>
        </label>
        {query.isFetching ? <span className="pb-1 text-sm text-slate-500" role="status">Loading the map…</span> : null}
      </div>
      {query.isError ? (
        <p role="alert" className="rounded-md border border-red-200 bg-red-50 p-3 text-sm text-red-800">{query.error.message}</p>
      ) : null}
      {map ? (
        <>
          {map.blinded ? (
            <p className="text-sm text-amber-800">This dataset is blinded: the map shows the blinded sky, not the true arrival directions.</p>
          ) : null}
          <div className={query.isPlaceholderData ? "opacity-60 transition-opacity" : "transition-opacity"}>
            <SkyMap
              map={map}
              scale={{ kind: "sequential", label: map.layer === "counts" ? "Events per pixel" : map.layer, unit: map.unit }}
              frame={settings.frame}
              centreLonDeg={settings.centreLonDeg}
              lonIncreases={settings.lonIncreases}
              overlays={{ galacticPlane: settings.galacticPlane, supergalacticPlane: settings.supergalacticPlane, decBand }}
              width={width}
              exportName={exportName ?? `dataset-${datasetId}-counts-nside${map.nside}`}
            />
          </div>
        </>
      ) : query.isPending ? (
        <div className="flex aspect-[2/1] w-full max-w-[800px] items-center justify-center rounded-md bg-mist-100 text-sm text-slate-500">Loading the map…</div>
      ) : null}
    </section>
  );
}
