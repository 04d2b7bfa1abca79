import type { Metadata } from "next";
import { requirePageUser } from "@/lib/auth/server";
import { listSites } from "@/lib/services/sites";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { UploadForm } from "@/components/datasets/upload-form";

export const metadata: Metadata = { title: "Upload events" };
export const dynamic = "force-dynamic";

export default async function UploadPage() {
  const { user, forbidden } = await requirePageUser("datasets:upload");
  if (forbidden) return <Forbidden role={user.role} what="Uploading data" />;
  const sites = await listSites();
  return (
    <>
      <PageHeader title="Upload an event list" lead="The file is streamed to the server, validated row by row, converted to sky coordinates and stored as version 1 of a new dataset." />
      <Card>
        <UploadForm sites={sites.map((s) => ({ id: s.id, name: s.name, azimuthConvention: s.azimuthConvention }))} />
      </Card>
    </>
  );
}
