"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";

export function UnblindForm({ datasetId }: { datasetId: number }) {
  const router = useRouter();
  const [reason, setReason] = useState("");
  const [message, setMessage] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  return (
    <form
      onSubmit={async (e) => {
        e.preventDefault();
        setPending(true);
        const response = await fetch(`/api/datasets/${datasetId}/unblind`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ reason }) });
        setPending(false);
        if (response.ok) router.refresh();
        else setMessage((await response.json()).error?.message ?? "Unblinding failed.");
      }}
    >
      <p className="mb-2 text-sm text-slate-600">Unblinding shows the true right ascensions to everyone who can see this dataset. It cannot be undone and is written to the audit log.</p>
      <label htmlFor="unblind-reason" className="block text-sm font-medium">Reason (for the audit log)</label>
      <input id="unblind-reason" value={reason} onChange={(e) => setReason(e.target.value)} className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
      <Button type="submit" variant="danger" className="mt-3" disabled={pending || reason.trim().length < 3}>Unblind dataset</Button>
      {message ? <p role="alert" className="mt-2 text-sm text-red-700">{message}</p> : null}
    </form>
  );
}
