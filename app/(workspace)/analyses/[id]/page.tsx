import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { HttpError } from "@/lib/http";
import { analysisDetail } from "@/lib/services/analysis-detail";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { AnalysisView } from "@/components/analyses/analysis-view";
import { WatchPanel } from "@/components/alerts/watch-panel";

export const metadata: Metadata = { title: "Analysis" };
export const dynamic = "force-dynamic";

export default async function AnalysisPage({ params }: { params: Promise<{ id: string }> }) {
  const { user } = await requirePageUser();
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  let detail;
  try {
    detail = await analysisDetail(user, id);
  } catch (e) {
    if (e instanceof HttpError && e.status === 404) notFound();
    if (e instanceof HttpError && e.status === 403) return <Forbidden role={user.role} what="This analysis" />;
    throw e;
  }
  return (
    <>
      <PageHeader title={detail.name} lead={`${detail.kind === "hotspot" ? "Hotspot scan" : "Large-scale analysis"} of ${detail.dataset.name} v${detail.dataset.version}${detail.purpose ? ` — ${detail.purpose}` : ""}`} />
      <AnalysisView initial={JSON.parse(JSON.stringify(detail))} canRun={can(user.role, "analyses:run")} canReproduce={can(user.role, "analyses:reproduce")} canPublish={can(user.role, "analyses:publish")} />
      {detail.kind === "hotspot" ? <WatchPanel analysisId={detail.id} status={detail.status} canWatch={can(user.role, "analyses:run")} canSubscribe={can(user.role, "alerts:subscribe")} /> : null}
    </>
  );
}
