"use client";

import { useQuery } from "@tanstack/react-query";
import { useCallback, useState } from "react";

export interface JobView {
  id: string;
  status: "receiving" | "queued" | "parsing" | "storing" | "done" | "rejected" | "failed";
  fileName: string;
  byteCount: number;
  rowsRead: number;
  rowsStored: number;
  datasetId: number | null;
  report: { reason?: string; badRowCount?: number; badRows?: { line: number; reason: string }[]; droppedRows?: number; duplicateOf?: { datasetId: number; url: string } } | null;
}

/**
 * Sends a file as the request body (the browser streams it from disk; XMLHttpRequest reports
 * the bytes sent), then polls the ingestion job with react-query until it ends.
 */
export function useUpload() {
  const [sent, setSent] = useState<{ loaded: number; total: number } | null>(null);
  const [jobId, setJobId] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  const job = useQuery({
    queryKey: ["job", jobId],
    enabled: jobId !== null,
    queryFn: async (): Promise<JobView> => {
      const response = await fetch(`/api/jobs/${jobId}`, { cache: "no-store" });
      const body = await response.json();
      if (!response.ok) throw new Error(body.error?.message ?? `HTTP ${response.status}`);
      return body.job;
    },
    refetchInterval: (q) => (q.state.data && ["done", "rejected", "failed"].includes(q.state.data.status) ? false : 700),
  });

  const start = useCallback((url: string, file: File) => {
    setError(null);
    setJobId(null);
    setSent({ loaded: 0, total: file.size });
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.setRequestHeader("content-type", file.name.endsWith(".gz") ? "application/gzip" : "text/csv");
    xhr.upload.onprogress = (e) => setSent({ loaded: e.loaded, total: e.total || file.size });
    xhr.onerror = () => setError("The upload was interrupted (network error); nothing was stored. Try again.");
    xhr.onload = () => {
      let body: { job?: { id: string }; error?: { message: string; issues?: { path: string; message: string }[] } } = {};
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        /* not JSON */
      }
      if (xhr.status === 202 && body.job) setJobId(body.job.id);
      else setError(body.error ? `${body.error.message}${body.error.issues?.length ? ` (${body.error.issues.map((i) => `${i.path}: ${i.message}`).join("; ")})` : ""}` : `The server answered ${xhr.status}.`);
    };
    xhr.send(file);
  }, []);

  return { start, sent, job: job.data ?? null, jobError: job.error ? (job.error as Error).message : null, error, busy: sent !== null && !error && (!job.data || !["done", "rejected", "failed"].includes(job.data.status)) };
}
