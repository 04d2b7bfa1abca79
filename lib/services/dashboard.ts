import "server-only";
import { Op } from "sequelize";
import { getDb } from "@/lib/db";

export interface DashboardSummary {
  sites: { id: number; name: string; latitudeDeg: number; longitudeDeg: number; heightM: number; zenithMaxDeg: number }[];
  datasetCount: number;
  analysisCount: number;
  publishedCount: number;
}

/** Counts and the site list for the dashboard (only the columns shown). */
export async function dashboardSummary(): Promise<DashboardSummary> {
  const { Site, Dataset, Analysis } = getDb().models;
  const [sites, datasetCount, analysisCount, publishedCount] = await Promise.all([
    Site.findAll({ attributes: ["id", "name", "latitudeDeg", "longitudeDeg", "heightM", "zenithMaxDeg"], order: [["name", "ASC"]] }),
    Dataset.count(),
    Analysis.count(),
    Analysis.count({ where: { publishedAt: { [Op.ne]: null } } }),
  ]);
  return {
    sites: sites.map((s) => ({ id: s.id, name: s.name, latitudeDeg: s.latitudeDeg, longitudeDeg: s.longitudeDeg, heightM: s.heightM, zenithMaxDeg: s.zenithMaxDeg })),
    datasetCount,
    analysisCount,
    publishedCount,
  };
}
