import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Alerts" };

// This area of the workspace is not built yet; the page says so rather than pretending.
export default function AlertsPage() {
  return (
    <>
      <PageHeader title="Alerts" lead="Subscriptions to watched analyses, and the alerts raised when new data lift a cluster above a threshold." />
      <Card>
        <p className="text-slate-700" data-testid="area-not-ready">
          Alert subscriptions is not available in this version of Siderea yet. The computations behind it are
          available from the command line (<code>npm run cli -- --help</code>).
        </p>
      </Card>
    </>
  );
}
