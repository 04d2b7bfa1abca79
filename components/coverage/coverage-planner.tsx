"use client";

import { useEffect, useId, useMemo, useRef, useState } from "react";
import { SkyMap } from "@/components/sky-map/sky-map";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";
import { configurationExposure, coverageCurve, coverageMap, coverageSummary, directionTable, skyFractionAbove, type CoverageSummary } from "@/lib/coverage/model";
import type { TabulatedExposure } from "@/lib/sky/efficiency-exposure";
import { CoverageConfigurationSchema, CoverageParametersSchema, DirectionSchema, type CoverageParameters, type DirectionInput } from "@/lib/validations/coverage";
import { ExposureCurveChart } from "./exposure-curve-chart";
import { SERIES_STYLES } from "./series-style";

/** A saved configuration as the page hands it over. */
export interface SavedConfiguration extends CoverageParameters {
  id: number;
  name: string;
  notes: string;
}

/** One configuration as typed: strings, so that nothing typed is lost while it is invalid. */
interface Draft {
  key: number;
  label: string;
  lat: string;
  zenith: string;
  area: string;
  liveTime: string;
  effKind: "full" | "table";
  energy: string;
  table: string;
}

interface DirectionDraft { key: number; name: string; ra: string; dec: string }

interface Computed {
  params: CoverageParameters;
  exposure: TabulatedExposure;
  summary: CoverageSummary;
  curve: { decDeg: Float64Array; exposure: Float64Array };
}

const DEFAULT_TABLE = "0, 1\n40, 1\n60, 0.7";
let nextKey = 1;
const draftFrom = (label: string, p: Partial<CoverageParameters> & { latitudeDeg: number; zenithMaxDeg: number }): Draft => ({
  key: nextKey++,
  label,
  lat: String(p.latitudeDeg),
  zenith: String(p.zenithMaxDeg),
  area: p.areaKm2 == null ? "" : String(p.areaKm2),
  liveTime: p.liveTimeYr == null ? "" : String(p.liveTimeYr),
  effKind: p.efficiency?.kind ?? "full",
  energy: p.efficiency?.kind === "full" && p.efficiency.aboveEnergyEeV != null ? String(p.efficiency.aboveEnergyEeV) : "",
  table: p.efficiency?.kind === "table" ? p.efficiency.zenithDeg.map((z, i) => `${z}, ${p.efficiency!.kind === "table" ? (p.efficiency as { efficiency: number[] }).efficiency[i] : ""}`).join("\n") : DEFAULT_TABLE,
});

/** Parses a draft with the shared schema: the parameters, or the messages per field. */
function parseDraft(d: Draft): { ok: true; params: CoverageParameters } | { ok: false; errors: Record<string, string> } {
  const rows = d.table.split(/\n/).map((l) => l.trim()).filter(Boolean).map((l) => l.split(/[\s,;]+/).map(Number));
  const efficiency = d.effKind === "full"
    ? { kind: "full" as const, aboveEnergyEeV: d.energy.trim() === "" ? null : Number(d.energy) }
    : { kind: "table" as const, zenithDeg: rows.map((r) => r[0] ?? NaN), efficiency: rows.map((r) => (r.length === 2 ? r[1]! : NaN)) };
  const parsed = CoverageParametersSchema.safeParse({ latitudeDeg: d.lat, zenithMaxDeg: d.zenith, areaKm2: d.area, liveTimeYr: d.liveTime, efficiency });
  if (parsed.success) return { ok: true, params: parsed.data };
  const errors: Record<string, string> = {};
  for (const i of parsed.error.issues) {
    const head = String(i.path[0]);
    const key = head === "efficiency" ? (d.effKind === "full" ? "energy" : "table") : head;
    errors[key] ??= key === "table" && i.path.length > 2 ? `Row ${Number(i.path[2]) + 1}: ${i.message}` : i.message;
  }
  return { ok: false, errors };
}

