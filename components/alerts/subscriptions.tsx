"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";
import type { SubscriptionRow } from "@/lib/services/subscriptions";

type Issues = Record<string, string>;

async function send(url: string, method: string, body?: unknown): Promise<{ ok: true } | { ok: false; message: string; issues: Issues }> {
  const r = await fetch(url, { method, headers: { "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
  if (r.ok) return { ok: true };
  const e = (await r.json().catch(() => ({}))).error ?? {};
  return { ok: false, message: e.message ?? `HTTP ${r.status}`, issues: Object.fromEntries(((e.issues ?? []) as { path: string; message: string }[]).map((i) => [i.path, i.message])) };
}

/** Threshold and delivery fields, shared by the new-subscription form and the edit row. */
function Fields({ idPrefix, local, setLocal, post, setPost, delivery, setDelivery, issues }: {
  idPrefix: string; local: string; setLocal: (v: string) => void; post: string; setPost: (v: string) => void; delivery: string; setDelivery: (v: string) => void; issues: Issues;
}) {
  return (
    <>
      <div>
        <label htmlFor={`${idPrefix}-local`} className="block text-sm font-medium">Local threshold (σ)</label>
        <input id={`${idPrefix}-local`} type="number" step="0.1" min="0" max="50" value={local} onChange={(e) => setLocal(e.target.value)} aria-invalid={Boolean(issues.localSigmaThreshold)} aria-describedby={issues.localSigmaThreshold ? `${idPrefix}-local-error` : undefined} className="mt-1 w-24 rounded-md border border-slate-300 px-2 py-1.5" />
        {issues.localSigmaThreshold ? <p id={`${idPrefix}-local-error`} className="text-xs text-red-700">{issues.localSigmaThreshold}</p> : null}
      </div>
      <div>
        <label htmlFor={`${idPrefix}-post`} className="block text-sm font-medium">Post-trial threshold (σ, optional)</label>
        <input id={`${idPrefix}-post`} type="number" step="0.1" min="0" max="50" value={post} placeholder="none" onChange={(e) => setPost(e.target.value)} aria-invalid={Boolean(issues.postTrialSigmaThreshold)} className="mt-1 w-24 rounded-md border border-slate-300 px-2 py-1.5" />
        {issues.postTrialSigmaThreshold ? <p className="text-xs text-red-700">{issues.postTrialSigmaThreshold}</p> : null}
      </div>
      <div>
        <label htmlFor={`${idPrefix}-delivery`} className="block text-sm font-medium">Delivery</label>
        <select id={`${idPrefix}-delivery`} value={delivery} onChange={(e) => setDelivery(e.target.value)} className="mt-1 rounded-md border border-slate-300 px-2 py-1.5">
          <option value="immediate">E-mail at once</option>
          <option value="daily-digest">Daily digest</option>
        </select>
      </div>
    </>
  );
}

/** Subscribe to one watched analysis, or to every published one (not offered to referees). */
export function SubscribeForm({ analyses, allowAllPublished, fixedAnalysisId, onDone }: { analyses: { id: number; name: string }[]; allowAllPublished: boolean; fixedAnalysisId?: number; onDone?: () => void }) {
  const router = useRouter();
  const hydrated = useHydrated();
  const [target, setTarget] = useState<string>(fixedAnalysisId ? String(fixedAnalysisId) : analyses[0] ? String(analyses[0].id) : allowAllPublished ? "all" : "");
  const [local, setLocal] = useState("4");
  const [post, setPost] = useState("");
  const [delivery, setDelivery] = useState("immediate");
  const [issues, setIssues] = useState<Issues>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const none = !fixedAnalysisId && !analyses.length && !allowAllPublished;
  return (
    <form
      data-hydrated={hydrated ? "true" : undefined}
      aria-label="Subscribe to alerts"
      className="flex flex-wrap items-end gap-3"
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        const r = await send("/api/subscriptions", "POST", {
          analysisId: target === "all" ? null : Number(target),
          localSigmaThreshold: local === "" ? undefined : Number(local),
          postTrialSigmaThreshold: post === "" ? null : Number(post),
          delivery,
        });
        setBusy(false);
        if (r.ok) { setIssues({}); setMessage(null); if (onDone) onDone(); else router.refresh(); } else { setIssues(r.issues); setMessage(r.message); }
      }}
    >
      {fixedAnalysisId ? null : (
        <div>
          <label htmlFor="subscribe-target" className="block text-sm font-medium">Alerts of</label>
          <select id="subscribe-target" value={target} onChange={(e) => setTarget(e.target.value)} className="mt-1 max-w-xs rounded-md border border-slate-300 px-2 py-1.5" disabled={none}>
            {analyses.map((a) => <option key={a.id} value={a.id}>{a.name}</option>)}
            {allowAllPublished ? <option value="all">Every published watched analysis</option> : null}
          </select>
        </div>
      )}
      <Fields idPrefix="subscribe" local={local} setLocal={setLocal} post={post} setPost={setPost} delivery={delivery} setDelivery={setDelivery} issues={issues} />
      <Button type="submit" disabled={busy || none || !hydrated}>{busy ? "Subscribing…" : "Subscribe"}</Button>
      {none ? <p className="w-full text-sm text-slate-600">No further watched analysis to subscribe to: an analyst has to watch one that you can read.</p> : null}
      {message ? <p role="alert" className="w-full text-sm text-red-700">{message}</p> : null}
    </form>
  );
}

/** One's subscriptions: change thresholds and delivery, pause or resume, remove. */
export function SubscriptionList({ subscriptions }: { subscriptions: SubscriptionRow[] }) {
  if (!subscriptions.length) return <p className="text-slate-600" data-testid="no-subscriptions">You subscribe to nothing yet.</p>;
  return (
    <ul className="divide-y divide-slate-100" data-testid="subscriptions">
      {subscriptions.map((s) => <SubscriptionItem key={s.id} s={s} />)}
    </ul>
  );
}

function SubscriptionItem({ s }: { s: SubscriptionRow }) {
  const router = useRouter();
  const hydrated = useHydrated();
  const [editing, setEditing] = useState(false);
  const [local, setLocal] = useState(String(s.localSigmaThreshold));
  const [post, setPost] = useState(s.postTrialSigmaThreshold === null ? "" : String(s.postTrialSigmaThreshold));
  const [delivery, setDelivery] = useState<string>(s.delivery);
  const [issues, setIssues] = useState<Issues>({});
  const [message, setMessage] = useState<string | null>(null);
  const act = async (method: string, body?: unknown) => {
    const r = await send(`/api/subscriptions/${s.id}`, method, body);
    if (r.ok) { setIssues({}); setMessage(null); setEditing(false); router.refresh(); } else { setIssues(r.issues); setMessage(r.message); }
  };
  const label = s.analysisId === null ? "Every published watched analysis" : s.analysisName ?? `analysis ${s.analysisId}`;
  return (
    <li className="py-3" data-testid={`subscription-${s.id}`} data-hydrated={hydrated ? "true" : undefined}>
      <div className="flex flex-wrap items-center gap-3">
        <span className="font-medium">{s.analysisId === null ? label : <a className="text-night-700 hover:underline" href={`/analyses/${s.analysisId}`}>{label}</a>}</span>
        <span className="text-sm text-slate-600">
          at {s.localSigmaThreshold}σ local{s.postTrialSigmaThreshold !== null ? ` and ${s.postTrialSigmaThreshold}σ post-trial` : ""} · {s.delivery === "immediate" ? "e-mail at once" : "daily digest"}
        </span>
        {s.paused ? <span className="rounded bg-slate-200 px-1.5 py-0.5 text-xs font-medium" data-testid="paused">Paused</span> : null}
        <span className="ml-auto flex gap-2">
          <Button variant="secondary" type="button" onClick={() => setEditing(!editing)} aria-expanded={editing}>{editing ? "Close" : "Change"}</Button>
          <Button variant="secondary" type="button" onClick={() => void act("PATCH", { paused: !s.paused })}>{s.paused ? "Resume" : "Pause"}</Button>
          <Button variant="danger" type="button" onClick={() => void act("DELETE")}>Unsubscribe</Button>
        </span>
      </div>
      {editing ? (
        <form className="mt-2 flex flex-wrap items-end gap-3" aria-label={`Change the subscription to ${label}`} onSubmit={(e) => { e.preventDefault(); void act("PATCH", { localSigmaThreshold: Number(local), postTrialSigmaThreshold: post === "" ? null : Number(post), delivery }); }}>
          <Fields idPrefix={`sub-${s.id}`} local={local} setLocal={setLocal} post={post} setPost={setPost} delivery={delivery} setDelivery={setDelivery} issues={issues} />
          <Button type="submit">Save</Button>
        </form>
      ) : null}
      {message ? <p role="alert" className="mt-1 text-sm text-red-700">{message}</p> : null}
    </li>
  );
}
