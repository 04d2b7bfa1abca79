import type { Metadata } from "next";
import { requirePageUser } from "@/lib/auth/server";
import { canSaveCoverage } from "@/lib/coverage/access";
import { listCoverageConfigurations } from "@/lib/services/coverage";
import { PageHeader } from "@/components/ui/page-header";
import { CoveragePlanner } from "@/components/coverage/coverage-planner";

export const metadata: Metadata = { title: "Coverage" };
export const dynamic = "force-dynamic";

// Any signed-in role may plan coverage: the planner shows no data. Saving is for analysts and admins.
export default async function CoveragePage() {
  const { user } = await requirePageUser();
  const saved = await listCoverageConfigurations();
  return (
    <>
      <PageHeader title="Coverage" lead="What a site and a zenith cut see of the sky: exposure against declination, maps, the band covered and the visibility of chosen directions, recomputed as you type." />
      <CoveragePlanner saved={saved.map((s) => ({ id: s.id, name: s.name, notes: s.notes, latitudeDeg: s.latitudeDeg, zenithMaxDeg: s.zenithMaxDeg, areaKm2: s.areaKm2, liveTimeYr: s.liveTimeYr, efficiency: s.efficiency }))} canSave={canSaveCoverage(user.role)} />
    </>
  );
}
