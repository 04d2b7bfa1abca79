"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { Caution } from "@/components/ui/caution";
import { SkyMap, type SkyPixelInfo } from "@/components/sky-map/sky-map";
import { DEFAULT_SKY_MAP_SETTINGS, SkyMapControls, type SkyMapSettings } from "@/components/sky-map/sky-map-controls";
import { useHealpixMap } from "@/components/sky-map/use-healpix-map";
import type { AnalysisDetail } from "@/lib/services/analysis-detail";
import { coveredDeclinationBand } from "@/lib/sky/exposure";

/**
 * Edge of the field of view for the analysis's exposure (METHODS section 8 geometry): the
 * latitude and cut of its coverage configuration when it has one, else the site's latitude and
 * the settings' cut.
 */
function fieldOfView(a: AnalysisDetail): { minDeg: number; maxDeg: number } | undefined {
  const settings = a.settings as { zenithMaxDeg?: number; coverage?: { latitudeDeg: number; zenithMaxDeg: number } };
  const latitudeDeg = settings.coverage?.latitudeDeg ?? a.site?.latitudeDeg;
  const zenithMaxDeg = settings.coverage?.zenithMaxDeg ?? settings.zenithMaxDeg;
  if (latitudeDeg === undefined || !zenithMaxDeg) return undefined;
  const band = coveredDeclinationBand(latitudeDeg, zenithMaxDeg);
  return { minDeg: band.decMinDeg, maxDeg: band.decMaxDeg };
}

type Window = { pixel: number; raDeg: number; decDeg: number; lDeg: number; bDeg: number; nOn: number; nExpected: number; excess: number; localSignificance: number; postTrial: { p: number; pUpperBound: number | null; sigma: number | null; sigmaLowerBound: number | null; nReached: number } };
type PostTrial = { nSkies: number; nReached: number; p: number; pUpperBound: number | null; sigma: number | null; sigmaLowerBound: number | null };

const LAYERS = [
  { key: "significance", label: "Significance (local)", kind: "diverging" },
  { key: "excess", label: "Excess", kind: "diverging" },
  { key: "counts", label: "Counts", kind: "sequential" },
  { key: "expected", label: "Expectation", kind: "sequential" },
  { key: "exposure", label: "Exposure", kind: "sequential" },
] as const;

function postTrialText(pt: PostTrial | Window["postTrial"], nSkies: number): string {
  if (pt.pUpperBound !== null) return `p < ${pt.pUpperBound} (no sky of ${nSkies} reached it; > ${pt.sigmaLowerBound}σ)`;
  return `p = ${pt.p} (${pt.nReached} of ${nSkies} skies; ${pt.sigma}σ)`;
}

async function post(url: string, body?: unknown): Promise<string | null> {
  const r = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: body ? JSON.stringify(body) : undefined });
  if (r.ok) return null;
  return (await r.json().catch(() => ({}))).error?.message ?? `HTTP ${r.status}`;
}

