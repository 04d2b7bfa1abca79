import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Coverage" };

// This area of the workspace is not built yet; the page says so rather than pretending.
export default function CoveragePage() {
  return (
    <>
      <PageHeader title="Coverage" lead="Which part of the sky a site and zenith cut see, and how well." />
      <Card>
        <p className="text-slate-700" data-testid="area-not-ready">
          The coverage planner is not available in this version of Siderea yet. The computations behind it are
          available from the command line (<code>npm run cli -- --help</code>).
        </p>
      </Card>
    </>
  );
}
