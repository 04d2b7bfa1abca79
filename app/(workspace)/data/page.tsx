import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Data" };

// This area of the workspace is not built yet; the page says so rather than pretending.
export default function DataPage() {
  return (
    <>
      <PageHeader title="Data" lead="Event lists of each array site: upload, validate, convert and version them." />
      <Card>
        <p className="text-slate-700" data-testid="area-not-ready">
          Uploading and browsing event lists is not available in this version of Siderea yet. The computations behind it are
          available from the command line (<code>npm run cli -- --help</code>).
        </p>
      </Card>
    </>
  );
}
