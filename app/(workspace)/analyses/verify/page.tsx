import type { Metadata } from "next";
import { requirePageUser } from "@/lib/auth/server";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { VerifyForm } from "@/components/analyses/verify-form";

export const metadata: Metadata = { title: "Verify a bundle" };
export const dynamic = "force-dynamic";

export default async function VerifyPage() {
  const { user, forbidden } = await requirePageUser("analyses:reproduce");
  if (forbidden) return <Forbidden role={user.role} what="Verifying reproduction bundles" />;
  return (
    <>
      <PageHeader title="Verify a reproduction bundle" lead="Check a bundle from any Siderea instance against its events CSV: the events' SHA-256 must match, and the saved settings and seed must give the saved numbers again." />
      <Card><VerifyForm /></Card>
    </>
  );
}
