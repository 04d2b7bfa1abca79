"use client";

import Link from "next/link";
import type { JobView } from "./use-upload";

function Bar({ label, value, max }: { label: string; value: number; max: number }) {
  return (
    <div>
      <div className="flex justify-between text-sm"><span>{label}</span><span className="tabular-nums">{max > 0 ? `${Math.round((100 * value) / max)}%` : ""}</span></div>
      <progress className="h-2 w-full" value={value} max={max || 1} aria-label={label} />
    </div>
  );
}

/** Upload progress: bytes sent, then rows read and rows stored by the job, then the outcome. */
export function JobProgress({ sent, job, error }: { sent: { loaded: number; total: number } | null; job: JobView | null; error: string | null }) {
  if (!sent && !error) return null;
  return (
    <div className="mt-4 space-y-3" aria-live="polite" data-testid="upload-progress">
      {sent ? <Bar label={`File sent: ${(sent.loaded / 2 ** 20).toFixed(1)} of ${(sent.total / 2 ** 20).toFixed(1)} MiB`} value={sent.loaded} max={sent.total} /> : null}
      {job ? (
        <>
          <p className="text-sm">Rows read: <span className="tabular-nums" data-testid="rows-read">{job.rowsRead.toLocaleString("en")}</span> · rows stored: <span className="tabular-nums" data-testid="rows-stored">{job.rowsStored.toLocaleString("en")}</span> · {job.status}</p>
          {job.rowsRead > 0 ? <Bar label="Stored" value={job.rowsStored} max={job.rowsRead} /> : null}
        </>
      ) : null}
      {error ? <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-red-800">{error}</p> : null}
      {job?.status === "done" && job.datasetId ? (
        <p className="rounded-md bg-green-50 px-3 py-2 text-sm text-green-900">
          Stored {job.rowsStored.toLocaleString("en")} events{job.report?.droppedRows ? `, dropped ${job.report.droppedRows} bad rows` : ""}.{" "}
          <Link href={`/data/${job.datasetId}`} className="font-medium underline">Open the dataset</Link>
        </p>
      ) : null}
      {job && (job.status === "rejected" || job.status === "failed") ? (
        <div role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-red-900" data-testid="upload-rejected">
          <p className="font-medium">{job.report?.reason ?? "The file was not stored."}</p>
          {job.report?.duplicateOf ? <p><Link href={job.report.duplicateOf.url} className="underline">See the existing dataset</Link></p> : null}
          {job.report?.badRows?.length ? (
            <>
              <p className="mt-2">Bad rows ({job.report.badRowCount} in all{job.report.badRowCount! > job.report.badRows.length ? `, first ${job.report.badRows.length} shown` : ""}):</p>
              <ul className="mt-1 max-h-48 overflow-auto font-mono text-xs">
                {job.report.badRows.map((b) => <li key={b.line}>line {b.line}: {b.reason}</li>)}
              </ul>
            </>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
