import { POST as createDatasetRoute } from "@/app/api/datasets/route";
import { getDb } from "@/lib/db";
import { DEMO_SITE, generateDemoCsv } from "@/lib/demo/generate";
import { runIngest } from "@/lib/services/ingest";
import { requestAs } from "./auth-helpers";

/**
 * Creates a site at the demo array's position and stores a generated demo CSV as a new
 * dataset through the real upload route and ingestion; returns the dataset and site ids.
 */
export async function ingestDemoDataset(ownerId: number, name: string, csv: Parameters<typeof generateDemoCsv>[0]): Promise<{ datasetId: number; siteId: number }> {
  const site = await getDb().models.Site.create({ name: `${name} array`, ...DEMO_SITE, azimuthConvention: "north-clockwise", areaKm2: null, notes: "", createdBy: ownerId });
  const response = await createDatasetRoute(await requestAs(ownerId, `/api/datasets?name=${encodeURIComponent(name)}&siteId=${site.id}`, { method: "POST", body: generateDemoCsv(csv), duplex: "half" } as RequestInit));
  const { job } = await response.json();
  const outcome = await runIngest(job.id);
  if (outcome.status !== "done") throw new Error(`ingest of ${name} failed: ${JSON.stringify(outcome)}`);
  return { datasetId: outcome.datasetId, siteId: site.id };
}
