"use client";

import { useId } from "react";
import type { LonDirection, SkyFrame } from "@/lib/sky/sky-projection";

/** The view settings a page keeps in state and passes to both SkyMapControls and SkyMap. */
export interface SkyMapSettings {
  frame: SkyFrame;
  centreLonDeg: number;
  lonIncreases: LonDirection;
  galacticPlane: boolean;
  supergalacticPlane: boolean;
}

/** Defaults: equatorial, RA 180 deg at the centre, RA increasing to the left, galactic plane shown. */
export const DEFAULT_SKY_MAP_SETTINGS: SkyMapSettings = {
  frame: "equatorial",
  centreLonDeg: 180,
  lonIncreases: "left",
  galacticPlane: true,
  supergalacticPlane: false,
};

const selectClass = "rounded-md border border-slate-300 bg-white px-2 py-1 text-sm";

/** A small controlled form for the sky map's frame, centre, longitude direction and plane overlays. */
export function SkyMapControls({ value, onChange, className = "" }: { value: SkyMapSettings; onChange: (next: SkyMapSettings) => void; className?: string }) {
  const id = useId();
  const set = <K extends keyof SkyMapSettings>(key: K, v: SkyMapSettings[K]) => onChange({ ...value, [key]: v });
  const lonName = value.frame === "equatorial" ? "RA" : "l";
  const preset = value.centreLonDeg === 0 || value.centreLonDeg === 180 ? String(value.centreLonDeg) : "other";
  return (
    <fieldset className={`flex flex-wrap items-end gap-x-5 gap-y-3 text-sm ${className}`}>
      <legend className="sr-only">Sky map view</legend>
      <label className="flex flex-col gap-1">
        <span className="font-medium text-slate-700">Frame</span>
        <select className={selectClass} value={value.frame}
          onChange={(e) => onChange({ ...value, frame: e.target.value as SkyFrame, centreLonDeg: e.target.value === "galactic" ? 0 : 180 })}>
          <option value="equatorial">Equatorial (RA, Dec)</option>
          <option value="galactic">Galactic (l, b)</option>
        </select>
      </label>
      <div className="flex flex-col gap-1">
        <span id={`${id}-centre`} className="font-medium text-slate-700">Centre {lonName}</span>
        <div className="flex items-center gap-2" role="group" aria-labelledby={`${id}-centre`}>
          <select className={selectClass} aria-label={`Centre ${lonName} preset`} value={preset}
            onChange={(e) => { if (e.target.value !== "other") set("centreLonDeg", Number(e.target.value)); }}>
            <option value="0">0°</option>
            <option value="180">180°</option>
            <option value="other" disabled>other</option>
          </select>
          <input type="number" min={0} max={360} step={1} aria-label={`Centre ${lonName} in degrees`}
            className={`${selectClass} w-20 tabular-nums`} value={value.centreLonDeg}
            onChange={(e) => {
              const v = Number(e.target.value);
              if (e.target.value !== "" && Number.isFinite(v)) set("centreLonDeg", ((v % 360) + 360) % 360);
            }} />
        </div>
      </div>
      <label className="flex flex-col gap-1">
        <span className="font-medium text-slate-700">{lonName} increases</span>
        <select className={selectClass} value={value.lonIncreases} onChange={(e) => set("lonIncreases", e.target.value as LonDirection)}>
          <option value="left">to the left (sky view)</option>
          <option value="right">to the right</option>
        </select>
      </label>
      <div className="flex flex-col gap-1">
        <span className="font-medium text-slate-700">Overlays</span>
        <div className="flex items-center gap-3 py-1">
          <label className="inline-flex items-center gap-1.5">
            <input type="checkbox" checked={value.galacticPlane} onChange={(e) => set("galacticPlane", e.target.checked)} />
            Galactic plane
          </label>
          <label className="inline-flex items-center gap-1.5">
            <input type="checkbox" checked={value.supergalacticPlane} onChange={(e) => set("supergalacticPlane", e.target.checked)} />
            Supergalactic plane
          </label>
        </div>
      </div>
    </fieldset>
  );
}
