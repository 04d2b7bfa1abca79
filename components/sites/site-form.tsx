"use client";

import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import type { SiteView } from "@/lib/services/sites";
import { saveSiteAction, type SiteActionResult } from "./actions";
import { SiteGlobe } from "./site-globe";

type Field = { name: keyof Omit<SiteView, "id" | "updatedAt">; label: string; hint?: string; type?: string; step?: string };

const FIELDS: Field[] = [
  { name: "name", label: "Name" },
  { name: "latitudeDeg", label: "Latitude (°, north positive)", type: "number", step: "any" },
  { name: "longitudeDeg", label: "Longitude (°, east positive)", type: "number", step: "any" },
  { name: "heightM", label: "Height (m above sea level)", type: "number", step: "any" },
  { name: "zenithMaxDeg", label: "Default zenith cut (°)", type: "number", step: "any" },
  { name: "areaKm2", label: "Array area (km², optional, for absolute exposure)", type: "number", step: "any" },
];

export function SiteForm({ site }: { site?: SiteView }) {
  const [result, action, pending] = useActionState<SiteActionResult | null, FormData>(saveSiteAction, null);
  const [lat, setLat] = useState(site ? String(site.latitudeDeg) : "");
  const [lon, setLon] = useState(site ? String(site.longitudeDeg) : "");
  const error = (name: string) => (result && !result.ok ? result.fieldErrors?.[name] : undefined);
  const prefix = site ? `site-${site.id}` : "site-new";

  return (
    <form action={action} className="grid gap-4 md:grid-cols-[1fr_auto]" aria-label={site ? `Edit ${site.name}` : "New site"}>
      {site ? <input type="hidden" name="id" value={site.id} /> : null}
      <div className="grid gap-3 sm:grid-cols-2">
        {FIELDS.map((f) => {
          const id = `${prefix}-${f.name}`;
          const initial = site ? (site[f.name] ?? "") : f.name === "zenithMaxDeg" ? "60" : f.name === "heightM" ? "0" : "";
          const controlled = f.name === "latitudeDeg" ? { value: lat, onChange: (e: React.ChangeEvent<HTMLInputElement>) => setLat(e.target.value) }
            : f.name === "longitudeDeg" ? { value: lon, onChange: (e: React.ChangeEvent<HTMLInputElement>) => setLon(e.target.value) }
            : { defaultValue: String(initial) };
          return (
            <div key={f.name}>
              <label htmlFor={id} className="block text-sm font-medium">{f.label}</label>
              <input id={id} name={f.name} type={f.type ?? "text"} step={f.step} {...controlled}
                aria-invalid={error(f.name) ? true : undefined} aria-describedby={`${id}-error`}
                className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
              {error(f.name) ? <p id={`${id}-error`} className="mt-1 text-sm text-red-700">{error(f.name)}</p> : null}
            </div>
          );
        })}
        <div>
          <label htmlFor={`${prefix}-azimuthConvention`} className="block text-sm font-medium">Azimuth convention of the reconstruction</label>
          <select id={`${prefix}-azimuthConvention`} name="azimuthConvention" defaultValue={site?.azimuthConvention ?? "north-clockwise"}
            className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2">
            <option value="north-clockwise">North, clockwise (0° = N, 90° = E)</option>
            <option value="east-counterclockwise">East, counter-clockwise (0° = E, 90° = N)</option>
          </select>
        </div>
        <div className="sm:col-span-2">
          <label htmlFor={`${prefix}-notes`} className="block text-sm font-medium">Notes</label>
          <textarea id={`${prefix}-notes`} name="notes" rows={2} defaultValue={site?.notes ?? ""}
            className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
        </div>
        <div className="sm:col-span-2 flex items-center gap-4">
          <Button type="submit" disabled={pending}>{pending ? "Saving…" : site ? "Save changes" : "Create site"}</Button>
          {result ? <p role="status" className={result.ok ? "text-green-800" : "text-red-700"}>{result.message}</p> : null}
        </div>
      </div>
      <SiteGlobe latitudeDeg={Number(lat === "" ? NaN : lat)} longitudeDeg={Number(lon === "" ? NaN : lon)} />
    </form>
  );
}
