import "server-only";
import { getDb } from "@/lib/db";
import { listReproductions, readableAnalysis } from "./analyses";
import type { PublicUser } from "./users";

/** Everything the analysis page and GET /api/analyses/:id show. */
export async function analysisDetail(user: PublicUser, id: number) {
  const a = await readableAnalysis(user, id);
  const { AuditEntry, User, Dataset, Site } = getDb().models;
  const [dataset, audit, reproductions, owner] = await Promise.all([
    Dataset.findByPk(a.datasetId, { attributes: ["id", "name", "siteId"] }),
    AuditEntry.findAll({ where: { targetType: "analysis", targetId: String(id) }, order: [["id", "ASC"]], include: [{ model: User, as: "actor", attributes: ["name"] }] }),
    listReproductions(id),
    a.ownerId ? User.findByPk(a.ownerId, { attributes: ["name"] }) : null,
  ]);
  return {
    id: a.id,
    name: a.name,
    purpose: a.purpose,
    kind: a.kind,
    status: a.status,
    progress: a.progress,
    error: a.error,
    owner: owner?.name ?? null,
    dataset: { id: a.datasetId, name: dataset?.name ?? "", version: a.datasetVersion, contentHash: a.datasetHash },
    site: dataset ? await Site.findByPk(dataset.siteId, { attributes: ["name", "latitudeDeg", "longitudeDeg"] }).then((s) => (s ? { name: s.name, latitudeDeg: s.latitudeDeg, longitudeDeg: s.longitudeDeg } : null)) : null,
    settings: a.settings,
    settingsHash: a.settingsHash,
    codeVersion: a.codeVersion,
    seed: Number(a.seed),
    summary: a.summary,
    createdAt: a.createdAt.toISOString(),
    startedAt: a.startedAt?.toISOString() ?? null,
    finishedAt: a.finishedAt?.toISOString() ?? null,
    publishedAt: a.publishedAt?.toISOString() ?? null,
    audit: audit.map((e) => ({ at: e.createdAt.toISOString(), actor: e.actor?.name ?? "system", action: e.action, details: e.details })),
    reproductions: reproductions.map((r) => ({
      id: r.id, status: r.status, comparison: r.comparison, requestedBy: r.requested_by_name, codeVersion: r.code_version, error: r.error,
      createdAt: new Date(r.created_at).toISOString(), finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
    })),
  };
}
export type AnalysisDetail = Awaited<ReturnType<typeof analysisDetail>>;
