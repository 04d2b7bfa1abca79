import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Analyses" };

// This area of the workspace is not built yet; the page says so rather than pretending.
export default function AnalysesPage() {
  return (
    <>
      <PageHeader title="Analyses" lead="Hotspot scans with Li-Ma significances and trials, and large-scale dipole fits, saved and reproducible." />
      <Card>
        <p className="text-slate-700" data-testid="area-not-ready">
          Running and reading analyses is not available in this version of Siderea yet. The computations behind it are
          available from the command line (<code>npm run cli -- --help</code>).
        </p>
      </Card>
    </>
  );
}
