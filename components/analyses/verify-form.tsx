"use client";

import { useQuery } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";

type Verification = { id: number; status: string; error: string | null; result: { match: boolean; data: { match: boolean; contentHash: string; expected: string; events: number }; differences: { path: string; saved: unknown; rerun: unknown }[]; note?: string } | null };

export function VerifyForm() {
  const hydrated = useHydrated();
  const [id, setId] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const q = useQuery({
    queryKey: ["verification", id],
    enabled: id !== null,
    queryFn: async (): Promise<Verification> => (await (await fetch(`/api/verifications/${id}`, { cache: "no-store" })).json()).verification,
    refetchInterval: (query) => (query.state.data && ["done", "failed"].includes(query.state.data.status) ? false : 1000),
  });

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const bundle = form.get("bundle") as File | null;
    const events = form.get("events") as File | null;
    if (!bundle?.size || !events?.size) return setError("Choose the bundle and the events file.");
    setPending(true);
    setError(null);
    try {
      let json: unknown;
      try {
        json = JSON.parse(await bundle.text());
      } catch {
        throw new Error("The bundle is not valid JSON.");
      }
      const created = await fetch("/api/verifications", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(json) });
      const body = await created.json();
      if (!created.ok) throw new Error(body.error?.message ?? `HTTP ${created.status}`);
      const sent = await fetch(body.verification.events, { method: "POST", headers: { "content-type": "text/csv" }, body: events });
      if (!sent.ok) throw new Error((await sent.json()).error?.message ?? `HTTP ${sent.status}`);
      setId(body.verification.id);
    } catch (err) {
      setError((err as Error).message);
    } finally {
      setPending(false);
    }
  }

  const v = q.data;
  return (
    <form onSubmit={submit} className="space-y-4" aria-label="Verify a reproduction bundle" data-hydrated={hydrated ? "true" : "false"}>
      <div className="grid gap-4 sm:grid-cols-2">
        <div>
          <label htmlFor="bundle" className="block text-sm font-medium">Reproduction bundle (JSON)</label>
          <input id="bundle" name="bundle" type="file" accept=".json,application/json" className="mt-1 block text-sm" />
        </div>
        <div>
          <label htmlFor="events" className="block text-sm font-medium">Events CSV (the dataset's converted-events download)</label>
          <input id="events" name="events" type="file" accept=".csv,text/csv" className="mt-1 block text-sm" />
        </div>
      </div>
      <Button type="submit" disabled={pending || (v !== undefined && !["done", "failed"].includes(v.status))}>{pending ? "Sending…" : "Verify"}</Button>
      {error ? <p role="alert" className="text-sm text-red-700">{error}</p> : null}
      {v ? (
        <div aria-live="polite" className="text-sm" data-testid="verification">
          {v.status === "done" && v.result ? (
            v.result.match ? <p className="font-semibold text-green-800">Match: the events are the ones the analysis used, and every saved figure came back.</p> : (
              <div className="text-red-800">
                <p className="font-semibold">Mismatch.</p>
                <p>Events: {v.result.data.match ? "the same as the analysis used" : `different (SHA-256 ${v.result.data.contentHash.slice(0, 16)}…, expected ${v.result.data.expected.slice(0, 16)}…)`}{v.result.note ? ` — ${v.result.note}` : ""}</p>
                {v.result.differences.length ? <ul className="list-disc pl-5">{v.result.differences.slice(0, 10).map((d) => <li key={d.path}>{d.path}: saved {String(d.saved)}, now {String(d.rerun)}</li>)}</ul> : null}
              </div>
            )
          ) : v.status === "failed" ? <p role="alert" className="text-red-700">The check failed: {v.error}</p> : <p role="status">Checking ({v.status})…</p>}
        </div>
      ) : null}
    </form>
  );
}
