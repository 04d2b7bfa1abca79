"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";

export function UnsubscribeButton({ token }: { token: string }) {
  const hydrated = useHydrated();
  const [result, setResult] = useState<{ ok: boolean; message: string } | null>(null);
  const [busy, setBusy] = useState(false);
  if (result) return <p role="status" className={`rounded-md p-4 ${result.ok ? "bg-green-50 text-green-900" : "bg-red-50 text-red-900"}`} data-testid="unsubscribe-result">{result.message}</p>;
  return (
    <form
      data-hydrated={hydrated ? "true" : undefined}
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        const r = await fetch("/api/subscriptions/unsubscribe", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ token }) });
        const body = await r.json().catch(() => ({}));
        setBusy(false);
        setResult(r.ok ? { ok: true, message: body.message } : { ok: false, message: body.error?.message ?? `HTTP ${r.status}` });
      }}
    >
      <Button type="submit" disabled={busy || !hydrated}>{busy ? "Unsubscribing…" : "Unsubscribe"}</Button>
    </form>
  );
}
