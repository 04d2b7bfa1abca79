import Link from "next/link";
import type { AlertListRow } from "@/lib/services/alerts";
import { fmtDeg, fmtSigned, postTrialLabel } from "./post-trial";

/** The alerts raised, newest first: where, how many events, local and post-trial figures with the trials counted. */
export function AlertsTable({ alerts }: { alerts: AlertListRow[] }) {
  if (!alerts.length) return <p className="text-slate-600" data-testid="no-alerts">No alert has been raised on the analyses you can see.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="alerts-table">
        <caption className="sr-only">Alerts, newest first</caption>
        <thead className="text-left text-slate-500">
          <tr>
            <th scope="col" className="pr-3">Raised (UTC)</th>
            <th scope="col" className="pr-3">Watched analysis</th>
            <th scope="col" className="pr-3">Kind</th>
            <th scope="col" className="pr-3">Position: RA, Dec (ICRS) · l, b</th>
            <th scope="col" className="pr-3">N_on / N_exp</th>
            <th scope="col" className="pr-3">Local (pre-trial)</th>
            <th scope="col">Post-trial</th>
          </tr>
        </thead>
        <tbody>
          {alerts.map((a) => (
            <tr key={a.id} className="border-t border-slate-100 align-top" data-testid={`alert-${a.id}`}>
              <td className="py-2 pr-3 whitespace-nowrap"><time dateTime={a.createdAt}>{a.createdAt.slice(0, 16).replace("T", " ")}</time></td>
              <td className="py-2 pr-3">
                <Link href={`/analyses/${a.runAnalysisId}`} className="font-medium text-night-700 hover:underline">{a.analysisName}</Link>
                <span className="block text-xs text-slate-500">dataset {a.datasetId} v{a.datasetVersion} · window {fmtDeg(a.radiusDeg, 0)}</span>
              </td>
              <td className="py-2 pr-3">{a.kind === "new" ? <span className="rounded bg-dawn-500/20 px-1.5 py-0.5 font-medium">New</span> : <span>Update (from {a.previousAnnouncedSigma?.toFixed(2)}σ)</span>}</td>
              <td className="py-2 pr-3 whitespace-nowrap" data-testid="alert-position">
                RA {fmtDeg(a.raDeg)}, Dec {fmtSigned(a.decDeg)}
                <span className="block text-slate-600">l {fmtDeg(a.lDeg)}, b {fmtSigned(a.bDeg)}</span>
              </td>
              <td className="py-2 pr-3">{a.nOn} / {a.nExpected.toFixed(1)}</td>
              <td className="py-2 pr-3 font-semibold" data-testid="alert-local">{a.localSigma.toFixed(2)}σ local{a.previousLocalSigma !== null ? <span className="block text-xs font-normal text-slate-500">previous run {a.previousLocalSigma.toFixed(2)}σ</span> : null}</td>
              <td className="py-2" data-testid="alert-post-trial">
                {postTrialLabel(a)}
                <span className="block text-xs text-slate-500">Trials counted: {a.trialsCounted}</span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