export function AnalysisView({ initial, canRun, canReproduce, canPublish }: { initial: AnalysisDetail; canRun: boolean; canReproduce: boolean; canPublish: boolean }) {
  const client = useQueryClient();
  const query = useQuery({
    queryKey: ["analysis", initial.id],
    initialData: initial,
    queryFn: async (): Promise<AnalysisDetail> => (await (await fetch(`/api/analyses/${initial.id}`, { cache: "no-store" })).json()).analysis,
    refetchInterval: (q) => {
      const a = q.state.data;
      if (!a) return false;
      const busy = a.status === "queued" || a.status === "running" || a.reproductions.some((r) => r.status === "queued" || r.status === "running");
      return busy ? 1000 : false;
    },
  });
  const a = query.data;
  const [message, setMessage] = useState<string | null>(null);
  const act = async (url: string, body?: unknown) => {
    setMessage(await post(url, body));
    await client.invalidateQueries({ queryKey: ["analysis", initial.id] });
  };
  const summary = a.summary as Record<string, any> | null;
  const nSkies = (a.settings as { nSkies?: number }).nSkies ?? 0;

  return (
    <div className="space-y-6">
      {a.status === "queued" || a.status === "running" ? (
        <section aria-label="Progress" className="rounded-lg border border-slate-200 bg-white p-5">
          <p className="text-sm font-medium">{a.status === "queued" ? "Waiting for a worker…" : `Running: ${Math.round(a.progress * 100)}%`}</p>
          <progress className="mt-2 h-2 w-full" value={a.progress} max={1} aria-label="Analysis progress" />
          {canRun ? <Button variant="secondary" className="mt-3" onClick={() => void act(`/api/analyses/${a.id}/cancel`)}>Cancel</Button> : null}
        </section>
      ) : null}
      {a.status === "failed" ? <p role="alert" className="rounded-md bg-red-50 p-4 text-red-900">The analysis failed: {a.error}</p> : null}
      {a.status === "cancelled" ? <p className="rounded-md bg-slate-100 p-4">This analysis was cancelled.</p> : null}
      {message ? <p role="alert" className="text-sm text-red-700">{message}</p> : null}

      {a.status === "done" && summary ? (
        <>
          {summary.blinded ? <p className="rounded-md bg-slate-800 px-4 py-2 text-sm text-white">Run on the blinded sky: right ascensions are shifted by the dataset's secret offset.</p> : null}
          {summary.kind === "hotspot" ? <HotspotResult a={a} summary={summary} nSkies={nSkies} /> : <LargeScaleResult a={a} summary={summary} />}
          <Caution />
        </>
      ) : null}

      <section aria-label="Reproduction" className="rounded-lg border border-slate-200 bg-white p-5">
        <h2 className="text-base font-semibold">Reproduction</h2>
        <p className="mt-1 text-sm text-slate-600">Rerun from the stored dataset version (its hash is checked) with the saved settings and seed, and compare with the saved figures: numbers must agree to 1e-9 relative, everything else exactly.</p>
        <div className="mt-3 flex flex-wrap gap-3">
          {canReproduce && a.status === "done" ? <Button onClick={() => void act(`/api/analyses/${a.id}/reproductions`)}>Reproduce</Button> : null}
          {a.status === "done" ? <a className="rounded-md border border-slate-300 px-4 py-2 text-sm" href={`/api/analyses/${a.id}/bundle`}>Download the reproduction bundle</a> : null}
        </div>
        {a.reproductions.length ? (
          <table className="mt-3 w-full text-sm">
            <thead className="text-left text-slate-500"><tr><th scope="col">Run</th><th scope="col">By</th><th scope="col">Status</th><th scope="col">Result</th></tr></thead>
            <tbody>
              {a.reproductions.map((r) => (
                <tr key={r.id} className="border-t border-slate-100" data-testid={`reproduction-${r.id}`}>
                  <td className="py-1">{r.createdAt.slice(0, 16).replace("T", " ")}</td>
                  <td className="py-1">{r.requestedBy}</td>
                  <td className="py-1">{r.status}</td>
                  <td className="py-1">
                    {r.comparison ? (
                      r.comparison.match ? <span className="font-semibold text-green-800" data-testid="reproduction-match">Match: every saved figure came back</span> : (
                        <span className="text-red-800" data-testid="reproduction-mismatch">Mismatch in {r.comparison.differences.length} figures: {(r.comparison.differences as { path: string; saved: unknown; rerun: unknown }[]).slice(0, 3).map((d) => `${d.path} saved ${String(d.saved)}, now ${String(d.rerun)}`).join("; ")}</span>
                      )
                    ) : r.error ?? "…"}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}
      </section>

      {canPublish ? <SharePublish a={a} act={act} /> : null}

      <section aria-label="Settings and provenance" className="rounded-lg border border-slate-200 bg-white p-5 text-sm">
        <h2 className="text-base font-semibold">Settings and provenance</h2>
        <dl className="mt-2 grid grid-cols-[12rem_1fr] gap-y-1">
          <dt className="text-slate-500">Dataset</dt><dd>{a.dataset.name} v{a.dataset.version} · SHA-256 <code className="break-all text-xs">{a.dataset.contentHash}</code></dd>
          <dt className="text-slate-500">Settings SHA-256</dt><dd><code className="break-all text-xs">{a.settingsHash}</code></dd>
          <dt className="text-slate-500">Code version</dt><dd>{a.codeVersion}</dd>
          <dt className="text-slate-500">Seed</dt><dd>{a.seed}</dd>
          <dt className="text-slate-500">Settings</dt><dd><code className="text-xs">{JSON.stringify(a.settings)}</code></dd>
          <dt className="text-slate-500">Published</dt><dd>{a.publishedAt ? `${a.publishedAt.slice(0, 10)} (settings frozen)` : "no"}</dd>
        </dl>
        <h3 className="mt-4 font-semibold">Audit trail</h3>
        <ul className="mt-1 space-y-0.5">
          {a.audit.map((e, i) => <li key={i}><time className="text-slate-500">{e.at.slice(0, 19).replace("T", " ")} UTC</time> {e.actor}: {e.action}</li>)}
        </ul>
      </section>
    </div>
  );
}

function SharePublish({ a, act }: { a: AnalysisDetail; act: (url: string, body?: unknown) => Promise<void> }) {
  const [email, setEmail] = useState("");
  return (
    <section aria-label="Sharing and publishing" className="rounded-lg border border-slate-200 bg-white p-5">
      <h2 className="text-base font-semibold">Sharing and publishing</h2>
      <form className="mt-2 flex flex-wrap items-end gap-3" onSubmit={(e) => { e.preventDefault(); void act(`/api/analyses/${a.id}/share`, { email }); setEmail(""); }}>
        <div>
          <label htmlFor="share-email" className="block text-sm font-medium">Share with a referee (read and reproduce only)</label>
          <input id="share-email" type="email" value={email} onChange={(e) => setEmail(e.target.value)} placeholder="referee e-mail" className="mt-1 rounded-md border border-slate-300 px-3 py-1.5" />
        </div>
        <Button type="submit" variant="secondary" disabled={!email}>Share</Button>
        {!a.publishedAt && a.status === "done" ? <Button type="button" onClick={() => void act(`/api/analyses/${a.id}/publish`)}>Publish to members</Button> : null}
      </form>
    </section>
  );
}

function HotspotResult({ a, summary, nSkies }: { a: AnalysisDetail; summary: Record<string, any>; nSkies: number }) {
  const best = summary.best as Window & { radiusDeg: number; thresholdEeV: number | null; postTrial: PostTrial };
  const [layer, setLayer] = useState<(typeof LAYERS)[number]["key"]>("significance");
  const [view, setView] = useState<SkyMapSettings>(DEFAULT_SKY_MAP_SETTINGS);
  const [hover, setHover] = useState<SkyPixelInfo | null>(null);
  const [pinned, setPinned] = useState<SkyPixelInfo | null>(null);
  const [sortKey, setSortKey] = useState<"localSignificance" | "nOn" | "excess" | "raDeg" | "decDeg">("localSignificance");
  const map = useHealpixMap(`/api/analyses/${a.id}/maps/${layer}`);
  const counts = useHealpixMap(`/api/analyses/${a.id}/maps/counts`);
  const expected = useHealpixMap(`/api/analyses/${a.id}/maps/expected`);
  const significance = useHealpixMap(`/api/analyses/${a.id}/maps/significance`);
  const layerInfo = LAYERS.find((l) => l.key === layer)!;
  const windows = useMemo(() => [...(summary.windows as Window[])].sort((x, y) => (y[sortKey] as number) - (x[sortKey] as number)), [summary.windows, sortKey]);
  const readout = pinned ?? hover;
  const read = (m: typeof counts.data, p: number) => (m ? m.values[p] : undefined);

  return (
    <>
      <section aria-label="Headline" className="grid gap-4 md:grid-cols-2">
        <div className="rounded-lg border border-slate-200 bg-white p-5" data-testid="local-significance">
          <p className="text-xs font-semibold uppercase tracking-wide text-slate-500">Local (pre-trial) significance of the best window</p>
          <p className="mt-1 text-3xl font-semibold">{best.localSignificance.toFixed(2)}σ</p>
          <p className="text-sm text-slate-600">Li & Ma 1983 eq. 17 · N_on {best.nOn}, N_exp {Number(best.nExpected).toFixed(1)} · radius {best.radiusDeg}°{best.thresholdEeV !== null ? ` · E ≥ ${best.thresholdEeV} EeV` : ""}</p>
          <p className="text-sm text-slate-600">RA {best.raDeg?.toFixed(2)}°, Dec {best.decDeg?.toFixed(2)}° · l {best.lDeg?.toFixed(2)}°, b {best.bDeg?.toFixed(2)}°</p>
        </div>
        <div className="rounded-lg border border-slate-200 bg-white p-5" data-testid="post-trial">
          <p className="text-xs font-semibold uppercase tracking-wide text-slate-500">Post-trial chance probability</p>
          <p className="mt-1 text-3xl font-semibold">{best.postTrial.pUpperBound !== null ? `< ${best.postTrial.pUpperBound}` : best.postTrial.p}</p>
          <p className="text-sm text-slate-600">{postTrialText(best.postTrial, nSkies)}</p>
          <p className="text-sm text-slate-600">Trials counted: {summary.trials.counted}{summary.trials.skies ? `; ${summary.trials.skies}` : ""}.</p>
        </div>
      </section>

      <section aria-label="Sky map" className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
        <div className="flex flex-wrap items-end gap-4">
          <label className="flex flex-col gap-1 text-sm">
            <span className="font-medium text-slate-700">Layer</span>
            <select value={layer} onChange={(e) => setLayer(e.target.value as typeof layer)} className="rounded-md border border-slate-300 bg-white px-2 py-1 text-sm">
              {LAYERS.map((l) => <option key={l.key} value={l.key}>{l.label}</option>)}
            </select>
          </label>
          <SkyMapControls value={view} onChange={setView} />
        </div>
        {map.data ? (
          <SkyMap
            map={map.data}
            scale={{ kind: layerInfo.kind, label: layerInfo.label, unit: map.data.unit }}
            frame={view.frame}
            centreLonDeg={view.centreLonDeg}
            lonIncreases={view.lonIncreases}
            overlays={{
              galacticPlane: view.galacticPlane,
              supergalacticPlane: view.supergalacticPlane,
              decBand: fieldOfView(a),
              circles: [{ raDeg: best.raDeg, decDeg: best.decDeg, radiusDeg: best.radiusDeg, label: "best window" }, ...(pinned ? [{ raDeg: pinned.raDeg, decDeg: pinned.decDeg, radiusDeg: best.radiusDeg, label: "pinned" }] : [])],
            }}
            onHoverPixel={setHover}
            onClickPixel={setPinned}
            exportName={`analysis-${a.id}-${layer}`}
          />
        ) : <div className="flex aspect-[2/1] w-full items-center justify-center bg-mist-100 text-sm text-slate-500">Loading the map…</div>}
        <p className="text-sm" aria-live="polite" data-testid="pixel-readout">
          {readout ? (
            <>
              {pinned ? "Pinned window" : "Window"} at RA {readout.raDeg.toFixed(2)}°, Dec {readout.decDeg.toFixed(2)}° (l {readout.lDeg.toFixed(2)}°, b {readout.bDeg.toFixed(2)}°):
              {" "}N_on {read(counts.data, readout.ipix) ?? "…"}, N_exp {read(expected.data, readout.ipix)?.toFixed(1) ?? "…"}, local significance {read(significance.data, readout.ipix)?.toFixed(2) ?? "…"}σ
              {pinned ? <button type="button" className="ml-2 underline" onClick={() => setPinned(null)}>unpin</button> : null}
            </>
          ) : "Hover the map for a window's values; click to pin it."}
        </p>
        {pinned ? <PinnedWindow analysisId={a.id} raDeg={pinned.raDeg} decDeg={pinned.decDeg} /> : null}
        <MapDataDownloads a={a} />
      </section>

      <section aria-label="Top windows" className="rounded-lg border border-slate-200 bg-white p-5">
        <h2 className="text-base font-semibold">Top windows (radius {best.radiusDeg}°{best.thresholdEeV !== null ? `, E ≥ ${best.thresholdEeV} EeV` : ""})</h2>
        <p className="text-sm text-slate-600">Local maxima at least one radius apart. Post-trial: fraction of the {nSkies} isotropic skies whose best window over the whole search reached that local significance.</p>
        <table className="mt-2 w-full text-sm" data-testid="cluster-table">
          <thead className="text-left text-slate-500">
            <tr>
              {([["raDeg", "RA (°)"], ["decDeg", "Dec (°)"]] as const).map(([k, l]) => <th key={k} scope="col"><button type="button" onClick={() => setSortKey(k)} className="hover:underline">{l}</button></th>)}
              <th scope="col">l, b (°)</th>
              <th scope="col"><button type="button" onClick={() => setSortKey("nOn")} className="hover:underline">N_on</button></th>
              <th scope="col">N_exp</th>
              <th scope="col"><button type="button" onClick={() => setSortKey("excess")} className="hover:underline">Excess</button></th>
              <th scope="col"><button type="button" onClick={() => setSortKey("localSignificance")} className="hover:underline">Local σ</button></th>
              <th scope="col">Post-trial</th>
            </tr>
          </thead>
          <tbody>
            {windows.map((w) => (
              <tr key={w.pixel} className="border-t border-slate-100 tabular-nums">
                <td className="py-1">{w.raDeg.toFixed(2)}</td><td>{w.decDeg.toFixed(2)}</td><td>{w.lDeg.toFixed(1)}, {w.bDeg.toFixed(1)}</td>
                <td>{w.nOn}</td><td>{w.nExpected.toFixed(1)}</td><td>{w.excess.toFixed(1)}</td><td>{w.localSignificance.toFixed(2)}</td>
                <td>{w.postTrial.pUpperBound !== null ? `< ${w.postTrial.pUpperBound}` : w.postTrial.p}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </>
  );
}

function PinnedWindow({ analysisId, raDeg, decDeg }: { analysisId: number; raDeg: number; decDeg: number }) {
  const q = useQuery({
    queryKey: ["window", analysisId, raDeg, decDeg],
    queryFn: async () => {
      const r = await fetch(`/api/analyses/${analysisId}/window?ra=${raDeg}&dec=${decDeg}`);
      const body = await r.json();
      if (!r.ok) throw new Error(body.error?.message ?? `HTTP ${r.status}`);
      return body as { count: number; blinded: boolean; window: { radiusDeg: number }; energyEeV: { min: number; median: number; max: number } | null; time: { first: string; last: string } | null; mostEnergetic: { id: string; time: string; energyEeV: number | null; raDeg: number; decDeg: number }[] };
    },
  });
  if (q.isPending) return <p className="text-sm text-slate-500" role="status">Loading the window's events…</p>;
  if (q.isError) return <p role="alert" className="text-sm text-red-700">{q.error.message}</p>;
  const w = q.data;
  return (
    <div className="rounded-md border border-slate-200 p-3 text-sm" data-testid="pinned-window">
      <p className="font-medium">{w.count} events within {w.window.radiusDeg}° of the pinned window{w.blinded ? " (blinded sky)" : ""}</p>
      {w.energyEeV ? <p>Energy: {w.energyEeV.min.toFixed(1)}–{w.energyEeV.max.toFixed(1)} EeV, median {w.energyEeV.median.toFixed(1)} EeV</p> : null}
      {w.time ? <p>Arrivals from {w.time.first.slice(0, 10)} to {w.time.last.slice(0, 10)}</p> : null}
      {w.mostEnergetic.length ? (
        <table className="mt-2 text-xs tabular-nums">
          <caption className="text-left font-medium">Most energetic</caption>
          <thead className="text-left text-slate-500"><tr><th scope="col" className="pr-3">id</th><th scope="col" className="pr-3">time (UTC)</th><th scope="col" className="pr-3">E (EeV)</th><th scope="col" className="pr-3">RA</th><th scope="col">Dec</th></tr></thead>
          <tbody>{w.mostEnergetic.map((e) => <tr key={e.id}><td className="pr-3">{e.id}</td><td className="pr-3">{e.time.slice(0, 19).replace("T", " ")}</td><td className="pr-3">{e.energyEeV?.toFixed(2) ?? "—"}</td><td className="pr-3">{e.raDeg.toFixed(2)}</td><td>{e.decDeg.toFixed(2)}</td></tr>)}</tbody>
        </table>
      ) : null}
    </div>
  );
}

function MapDataDownloads({ a }: { a: AnalysisDetail }) {
  const layers = ["significance", "excess", "counts", "expected", "exposure"] as const;
  return (
    <div className="text-sm text-slate-600">
      Map data (RING order, ICRS):
      <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
        {layers.map((l) => (
          <li key={l}>
            {l}:{" "}
            {(["csv", "json", "fits", "binary"] as const).map((f, i) => (
              <span key={f}>{i ? " · " : ""}<a className="underline" href={`/api/analyses/${a.id}/maps/${l}?format=${f}`}>{f.toUpperCase()}</a></span>
            ))}
          </li>
        ))}
      </ul>
    </div>
  );
}

function LargeScaleResult({ a, summary }: { a: AnalysisDetail; summary: Record<string, any> }) {
  const r = summary.rayleigh, ew = summary.eastWest, d = summary.dipole;
  const hist = summary.raHistogram as { counts: number[]; fitted: number[] };
  const max = Math.max(...hist.counts, ...hist.fitted) * 1.1;
  const W = 560, H = 200, M = 40;
  const sx = (h: number) => M + (h / 24) * (W - 2 * M);
  const sy = (v: number) => H - 30 - (v / max) * (H - 50);
  const [view, setView] = useState<SkyMapSettings>(DEFAULT_SKY_MAP_SETTINGS);
  const map = useHealpixMap(`/api/analyses/${a.id}/maps/counts`);
  return (
    <>
      <section aria-label="First harmonic" className="rounded-lg border border-slate-200 bg-white p-5">
        <h2 className="text-base font-semibold">First harmonic in right ascension</h2>
        <table className="mt-2 text-sm tabular-nums" data-testid="harmonic-table">
          <thead className="text-left text-slate-500"><tr><th scope="col" className="pr-6">Method</th><th scope="col" className="pr-4">a</th><th scope="col" className="pr-4">b</th><th scope="col" className="pr-4">Amplitude</th><th scope="col" className="pr-4">Phase (°)</th><th scope="col" className="pr-4">Chance probability</th><th scope="col">99% upper limit</th></tr></thead>
          <tbody>
            <tr><td className="pr-6">Rayleigh{r.weighted ? " (weighted)" : ""}, Linsley 1975</td><td>{r.a.toFixed(4)}</td><td>{r.b.toFixed(4)}</td><td>{r.amplitude.toFixed(4)}</td><td>{r.phase.toFixed(1)}</td><td>{r.p.toPrecision(3)}</td><td>{r.amplitudeUpperLimit99 === null ? "— (significant)" : r.amplitudeUpperLimit99.toFixed(4)}</td></tr>
            <tr><td className="pr-6">East-west, Bonino et al. 2011</td><td>{ew.a.toFixed(4)}</td><td>{ew.b.toFixed(4)}</td><td>{ew.raAmplitude.toFixed(4)}</td><td>{ew.raPhase.toFixed(1)}</td><td>{ew.p.toPrecision(3)}</td><td>—</td></tr>
          </tbody>
        </table>
        <p className="mt-2 text-sm">3-D dipole (Aublin & Parizot 2005): amplitude {d.amplitude.toFixed(3)} ± {d.amplitudeSigma.toFixed(3)} towards RA {d.ra.toFixed(1)}° ± {d.raSigma.toFixed(1)}°, Dec {d.dec.toFixed(1)}° ± {d.decSigma.toFixed(1)}°.</p>
        <svg width={W} height={H} role="img" aria-label="Events per hour of right ascension with the fitted first harmonic" className="mt-3">
          {hist.counts.map((c, h) => <rect key={h} x={sx(h) + 1} width={(W - 2 * M) / 24 - 2} y={sy(c)} height={H - 30 - sy(c)} fill="#2a3670" />)}
          <polyline fill="none" stroke="#e8a33d" strokeWidth={2} points={hist.fitted.map((v, h) => `${sx(h + 0.5)},${sy(v)}`).join(" ")} />
          <line x1={M} x2={W - M} y1={H - 30} y2={H - 30} stroke="#64748b" />
          {[0, 6, 12, 18, 24].map((h) => <text key={h} x={sx(h)} y={H - 14} fontSize={10} textAnchor="middle">{h}h</text>)}
          <text x={W / 2} y={H - 2} fontSize={11} textAnchor="middle">right ascension (hours) · bars: events · line: fitted harmonic</text>
        </svg>
      </section>
      <section aria-label="Sky map" className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
        <SkyMapControls value={view} onChange={setView} />
        {map.data ? (
          <SkyMap map={map.data} scale={{ kind: "sequential", label: "Events per pixel", unit: "events" }} frame={view.frame} centreLonDeg={view.centreLonDeg} lonIncreases={view.lonIncreases}
            overlays={{ galacticPlane: view.galacticPlane, supergalacticPlane: view.supergalacticPlane, decBand: fieldOfView(a), points: [{ raDeg: d.ra, decDeg: d.dec, label: "dipole", errorRadiusDeg: Math.min(90, Math.max(d.decSigma, d.raSigma * Math.cos((d.dec * Math.PI) / 180))) }] }}
            exportName={`analysis-${a.id}-counts`} />
        ) : null}
      </section>
    </>
  );
}
