import type { Metadata } from "next";
import { requirePageUser } from "@/lib/auth/server";
import { can, ROLE_LABELS, type Permission } from "@/lib/auth/roles";
import { dashboardSummary } from "@/lib/services/dashboard";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";

export const metadata: Metadata = { title: "Dashboard" };
export const dynamic = "force-dynamic";

const ABILITIES: { permission: Permission; text: string }[] = [
  { permission: "users:manage", text: "Invite people and change their roles" },
  { permission: "sites:manage", text: "Describe array sites (position, zenith cut, azimuth convention)" },
  { permission: "datasets:upload", text: "Upload and append event lists" },
  { permission: "analyses:run", text: "Run hotspot scans and large-scale fits" },
  { permission: "analyses:publish", text: "Share analyses with referees and publish them to members" },
  { permission: "analyses:read-shared", text: "Read analyses shared with you" },
  { permission: "analyses:reproduce", text: "Rerun saved analyses and compare the numbers" },
  { permission: "analyses:read-published", text: "Read published results" },
  { permission: "alerts:subscribe", text: "Subscribe to alerts on watched analyses" },
];

function formatDeg(value: number, pos: string, neg: string): string {
  return `${Math.abs(value).toFixed(2)}° ${value >= 0 ? pos : neg}`;
}

export default async function DashboardPage() {
  const { user } = await requirePageUser();
  const summary = await dashboardSummary();
  const abilities = ABILITIES.filter((a) => can(user.role, a.permission));

  return (
    <>
      <PageHeader title={`Welcome, ${user.name}`} lead={`Signed in as ${ROLE_LABELS[user.role].toLowerCase()}.`} />
      <div className="grid gap-4 md:grid-cols-3">
        <Card title="Datasets">
          <p className="text-3xl font-semibold" data-testid="count-datasets">{summary.datasetCount}</p>
        </Card>
        <Card title="Analyses">
          <p className="text-3xl font-semibold" data-testid="count-analyses">{summary.analysisCount}</p>
          <p className="text-sm text-slate-600">{summary.publishedCount} published</p>
        </Card>
        <Card title="Sites">
          <p className="text-3xl font-semibold" data-testid="count-sites">{summary.sites.length}</p>
        </Card>
      </div>
      <div className="mt-4 grid gap-4 md:grid-cols-2">
        <Card title="What your role can do">
          <ul className="list-disc space-y-1 pl-5 text-slate-700">
            {abilities.map((a) => (
              <li key={a.permission}>{a.text}</li>
            ))}
          </ul>
        </Card>
        <Card title="Array sites">
          {summary.sites.length === 0 ? (
            <p className="text-slate-600">No site yet.</p>
          ) : (
            <table className="w-full text-sm">
              <caption className="sr-only">Array sites</caption>
              <thead className="text-left text-slate-500">
                <tr><th scope="col">Name</th><th scope="col">Position</th><th scope="col">Height</th><th scope="col">Zenith cut</th></tr>
              </thead>
              <tbody>
                {summary.sites.map((s) => (
                  <tr key={s.id} className="border-t border-slate-100">
                    <td className="py-1 pr-2">{s.name}</td>
                    <td className="py-1 pr-2">{formatDeg(s.latitudeDeg, "N", "S")}, {formatDeg(s.longitudeDeg, "E", "W")}</td>
                    <td className="py-1 pr-2">{s.heightM.toFixed(0)} m</td>
                    <td className="py-1">{s.zenithMaxDeg}°</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </Card>
      </div>
      <Caution className="mt-6" />
    </>
  );
}
