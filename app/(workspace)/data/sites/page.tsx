import type { Metadata } from "next";
import { requirePageUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { listSites } from "@/lib/services/sites";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { SiteForm } from "@/components/sites/site-form";
import { SiteGlobe } from "@/components/sites/site-globe";

export const metadata: Metadata = { title: "Sites" };
export const dynamic = "force-dynamic";

export default async function SitesPage() {
  const { user, forbidden } = await requirePageUser("datasets:read");
  if (forbidden) return <Forbidden role={user.role} what="The list of array sites" />;
  const sites = await listSites();
  const editable = can(user.role, "sites:manage");
  return (
    <>
      <PageHeader title="Array sites" lead="Where each array stands, the zenith cut its analyses start from, and how its reconstruction counts azimuth." />
      {editable ? (
        <Card title="New site" className="mb-4">
          <SiteForm />
        </Card>
      ) : null}
      {sites.map((site) => (
        <Card key={site.id} title={site.name} className="mb-4">
          {editable ? <SiteForm site={site} /> : (
            <div className="flex gap-4">
              <dl className="grid grid-cols-2 gap-x-4 text-sm">
                <dt>Latitude</dt><dd>{site.latitudeDeg}°</dd>
                <dt>Longitude</dt><dd>{site.longitudeDeg}°</dd>
                <dt>Height</dt><dd>{site.heightM} m</dd>
                <dt>Zenith cut</dt><dd>{site.zenithMaxDeg}°</dd>
              </dl>
              <SiteGlobe latitudeDeg={site.latitudeDeg} longitudeDeg={site.longitudeDeg} />
            </div>
          )}
        </Card>
      ))}
    </>
  );
}
