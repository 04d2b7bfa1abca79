import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { HttpError } from "@/lib/http";
import { getDatasetDetail } from "@/lib/services/datasets";
import { expectedDeclinationCounts } from "@/lib/datasets/expected-declination";
import { Histogram } from "@/components/charts/histogram";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { UnblindForm } from "@/components/datasets/unblind-form";
import { AppendForm } from "@/components/datasets/append-form";
import { DatasetSkyMap } from "@/components/sky-map/dataset-sky-map";
import { coveredDeclinationBand } from "@/lib/sky/exposure";
import { observedAgainstExpected } from "@/lib/services/coverage-observed";
import { ObservedVsExpected } from "@/components/coverage/observed-vs-expected";

export const metadata: Metadata = { title: "Dataset" };
export const dynamic = "force-dynamic";

export default async function DatasetPage({ params }: { params: Promise<{ id: string }> }) {
  const { user, forbidden } = await requirePageUser("datasets:read");
  if (forbidden) return <Forbidden role={user.role} what="The event data" />;
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const d = await getDatasetDetail(id).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const s = d.summary;
  const observed = await observedAgainstExpected(user, d.id);
  const zenithCut = Math.min(d.site.zenithMaxDeg, 90);
  const band = coveredDeclinationBand(d.site.latitudeDeg, zenithCut);
  const expectedDec = s ? expectedDeclinationCounts(s.declination.edgesDeg, d.site.latitudeDeg, zenithCut, s.eventCount) : undefined;
  const hours = Array.from({ length: 25 }, (_, i) => i);
  const spanDays = d.timeStart && d.timeEnd ? (Date.parse(d.timeEnd) - Date.parse(d.timeStart)) / 86_400_000 : 0;
  return (
    <>
      <PageHeader
        title={d.name}
        lead={d.description || undefined}
        actions={<a href={`/api/datasets/${d.id}/events.csv`} className="rounded-md border border-slate-300 bg-white px-4 py-2 text-sm">Download converted events (CSV)</a>}
      />
      {d.blinded ? (
        <p role="note" className="mb-4 rounded-md border border-slate-400 bg-slate-800 px-4 py-3 text-sm text-white">
          <strong>Blinded.</strong> Right ascensions in every view and export are shifted by a secret offset (galactic coordinates
          recomputed, times shifted by the same fraction of a sidereal day), so scans can be designed without seeing the true sky.
        </p>
      ) : null}
      <div className="grid gap-4 md:grid-cols-3">
        <Card title="Summary">
          <dl className="grid grid-cols-2 gap-y-1 text-sm">
            <dt className="text-slate-500">Events</dt><dd data-testid="dataset-events" className="tabular-nums">{d.eventCount.toLocaleString("en")}</dd>
            <dt className="text-slate-500">Version</dt><dd>v{d.version}</dd>
            <dt className="text-slate-500">From</dt><dd>{d.timeStart?.slice(0, 19).replace("T", " ") ?? "—"}</dd>
            <dt className="text-slate-500">To</dt><dd>{d.timeEnd?.slice(0, 19).replace("T", " ") ?? "—"}</dd>
            <dt className="text-slate-500">Span</dt><dd>{spanDays.toFixed(1)} days</dd>
            <dt className="text-slate-500">Bad rows dropped</dt><dd>{d.droppedRows}</dd>
            <dt className="text-slate-500">Site</dt><dd>{d.site.name}</dd>
            <dt className="text-slate-500">Zenith cut</dt><dd>{d.site.zenithMaxDeg}°</dd>
          </dl>
          <p className="mt-2 break-all text-xs text-slate-500">SHA-256 <code>{d.contentHash}</code></p>
        </Card>
        <Card title="Versions" className="md:col-span-2">
          <table className="w-full text-sm">
            <thead className="text-left text-slate-500"><tr><th scope="col">Version</th><th scope="col">Events (batch)</th><th scope="col">Dropped</th><th scope="col">Added</th><th scope="col">SHA-256</th></tr></thead>
            <tbody>
              {d.versions.map((v) => (
                <tr key={v.version} className="border-t border-slate-100">
                  <td className="py-1">v{v.version}</td>
                  <td className="py-1 tabular-nums">{v.eventCount.toLocaleString("en")} (+{v.batchEventCount.toLocaleString("en")})</td>
                  <td className="py-1">{v.droppedRows}</td>
                  <td className="py-1">{v.createdAt.slice(0, 16).replace("T", " ")}</td>
                  <td className="py-1"><code className="text-xs">{v.contentHash.slice(0, 16)}…</code></td>
                </tr>
              ))}
            </tbody>
          </table>
          <h3 className="mt-4 text-sm font-semibold">Analyses using this dataset</h3>
          {d.analyses.length === 0 ? <p className="text-sm text-slate-600">None yet.</p> : (
            <ul className="text-sm">{d.analyses.map((a) => <li key={a.id}>{a.name} ({a.kind}, on v{a.datasetVersion}, {a.status})</li>)}</ul>
          )}
        </Card>
      </div>
      <Card title="Sky map of the events" className="mt-4">
        <DatasetSkyMap datasetId={d.id} decBand={{ minDeg: band.decMinDeg, maxDeg: band.decMaxDeg }} exportName={`dataset-${d.id}-v${d.version}-counts`} />
      </Card>
      {s ? (
        <Card title="Distributions" className="mt-4">
          <div className="grid gap-6 lg:grid-cols-2">
            <Histogram title="Zenith angle" edges={s.zenith.edgesDeg} counts={s.zenith.counts} xLabel="zenith (°)" xTicks={[0, 30, 60, 90]} />
            <Histogram title="Azimuth (north, clockwise)" edges={s.azimuth.edgesDeg} counts={s.azimuth.counts} xLabel="azimuth (°)" xTicks={[0, 90, 180, 270, 360]} />
            <Histogram title="Declination against the analytic exposure" edges={s.declination.edgesDeg} counts={s.declination.counts} expected={expectedDec}
              xLabel="declination (°)" xTicks={[-90, -45, 0, 45, 90]} />
            <Histogram title="Events per hour of local sidereal time" edges={hours} counts={s.siderealHour.counts} xLabel="local sidereal time (h)" xTicks={[0, 6, 12, 18, 24]}
              expected={s.siderealHour.counts.map(() => s.eventCount / 24)} />
            <Histogram title="Events per hour of UTC" edges={hours} counts={s.solarHour.counts} xLabel="UTC hour (h)" xTicks={[0, 6, 12, 18, 24]} />
            <Histogram title="Energy spectrum" edges={s.energy.log10EdgesEeV} counts={s.energy.counts} xLabel="log10(E / EeV)" logY
              formatX={(x) => x.toFixed(1)} />
          </div>
          {s.energy.unknown > 0 ? <p className="mt-2 text-sm text-slate-600">{s.energy.unknown} events without energy are not in the spectrum.</p> : null}
          <p className="mt-2 text-xs text-slate-500">
            Flat line on the sidereal-time plot: uniform coverage. The declination expectation is Sommers (2001) for latitude {d.site.latitudeDeg}° and
            zenith cut {zenithCut}°, scaled to the event count.
          </p>
        </Card>
      ) : null}
      {observed ? (
        <Card title="Observed against expected" className="mt-4">
          <ObservedVsExpected result={observed} />
        </Card>
      ) : null}
      {can(user.role, "datasets:upload") ? (
        <Card title="Append a batch" className="mt-4">
          <AppendForm datasetId={d.id} />
        </Card>
      ) : null}
      {d.blinded && can(user.role, "datasets:unblind") ? (
        <Card title="Unblind" className="mt-4">
          <UnblindForm datasetId={d.id} />
        </Card>
      ) : null}
      <p className="mt-6 text-sm"><Link href="/data" className="underline">All datasets</Link></p>
    </>
  );
}
