"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { JobProgress } from "./job-progress";
import { useUpload } from "./use-upload";
import { useHydrated } from "@/components/ui/use-hydrated";

export function AppendForm({ datasetId }: { datasetId: number }) {
  const [file, setFile] = useState<File | null>(null);
  const [drop, setDrop] = useState(false);
  const upload = useUpload();
  const hydrated = useHydrated();
  return (
    <form
      aria-label="Append a batch"
      data-hydrated={hydrated ? "true" : "false"}
      onSubmit={(e) => {
        e.preventDefault();
        if (file) upload.start(`/api/datasets/${datasetId}/batches?${new URLSearchParams({ fileName: file.name, dropBadRows: String(drop) })}`, file);
      }}
    >
      <p className="mb-2 text-sm text-slate-600">A later batch with the same columns and site; it becomes the next version. Earlier versions stay as they were.</p>
      <label htmlFor="append-file" className="block text-sm font-medium">Batch file (CSV or .csv.gz)</label>
      <input id="append-file" type="file" accept=".csv,.gz,text/csv" onChange={(e) => setFile(e.target.files?.[0] ?? null)} className="mt-1 block text-sm" />
      <label className="mt-2 flex items-center gap-2 text-sm"><input type="checkbox" checked={drop} onChange={(e) => setDrop(e.target.checked)} /> Drop bad rows instead of rejecting the batch</label>
      <Button type="submit" className="mt-3" disabled={!file || upload.busy}>Append batch</Button>
      <JobProgress sent={upload.sent} job={upload.job} error={upload.error ?? upload.jobError} />
    </form>
  );
}