function compute(p: CoverageParameters): Computed {
  const exposure = configurationExposure(p);
  return { params: p, exposure, summary: coverageSummary(p, exposure), curve: coverageCurve(exposure, 0.5) };
}

const fmtDec = (d: number) => `${d > 0 ? "+" : d < 0 ? "−" : ""}${Math.abs(d).toFixed(1)}°`;
const pct = (f: number) => `${(f * 100).toFixed(1)}%`;
const cls = "mt-1 w-full rounded-md border border-slate-300 px-2 py-1 text-sm";
const errCls = "mt-1 text-sm text-red-700";

/**
 * The coverage planner: one to four configurations (latitude, zenith cut, optional area, live
 * time and zenith efficiency), recomputed in the browser as inputs move (lib/coverage/model.ts
 * over lib/sky): exposure curve, Mollweide maps in both frames, band, sky fractions, visibility of
 * directions, a difference map between two configurations; save and load named configurations.
 */
export function CoveragePlanner({ saved: initialSaved, canSave }: { saved: SavedConfiguration[]; canSave: boolean }) {
  const hydrated = useHydrated();
  const id = useId();
  const [drafts, setDrafts] = useState<Draft[]>(() => [draftFrom("Configuration A", { latitudeDeg: -31.4, zenithMaxDeg: 60 })]);
  const [active, setActive] = useState(0);
  const [dragging, setDragging] = useState(false);
  const [detail, setDetail] = useState(64);
  const [threshold, setThreshold] = useState("0.5");
  const [compareWith, setCompareWith] = useState(1);
  const [directions, setDirections] = useState<DirectionDraft[]>(() => [
    { key: nextKey++, name: "Galactic centre", ra: "266.405", dec: "-28.936" },
    { key: nextKey++, name: "North galactic pole", ra: "192.85948", dec: "27.12825" },
  ]);
  const [newDirection, setNewDirection] = useState({ name: "", ra: "", dec: "" });
  const [newDirectionErrors, setNewDirectionErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(initialSaved);
  const [saveName, setSaveName] = useState("");
  const [saveState, setSaveState] = useState<{ kind: "idle" | "saving" | "saved" | "error"; message?: string; errors?: Record<string, string> }>({ kind: "idle" });
  const lastGood = useRef(new Map<number, Computed>());
  const inputAt = useRef<number | null>(null);
  const [timing, setTiming] = useState<{ computeMs: number; frameMs: number | null } | null>(null);

  const nside = dragging ? 32 : detail;
  const parsed = useMemo(() => drafts.map(parseDraft), [drafts]);

  // Curves and summaries of every configuration; the map of the active one (and the difference).
  const result = useMemo(() => {
    const t0 = performance.now();
    const computed = drafts.map((d, i) => {
      const p = parsed[i]!;
      if (p.ok) {
        try {
          const c = compute(p.params);
          lastGood.current.set(d.key, c);
          return { c, stale: false };
        } catch { /* falls back to the last good result */ }
      }
      const prev = lastGood.current.get(d.key);
      return prev ? { c: prev, stale: true } : null;
    });
    const a = computed[active]?.c;
    const map = a ? coverageMap(a.exposure, nside, "equatorial").values : null;
    const other = computed[compareWith]?.c, first = computed[0]?.c;
    let diff: Float32Array | null = null;
    if (drafts.length >= 2 && other && first && compareWith !== 0) {
      const mb = coverageMap(other.exposure, nside, "equatorial").values;
      const ma = active === 0 && map ? map : coverageMap(first.exposure, nside, "equatorial").values;
      diff = new Float32Array(mb.length);
      for (let k = 0; k < mb.length; k++) diff[k] = mb[k]! - ma[k]!;
    }
    return { computed, map, diff, computeMs: performance.now() - t0 };
  }, [drafts, parsed, active, nside, compareWith]);

  useEffect(() => {
    const started = inputAt.current;
    inputAt.current = null;
    // The frame is drawn after this effect: measure to the next animation frame.
    const raf = requestAnimationFrame(() => setTiming({ computeMs: result.computeMs, frameMs: started === null ? null : performance.now() - started }));
    return () => cancelAnimationFrame(raf);
  }, [result]);

  const update = (i: number, patch: Partial<Draft>) => {
    inputAt.current = performance.now();
    setDrafts((ds) => ds.map((d, k) => (k === i ? { ...d, ...patch } : d)));
  };
  const d = drafts[active]!;
  const p = parsed[active]!;
  const errors = p.ok ? {} : p.errors;
  const current = result.computed[active];
  const t = Number(threshold);
  const thresholdValid = threshold.trim() !== "" && t > 0 && t <= 1;

  const directionRows = directions.map((r) => ({ r, parsed: DirectionSchema.safeParse({ name: r.name, raDeg: r.ra, decDeg: r.dec }) }));
  const validDirections = directionRows.flatMap((x) => (x.parsed.success ? [x.parsed.data] : [])) as DirectionInput[];

  function addDirection() {
    const parsedDirection = DirectionSchema.safeParse({ name: newDirection.name, raDeg: newDirection.ra, decDeg: newDirection.dec });
    if (!parsedDirection.success) {
      setNewDirectionErrors(Object.fromEntries(parsedDirection.error.issues.map((i) => [String(i.path[0]), i.message])));
      return;
    }
    setNewDirectionErrors({});
    setDirections((ds) => [...ds, { key: nextKey++, ...newDirection }]);
    setNewDirection({ name: "", ra: "", dec: "" });
  }

  function addConfiguration() {
    if (drafts.length >= 4) return;
    const letter = "ABCD"[drafts.length]!;
    const copy = { ...d, key: nextKey++, label: `Configuration ${letter}` };
    setDrafts((ds) => [...ds, copy]);
    setActive(drafts.length);
    setCompareWith(drafts.length);
  }

  function removeConfiguration(i: number) {
    if (drafts.length <= 1) return;
    setDrafts((ds) => ds.filter((_, k) => k !== i));
    setActive((a) => (a >= i && a > 0 ? a - 1 : a));
    setCompareWith((c) => Math.max(1, Math.min(c >= i ? c - 1 : c, drafts.length - 2)));
  }

  function loadSaved(idText: string) {
    const s = saved.find((x) => String(x.id) === idText);
    if (!s) return;
    inputAt.current = performance.now();
    setDrafts((ds) => ds.map((x, k) => (k === active ? { ...draftFrom(s.name, s), key: x.key } : x)));
  }

  async function save() {
    if (!p.ok) { setSaveState({ kind: "error", message: "Correct the configuration first." }); return; }
    const body = CoverageConfigurationSchema.safeParse({ ...p.params, name: saveName, notes: "" });
    if (!body.success) {
      setSaveState({ kind: "error", message: "Check the name.", errors: Object.fromEntries(body.error.issues.map((i) => [String(i.path[0]), i.message])) });
      return;
    }
    setSaveState({ kind: "saving" });
    const response = await fetch("/api/coverage/configurations", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body.data) });
    const json = await response.json().catch(() => ({}));
    if (response.status === 201) {
      setSaved((list) => [...list, json.configuration].sort((x, y) => x.name.localeCompare(y.name)));
      setSaveState({ kind: "saved", message: `Saved as “${json.configuration.name}”.` });
      update(active, { label: json.configuration.name });
      return;
    }
    setSaveState({ kind: "error", message: json.error?.message ?? "The configuration could not be saved.", errors: Object.fromEntries((json.error?.issues ?? []).map((i: { path: string; message: string }) => [i.path, i.message])) });
  }

  const sliderValue = Number(d.zenith);
  const latSliderValue = Number(d.lat);
  const dragProps = {
    onPointerDown: () => setDragging(true),
    onPointerUp: () => setDragging(false),
    onKeyUp: () => setDragging(false),
    onBlur: () => setDragging(false),
  };

  return (
    <div className="space-y-6" data-hydrated={hydrated ? "true" : "false"} data-testid="coverage-planner">
      <section aria-label="Configurations" className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
        <div className="mb-3 flex flex-wrap items-center gap-2" role="tablist" aria-label="Configuration to edit">
          {drafts.map((x, i) => (
            <span key={x.key} className="inline-flex items-center">
              <button type="button" role="tab" aria-selected={i === active} onClick={() => setActive(i)}
                className={`flex items-center gap-2 rounded-l-md border px-3 py-1.5 text-sm ${i === active ? "border-night-800 bg-night-800 text-white" : "border-slate-300 bg-white text-slate-800"}`}>
                <svg width="22" height="8" aria-hidden="true"><line x1="0" x2="22" y1="4" y2="4" stroke={SERIES_STYLES[i]!.colour} strokeWidth="3" strokeDasharray={SERIES_STYLES[i]!.dash} /></svg>
                {x.label || `Configuration ${"ABCD"[i]}`}
              </button>
              <button type="button" aria-label={`Remove ${x.label}`} disabled={drafts.length <= 1} onClick={() => removeConfiguration(i)}
                className="rounded-r-md border border-l-0 border-slate-300 bg-white px-2 py-1.5 text-sm text-slate-600 disabled:text-slate-300">×</button>
            </span>
          ))}
          <Button type="button" variant="secondary" onClick={addConfiguration} disabled={drafts.length >= 4}>Add a configuration to compare</Button>
          {saved.length > 0 ? (
            <label className="ml-auto flex items-center gap-2 text-sm">
              <span>Load saved</span>
              <select className="rounded-md border border-slate-300 px-2 py-1 text-sm" value="" onChange={(e) => loadSaved(e.target.value)}>
                <option value="">choose…</option>
                {saved.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
              </select>
            </label>
          ) : null}
        </div>

        <form className="grid gap-4 md:grid-cols-3" aria-label={`Parameters of ${d.label}`} noValidate onSubmit={(e) => e.preventDefault()}>
          <div>
            <label htmlFor={`${id}-label`} className="block text-sm font-medium">Name on the plot</label>
            <input id={`${id}-label`} className={cls} value={d.label} onChange={(e) => update(active, { label: e.target.value })} />
          </div>
          <div>
            <label htmlFor={`${id}-lat`} className="block text-sm font-medium">Site latitude (°, north +)</label>
            <div className="flex items-center gap-2">
              <input type="range" aria-label="Site latitude slider (°)" min={-90} max={90} step={0.1} value={Number.isFinite(latSliderValue) ? latSliderValue : 0}
                onChange={(e) => update(active, { lat: e.target.value })} className="mt-1 flex-1" {...dragProps} />
              <input id={`${id}-lat`} type="number" step="any" min={-90} max={90} className={`${cls} w-24`} value={d.lat}
                aria-invalid={errors.latitudeDeg ? true : undefined} aria-describedby={errors.latitudeDeg ? `${id}-lat-err` : undefined}
                onChange={(e) => update(active, { lat: e.target.value })} />
            </div>
            {errors.latitudeDeg ? <p id={`${id}-lat-err`} className={errCls}>{errors.latitudeDeg}</p> : null}
          </div>
          <div>
            <label htmlFor={`${id}-zenith`} className="block text-sm font-medium">Zenith cut (°)</label>
            <div className="flex items-center gap-2">
              <input type="range" aria-label="Zenith cut slider (°)" min={1} max={90} step={0.5} value={Number.isFinite(sliderValue) ? sliderValue : 60}
                onChange={(e) => update(active, { zenith: e.target.value })} className="mt-1 flex-1" {...dragProps} />
              <input id={`${id}-zenith`} type="number" step="any" min={0} max={90} className={`${cls} w-24`} value={d.zenith}
                aria-invalid={errors.zenithMaxDeg ? true : undefined} aria-describedby={errors.zenithMaxDeg ? `${id}-zenith-err` : undefined}
                onChange={(e) => update(active, { zenith: e.target.value })} />
            </div>
            {errors.zenithMaxDeg ? <p id={`${id}-zenith-err`} className={errCls} role="alert">{errors.zenithMaxDeg}</p> : null}
          </div>
          <div>
            <label htmlFor={`${id}-area`} className="block text-sm font-medium">Array area (km², optional)</label>
            <input id={`${id}-area`} type="number" step="any" min={0} className={cls} value={d.area} onChange={(e) => update(active, { area: e.target.value })} />
            {errors.areaKm2 ? <p className={errCls}>{errors.areaKm2}</p> : null}
          </div>
          <div>
            <label htmlFor={`${id}-live`} className="block text-sm font-medium">Live time (years, optional)</label>
            <input id={`${id}-live`} type="number" step="any" min={0} className={cls} value={d.liveTime} onChange={(e) => update(active, { liveTime: e.target.value })} />
            {errors.liveTimeYr ? <p className={errCls}>{errors.liveTimeYr}</p> : null}
            <p className="mt-0.5 text-xs text-slate-500">With both: absolute exposure in km² sr yr.</p>
          </div>
          <fieldset>
            <legend className="text-sm font-medium">Detection efficiency</legend>
            <label className="mt-1 flex items-center gap-2 text-sm"><input type="radio" name={`${id}-eff`} checked={d.effKind === "full"} onChange={() => update(active, { effKind: "full" })} /> Full up to the cut</label>
            <label className="flex items-center gap-2 text-sm"><input type="radio" name={`${id}-eff`} checked={d.effKind === "table"} onChange={() => update(active, { effKind: "table" })} /> Table against zenith</label>
            {d.effKind === "full" ? (
              <div className="mt-1">
                <label htmlFor={`${id}-energy`} className="block text-xs text-slate-600">Fully efficient above (EeV, optional)</label>
                <input id={`${id}-energy`} type="number" step="any" min={0} className={cls} value={d.energy} onChange={(e) => update(active, { energy: e.target.value })} />
                {errors.energy ? <p className={errCls}>{errors.energy}</p> : null}
              </div>
            ) : (
              <div className="mt-1">
                <label htmlFor={`${id}-table`} className="block text-xs text-slate-600">One row per line: zenith (°), efficiency (0–1); linear between rows</label>
                <textarea id={`${id}-table`} rows={4} className={`${cls} font-mono`} value={d.table} onChange={(e) => update(active, { table: e.target.value })}
                  aria-invalid={errors.table ? true : undefined} />
                {errors.table ? <p className={errCls} role="alert">{errors.table}</p> : null}
              </div>
            )}
          </fieldset>
        </form>
        {!p.ok && current ? <p className="mt-3 text-sm text-amber-800" role="status">Showing the last valid values of {d.label} until the highlighted field is corrected.</p> : null}
        {canSave ? (
          <div className="mt-4 flex flex-wrap items-end gap-3 border-t border-slate-100 pt-4">
            <div>
              <label htmlFor={`${id}-save-name`} className="block text-sm font-medium">Save as</label>
              <input id={`${id}-save-name`} className={cls} value={saveName} onChange={(e) => setSaveName(e.target.value)} placeholder="e.g. Quebrada Alta, 60° cut" />
              {saveState.errors?.name ? <p className={errCls}>{saveState.errors.name}</p> : null}
            </div>
            <Button type="button" onClick={() => void save()} disabled={saveState.kind === "saving"}>{saveState.kind === "saving" ? "Saving…" : "Save configuration"}</Button>
            {saveState.message ? <p role={saveState.kind === "error" ? "alert" : "status"} className={`text-sm ${saveState.kind === "error" ? "text-red-700" : "text-emerald-800"}`}>{saveState.message}</p> : null}
            <p className="w-full text-xs text-slate-500">A saved configuration can be chosen as the exposure of an analysis; the analysis keeps a copy of its parameters.</p>
          </div>
        ) : (
          <p className="mt-4 text-xs text-slate-500">Analysts and administrators can save configurations; you can load the saved ones.</p>
        )}
      </section>

      {current ? (
        <section aria-label="Coverage of the configuration" className="grid gap-4 md:grid-cols-3">
          <div className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm md:col-span-1">
            <h2 className="mb-2 text-base font-semibold">{d.label}</h2>
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
              <dt className="text-slate-500">Declination band</dt>
              <dd data-testid="band" className="tabular-nums"><span data-testid="band-min">{fmtDec(current.c.summary.band.decMinDeg)}</span> to <span data-testid="band-max">{fmtDec(current.c.summary.band.decMaxDeg)}</span></dd>
              <dt className="text-slate-500">Sky seen</dt>
              <dd data-testid="sky-fraction" className="tabular-nums">{pct(current.c.summary.skyFraction)} of the sky</dd>
              <dt className="text-slate-500">Peak exposure at</dt>
              <dd className="tabular-nums">dec {fmtDec(current.c.summary.peakDecDeg)}</dd>
              {current.c.summary.absolute ? (
                <>
                  <dt className="text-slate-500">Total exposure</dt>
                  <dd data-testid="total-exposure" className="tabular-nums">{current.c.summary.absolute.totalKm2SrYr.toLocaleString("en", { maximumFractionDigits: 0 })} km² sr yr</dd>
                  <dt className="text-slate-500">Peak</dt>
                  <dd className="tabular-nums">{current.c.summary.absolute.peakKm2Yr.toLocaleString("en", { maximumFractionDigits: 0 })} km² yr per sr</dd>
                </>
              ) : null}
            </dl>
            <div className="mt-3">
              <label htmlFor={`${id}-threshold`} className="block text-sm font-medium">Sky with relative exposure at least</label>
              <input id={`${id}-threshold`} type="number" step="0.05" min={0} max={1} className={`${cls} w-28`} value={threshold} onChange={(e) => setThreshold(e.target.value)}
                aria-invalid={!thresholdValid || undefined} />
              {thresholdValid
                ? <p data-testid="fraction-above" className="mt-1 text-sm tabular-nums">{pct(skyFractionAbove(current.c.exposure, t))} of the sky</p>
                : <p className={errCls}>Give a relative exposure above 0 and at most 1.</p>}
            </div>
            <p className="mt-3 text-xs text-slate-500">
              The band is where |dec − latitude| &lt; zenith cut (Sommers 2001); the exposure assumes uniform coverage in sidereal time.
            </p>
            <p className="mt-1 text-xs text-slate-500" data-testid="timing" role="status" aria-live="off">
              {timing ? `Recomputed in ${timing.computeMs.toFixed(1)} ms${timing.frameMs !== null ? `, on screen ${timing.frameMs.toFixed(0)} ms after the input` : ""} (map Nside ${nside}).` : " "}
            </p>
          </div>
          <div className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm md:col-span-2">
            <ExposureCurveChart
              series={result.computed.flatMap((x, i) => (x ? [{ label: drafts[i]!.label + (x.stale ? " (last valid)" : ""), decDeg: x.c.curve.decDeg, value: x.c.curve.exposure }] : []))}
              band={current.c.summary.band} bandLabel={d.label} />
            <p className="text-xs text-slate-500">Shaded: the covered band of {d.label} (the configuration being edited). Each curve is relative to its own maximum.</p>
          </div>
        </section>
      ) : (
        <p role="alert" className="text-red-700">Correct the configuration to see its coverage.</p>
      )}

      {current && result.map ? (
        <section aria-label="Exposure maps" className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
          <div className="mb-2 flex flex-wrap items-end gap-4">
            <h2 className="text-base font-semibold">Exposure of {d.label} on the sky</h2>
            <label className="flex items-center gap-2 text-sm">
              <span>Map detail</span>
              <select className="rounded-md border border-slate-300 px-2 py-1 text-sm" value={detail} onChange={(e) => { inputAt.current = performance.now(); setDetail(Number(e.target.value)); }}>
                <option value={32}>Nside 32 (fast)</option>
                <option value={64}>Nside 64</option>
                <option value={128}>Nside 128 (fine)</option>
              </select>
            </label>
            <span className="text-xs text-slate-500">Nside 32 while a slider is being dragged.</span>
          </div>
          <div className="grid gap-4 lg:grid-cols-2">
            <div data-testid="map-equatorial">
              <h3 className="text-sm font-medium">Equatorial (RA, Dec)</h3>
              <SkyMap map={{ nside, order: "ring", values: result.map }} scale={{ kind: "sequential", label: "relative exposure", unit: "", domain: [0, 1] }}
                frame="equatorial" centreLonDeg={180} overlays={{ galacticPlane: true, decBand: { minDeg: current.c.summary.band.decMinDeg, maxDeg: current.c.summary.band.decMaxDeg } }}
                exportName={`coverage-equatorial-lat${current.c.params.latitudeDeg}-zmax${current.c.params.zenithMaxDeg}`} />
            </div>
            <div data-testid="map-galactic">
              <h3 className="text-sm font-medium">Galactic (l, b)</h3>
              <SkyMap map={{ nside, order: "ring", values: result.map }} scale={{ kind: "sequential", label: "relative exposure", unit: "", domain: [0, 1] }}
                frame="galactic" centreLonDeg={0} overlays={{ galacticPlane: false, decBand: { minDeg: current.c.summary.band.decMinDeg, maxDeg: current.c.summary.band.decMaxDeg } }}
                exportName={`coverage-galactic-lat${current.c.params.latitudeDeg}-zmax${current.c.params.zenithMaxDeg}`} />
            </div>
          </div>
        </section>
      ) : null}

      {drafts.length >= 2 ? (
        <section aria-label="Difference map" className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
          <div className="mb-2 flex flex-wrap items-end gap-4">
            <h2 className="text-base font-semibold">Difference of relative exposures</h2>
            <label className="flex items-center gap-2 text-sm">
              <span>{drafts[0]!.label} subtracted from</span>
              <select className="rounded-md border border-slate-300 px-2 py-1 text-sm" value={compareWith} onChange={(e) => setCompareWith(Number(e.target.value))}>
                {drafts.map((x, i) => (i === 0 ? null : <option key={x.key} value={i}>{x.label}</option>))}
              </select>
            </label>
          </div>
          {result.diff ? (
            <div data-testid="map-difference" className="max-w-3xl">
              <SkyMap map={{ nside, order: "ring", values: result.diff }} scale={{ kind: "diverging", label: `${drafts[compareWith]?.label ?? ""} − ${drafts[0]!.label}`, unit: "relative exposure" }}
                frame="equatorial" centreLonDeg={180} overlays={{ galacticPlane: true }} exportName="coverage-difference" />
              <p className="text-xs text-slate-500">Positive (warm): the second configuration sees that part of the sky relatively more.</p>
            </div>
          ) : <p className="text-sm text-slate-600">Correct the configurations to see their difference.</p>}
        </section>
      ) : null}

      <section aria-label="Visibility of directions" className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
        <h2 className="mb-2 text-base font-semibold">Visibility of directions</h2>
        <div className="overflow-x-auto">
          <table className="w-full text-sm [&_td]:pr-4 [&_th]:pr-4 [&_th]:align-bottom" data-testid="directions-table">
            <thead className="text-left text-slate-500">
              <tr>
                <th scope="col">Name</th><th scope="col">RA (°)</th><th scope="col">Dec (°)</th>
                {drafts.map((x, i) => <th key={x.key} scope="col" style={{ color: SERIES_STYLES[i]!.colour }}>{x.label}: relative exposure</th>)}
                <th scope="col">{d.label}: hours a day inside the cut</th>
                <th scope="col">smallest zenith (°)</th>
                {current?.c.summary.absolute ? <th scope="col">km² yr per sr</th> : null}
                <th scope="col"><span className="sr-only">Remove</span></th>
              </tr>
            </thead>
            <tbody>
              {directionRows.map(({ r, parsed: pd }) => {
                const rows = pd.success ? result.computed.map((x) => (x ? directionTable(x.c.params, x.c.exposure, [pd.data])[0]! : null)) : null;
                const mine = rows?.[active] ?? null;
                return (
                  <tr key={r.key} className="border-t border-slate-100">
                    <td className="py-1">{r.name}</td>
                    <td className="py-1 tabular-nums">{r.ra}</td>
                    <td className="py-1 tabular-nums">{r.dec}</td>
                    {rows ? rows.map((x, i) => <td key={i} className="py-1 tabular-nums">{x ? x.relativeExposure.toFixed(3) : "—"}</td>) : <td colSpan={drafts.length} className="py-1 text-red-700">{pd.success ? "" : pd.error.issues[0]?.message}</td>}
                    <td className="py-1 tabular-nums">{mine ? mine.hoursPerDay.toFixed(2) : "—"}</td>
                    <td className="py-1 tabular-nums">{mine ? mine.minZenithDeg.toFixed(1) : "—"}</td>
                    {current?.c.summary.absolute ? <td className="py-1 tabular-nums">{mine?.exposureKm2Yr != null ? mine.exposureKm2Yr.toFixed(0) : "—"}</td> : null}
                    <td className="py-1"><button type="button" className="text-slate-500 underline" aria-label={`Remove ${r.name}`} onClick={() => setDirections((ds) => ds.filter((x) => x.key !== r.key))}>remove</button></td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <form className="mt-3 flex flex-wrap items-start gap-3" aria-label="Add a direction" noValidate onSubmit={(e) => { e.preventDefault(); addDirection(); }}>
          <div>
            <label htmlFor={`${id}-dir-name`} className="block text-sm font-medium">Direction name</label>
            <input id={`${id}-dir-name`} className={cls} value={newDirection.name} onChange={(e) => setNewDirection({ ...newDirection, name: e.target.value })} />
            {newDirectionErrors.name ? <p className={errCls}>{newDirectionErrors.name}</p> : null}
          </div>
          <div>
            <label htmlFor={`${id}-dir-ra`} className="block text-sm font-medium">RA (°, ICRS)</label>
            <input id={`${id}-dir-ra`} className={`${cls} w-28`} inputMode="decimal" value={newDirection.ra} onChange={(e) => setNewDirection({ ...newDirection, ra: e.target.value })} />
            {newDirectionErrors.raDeg ? <p className={errCls}>{newDirectionErrors.raDeg}</p> : null}
          </div>
          <div>
            <label htmlFor={`${id}-dir-dec`} className="block text-sm font-medium">Dec (°, ICRS)</label>
            <input id={`${id}-dir-dec`} className={`${cls} w-28`} inputMode="decimal" value={newDirection.dec} onChange={(e) => setNewDirection({ ...newDirection, dec: e.target.value })} />
            {newDirectionErrors.decDeg ? <p className={errCls}>{newDirectionErrors.decDeg}</p> : null}
          </div>
          <Button type="submit" variant="secondary" className="mt-6">Add direction</Button>
        </form>
        <p className="mt-2 text-xs text-slate-500">
          Relative exposure: the configuration&apos;s exposure at the direction&apos;s declination (maximum 1). Hours a day: time per sidereal day spent inside the zenith cut.
          {validDirections.length === 0 ? " Add a direction to see it." : ""}
        </p>
      </section>
    </div>
  );
}
