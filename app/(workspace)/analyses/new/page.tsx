import type { Metadata } from "next";
import { randomInt } from "node:crypto";
import { requirePageUser } from "@/lib/auth/server";
import { listDatasets } from "@/lib/services/datasets";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { NewAnalysisForm } from "@/components/analyses/new-analysis-form";

export const metadata: Metadata = { title: "New analysis" };
export const dynamic = "force-dynamic";

export default async function NewAnalysisPage({ searchParams }: { searchParams: Promise<{ datasetId?: string }> }) {
  const { user, forbidden } = await requirePageUser("analyses:run");
  if (forbidden) return <Forbidden role={user.role} what="Starting analyses" />;
  const { rows } = await listDatasets({ q: "", sort: "createdAt", dir: "desc", page: 1, pageSize: 100 });
  const ready = rows.filter((d) => d.status === "ready");
  const { datasetId } = await searchParams;
  return (
    <>
      <PageHeader title="New analysis" lead="Choose the data and the search. The settings, the dataset version and its hash, the code version and the seed are saved with the result." />
      <Card>
        <NewAnalysisForm datasets={ready.map((d) => ({ id: d.id, name: d.name, version: d.version, eventCount: d.eventCount }))} defaultSeed={randomInt(1, 2 ** 31 - 1)} initialDatasetId={Number(datasetId) || undefined} />
      </Card>
    </>
  );
}
