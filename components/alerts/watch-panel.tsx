"use client";

import Link from "next/link";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";
import type { AlertListRow, WatchInfo } from "@/lib/services/alerts";
import { SubscribeForm } from "./subscriptions";
import { fmtDeg, fmtSigned, postTrialLabel } from "./post-trial";

/**
 * The analysis page's alert controls: analysts watch or stop watching a finished hotspot scan;
 * anyone who may read it and subscribe does so here; the chain of reruns with the comparison
 * of each with the run before it; the alerts of the watched analysis.
 */
export function WatchPanel({ analysisId, status, canWatch, canSubscribe }: { analysisId: number; status: string; canWatch: boolean; canSubscribe: boolean }) {
  const client = useQueryClient();
  const hydrated = useHydrated();
  const watch = useQuery({
    queryKey: ["watch", analysisId],
    queryFn: async (): Promise<WatchInfo> => (await (await fetch(`/api/analyses/${analysisId}/watch`, { cache: "no-store" })).json()).watch,
    refetchInterval: (q) => (q.state.data?.runs.some((r) => r.status === "queued") ? 2000 : false),
  });
  const w = watch.data;
  const alerts = useQuery({
    queryKey: ["watch-alerts", w?.rootId],
    enabled: Boolean(w?.watched) && canSubscribe,
    queryFn: async (): Promise<AlertListRow[]> => (await (await fetch(`/api/alerts?analysisId=${w!.rootId}`, { cache: "no-store" })).json()).alerts ?? [],
  });
  const [dedup, setDedup] = useState("");
  const [step, setStep] = useState("1");
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (!w) return null;
  const toggle = async (watched: boolean) => {
    setBusy(true);
    const r = await fetch(`/api/analyses/${analysisId}/watch`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ watched, dedupRadiusDeg: dedup === "" ? null : Number(dedup), updateStepSigma: step === "" ? undefined : Number(step) }),
    });
    setBusy(false);
    setMessage(r.ok ? null : (await r.json().catch(() => ({}))).error?.message ?? `HTTP ${r.status}`);
    await client.invalidateQueries({ queryKey: ["watch", analysisId] });
  };
  return (
    <section aria-label="Watch and alerts" className="mt-6 rounded-lg border border-slate-200 bg-white p-5" data-testid="watch-panel">
      <h2 className="text-base font-semibold">Watch and alerts</h2>
      {w.isRerun ? (
        <p className="mt-1 text-sm text-slate-600">This is a rerun of the watched analysis <Link className="text-night-700 hover:underline" href={`/analyses/${w.rootId}`}>{w.rootName}</Link> on a newer version of its data (same settings and seed).</p>
      ) : (
        <p className="mt-1 text-sm text-slate-600" data-testid="watch-state">
          {w.watched
            ? `Watched since ${w.since?.slice(0, 10) ?? "?"}: each appended batch reruns it on the new dataset version with the same settings and seed. Alerts at the lowest subscriber threshold (at most 4σ local); the same cluster within ${w.dedupRadiusDeg === null ? "one window radius" : fmtDeg(w.dedupRadiusDeg, 1)} is announced once, again only when it rises by ${w.updateStepSigma}σ.`
            : "Not watched: new data do not rerun it."}
        </p>
      )}
      {canWatch && !w.isRerun ? (
        <form className="mt-3 flex flex-wrap items-end gap-3" data-hydrated={hydrated ? "true" : undefined} aria-label="Watch settings" onSubmit={(e) => { e.preventDefault(); void toggle(!w.watched); }}>
          {!w.watched ? (
            <>
              <div>
                <label htmlFor="watch-dedup" className="block text-sm font-medium">Same cluster within (°)</label>
                <input id="watch-dedup" type="number" min="0.1" max="90" step="0.1" placeholder="window radius" value={dedup} onChange={(e) => setDedup(e.target.value)} className="mt-1 w-32 rounded-md border border-slate-300 px-2 py-1.5" />
              </div>
              <div>
                <label htmlFor="watch-step" className="block text-sm font-medium">Update step (σ)</label>
                <input id="watch-step" type="number" min="0.1" max="20" step="0.1" value={step} onChange={(e) => setStep(e.target.value)} className="mt-1 w-24 rounded-md border border-slate-300 px-2 py-1.5" />
              </div>
            </>
          ) : null}
          <Button type="submit" variant={w.watched ? "secondary" : "primary"} disabled={busy || !hydrated}>{w.watched ? "Stop watching" : "Watch this analysis"}</Button>
          {!w.watched && status !== "done" ? <span className="text-sm text-slate-500">A scan can be watched once it has finished.</span> : null}
        </form>
      ) : null}
      {message ? <p role="alert" className="mt-2 text-sm text-red-700">{message}</p> : null}

      {w.watched && canSubscribe ? (
        <div className="mt-4">
          <h3 className="text-sm font-semibold">Your subscription</h3>
          {w.subscription ? (
            <p className="mt-1 text-sm" data-testid="watch-subscription">
              Subscribed at {w.subscription.localSigmaThreshold}σ local{w.subscription.postTrialSigmaThreshold !== null ? ` and ${w.subscription.postTrialSigmaThreshold}σ post-trial` : ""}, {w.subscription.delivery === "immediate" ? "e-mail at once" : "daily digest"}{w.subscription.paused ? " (paused)" : ""}. <Link href="/alerts" className="text-night-700 hover:underline">Change it on the Alerts page</Link>.
            </p>
          ) : (
            <div className="mt-2"><SubscribeForm analyses={[]} allowAllPublished={false} fixedAnalysisId={w.rootId} onDone={() => void client.invalidateQueries({ queryKey: ["watch", analysisId] })} /></div>
          )}
        </div>
      ) : null}

      {w.runs.length ? (
        <div className="mt-4 overflow-x-auto">
          <h3 className="text-sm font-semibold">Reruns on new data, each compared with the run before</h3>
          <table className="mt-1 w-full text-sm" data-testid="watch-runs">
            <thead className="text-left text-slate-500"><tr><th scope="col">Version</th><th scope="col">Run</th><th scope="col">Events</th><th scope="col">Best local (before → now)</th><th scope="col">Alerts</th></tr></thead>
            <tbody>
              {w.runs.map((r) => {
                const c = r.comparison as { previousVersion?: number; previousEvents?: number; events?: number; previousBestLocalSigma?: number; bestLocalSigma?: number; newAlerts?: number; updates?: number } | null;
                return (
                  <tr key={r.id} className="border-t border-slate-100">
                    <td className="py-1">v{c?.previousVersion ?? "?"} → v{r.datasetVersion}</td>
                    <td className="py-1"><Link className="text-night-700 hover:underline" href={`/analyses/${r.runAnalysisId}`}>analysis {r.runAnalysisId}</Link> ({r.status === "queued" ? r.runStatus : r.status})</td>
                    <td className="py-1">{c ? `${c.previousEvents?.toLocaleString("en-US")} → ${c.events?.toLocaleString("en-US")}` : "…"}</td>
                    <td className="py-1">{c ? `${c.previousBestLocalSigma?.toFixed(2)}σ → ${c.bestLocalSigma?.toFixed(2)}σ` : "…"}</td>
                    <td className="py-1">{c ? `${c.newAlerts} new, ${c.updates} update${c.updates === 1 ? "" : "s"}` : r.error ?? "…"}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ) : null}

      {alerts.data?.length ? (
        <ul className="mt-4 space-y-1 text-sm" data-testid="watch-alerts">
          {alerts.data.map((a) => (
            <li key={a.id}>
              <strong>{a.kind === "new" ? "Alert" : "Update"}</strong> on v{a.datasetVersion}: RA {fmtDeg(a.raDeg)}, Dec {fmtSigned(a.decDeg)} (l {fmtDeg(a.lDeg)}, b {fmtSigned(a.bDeg)}), N_on {a.nOn} vs N_exp {a.nExpected.toFixed(1)}, <strong>{a.localSigma.toFixed(2)}σ local</strong>, post-trial {postTrialLabel(a)}; trials counted: {a.trialsCounted}
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
