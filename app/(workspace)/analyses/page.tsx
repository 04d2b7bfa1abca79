import type { Metadata } from "next";
import Link from "next/link";
import { requirePageUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { listAnalyses } from "@/lib/services/analyses";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";

export const metadata: Metadata = { title: "Analyses" };
export const dynamic = "force-dynamic";

type Summary = { best?: { localSignificance?: number; postTrial?: { p?: number; pUpperBound?: number | null; nSkies?: number } }; rayleigh?: { amplitude?: number; p?: number } } | null;

function headline(kind: string, s: Summary): string {
  if (!s) return "—";
  if (kind === "hotspot" && s.best) {
    const pt = s.best.postTrial;
    const post = pt?.pUpperBound ? `< ${pt.pUpperBound}` : String(pt?.p);
    return `local ${s.best.localSignificance?.toFixed(2)}σ · post-trial p ${post} (${pt?.nSkies} skies)`;
  }
  if (s.rayleigh) return `r = ${s.rayleigh.amplitude?.toFixed(4)} · p = ${s.rayleigh.p?.toPrecision(3)}`;
  return "—";
}

export default async function AnalysesPage() {
  const { user } = await requirePageUser();
  const rows = await listAnalyses(user);
  return (
    <>
      <PageHeader
        title="Analyses"
        lead={can(user.role, "analyses:run") ? "Hotspot scans and large-scale fits, each saved with its settings, data version, code version and seed." : can(user.role, "analyses:read-shared") ? "Analyses shared with you for review." : "Published analyses."}
        actions={
          <div className="flex gap-2">
            {can(user.role, "analyses:reproduce") ? <Link href="/analyses/verify" className="rounded-md border border-slate-300 bg-white px-4 py-2 text-sm">Verify a bundle</Link> : null}
            {can(user.role, "analyses:run") ? <Link href="/analyses/new" className="rounded-md bg-night-800 px-4 py-2 text-sm text-white">New analysis</Link> : null}
          </div>
        }
      />
      <Card>
        {rows.length === 0 ? <p className="text-slate-600" data-testid="no-analyses">No analysis to show yet.</p> : (
          <table className="w-full text-sm">
            <caption className="sr-only">Analyses</caption>
            <thead className="text-left text-slate-500"><tr><th scope="col">Name</th><th scope="col">Kind</th><th scope="col">Status</th><th scope="col">Data</th><th scope="col">Headline (local and post-trial)</th><th scope="col">Published</th></tr></thead>
            <tbody>
              {rows.map((a) => (
                <tr key={a.id} className="border-t border-slate-100">
                  <td className="py-2 pr-2"><Link href={`/analyses/${a.id}`} className="font-medium text-night-700 hover:underline">{a.name}</Link></td>
                  <td className="py-2 pr-2">{a.kind}</td>
                  <td className="py-2 pr-2">{a.status}{a.status === "running" ? ` (${Math.round(a.progress * 100)}%)` : ""}</td>
                  <td className="py-2 pr-2">dataset {a.datasetId} v{a.datasetVersion}</td>
                  <td className="py-2 pr-2">{headline(a.kind, a.summary as Summary)}</td>
                  <td className="py-2">{a.publishedAt ? a.publishedAt.toISOString().slice(0, 10) : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Card>
      <Caution className="mt-6" />
    </>
  );
}
