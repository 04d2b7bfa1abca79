import type { Metadata } from "next";
import { requirePageUser } from "@/lib/auth/server";
import { can } from "@/lib/auth/roles";
import { listAlerts, watchedAnalysesFor } from "@/lib/services/alerts";
import { listSubscriptions } from "@/lib/services/subscriptions";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { AlertsTable } from "@/components/alerts/alerts-table";
import { SubscribeForm, SubscriptionList } from "@/components/alerts/subscriptions";

export const metadata: Metadata = { title: "Alerts" };
export const dynamic = "force-dynamic";

export default async function AlertsPage() {
  const { user, forbidden } = await requirePageUser("alerts:subscribe");
  if (forbidden) return <Forbidden role={user.role} what="Alerts" />;
  const [alerts, subscriptions, watched] = await Promise.all([listAlerts(user), listSubscriptions(user), watchedAnalysesFor(user)]);
  const subscribed = new Set(subscriptions.map((s) => s.analysisId));
  const allowAll = can(user.role, "analyses:read-published") && !subscribed.has(null);
  return (
    <>
      <PageHeader
        title="Alerts"
        lead="When a batch of new data is appended, every watched hotspot scan is rerun on the new version with the same settings and seed. A window that reaches a threshold raises an alert once; a further rise by the step raises an update."
      />
      <Caution className="mb-4" />
      <Card title="Your subscriptions" className="mb-4">
        <SubscriptionList subscriptions={subscriptions} />
        <h3 className="mt-4 mb-2 text-sm font-semibold">Subscribe</h3>
        <SubscribeForm analyses={watched.filter((a) => !subscribed.has(a.id))} allowAllPublished={allowAll} />
        <p className="mt-2 text-xs text-slate-500">
          {can(user.role, "analyses:read-published") ? "You can subscribe to the watched analyses you can read, or to every published one." : "Referees subscribe to the watched analyses shared with them."}{" "}
          Every e-mail carries a link that unsubscribes without signing in (it works once and expires).
        </p>
      </Card>
      <Card title={`Alerts (${alerts.length})`}>
        <AlertsTable alerts={alerts} />
      </Card>
    </>
  );
}
