import "server-only";
import { Op, QueryTypes } from "sequelize";
import { getDb, withRawClient } from "@/lib/db";
import { copyOutFirstRowBinary } from "./copy-out";
import { forbidden, HttpError, notFound } from "@/lib/http";
import { enqueue, QUEUES } from "@/lib/jobs/queue";
import { can } from "@/lib/auth/roles";
import { canonicalJson, sha256Hex } from "@/lib/analyses/canonical";
import type { MapLayer } from "@/lib/analyses/compute";
import { codeVersion } from "@/lib/version";
import { AnalysisSettingsSchema, type AnalysisSettings, type NewAnalysisInput } from "@/lib/validations/analysis";
import type { PublicUser } from "./users";
import { audit } from "./audit";

export const MAP_UNITS: Record<MapLayer, string> = {
  counts: "events in window",
  expected: "expected events in window",
  excess: "events (observed - expected)",
  significance: "Li-Ma sigma (local)",
  exposure: "relative exposure",
};

/** Whether the user may read the analysis: analysts all; referees those shared with them; others the published ones. */
async function mayRead(user: PublicUser, a: { id: number; publishedAt: Date | null }): Promise<boolean> {
  if (can(user.role, "analyses:run")) return true;
  if (a.publishedAt && can(user.role, "analyses:read-published")) return true;
  if (can(user.role, "analyses:read-shared")) {
    const [row] = await getDb().sequelize.query("SELECT 1 FROM analysis_shares WHERE analysis_id = :id AND user_id = :user", {
      replacements: { id: a.id, user: user.id },
      type: QueryTypes.SELECT,
    });
    return Boolean(row);
  }
  return false;
}

/** The analysis if the user may read it: 404 when it does not exist, 403 when it is not theirs to see. */
export async function readableAnalysis(user: PublicUser, id: number) {
  const a = await getDb().models.Analysis.findByPk(id);
  if (!a) throw notFound("analysis");
  if (!(await mayRead(user, a))) throw forbidden("this analysis");
  return a;
}

export async function createAnalysis(input: NewAnalysisInput, user: PublicUser) {
  const { models, sequelize } = getDb();
  const dataset = await models.Dataset.findByPk(input.settings.datasetId, { attributes: ["id", "version", "status"] });
  if (!dataset) throw new HttpError(422, "validation_failed", "The dataset does not exist.", [{ path: "settings.datasetId", message: "No such dataset." }]);
  if (dataset.status !== "ready") throw new HttpError(409, "conflict", "The dataset is still being ingested.");
  const version = input.settings.datasetVersion ?? dataset.version;
  const [v] = await sequelize.query<{ content_hash: string }>("SELECT content_hash FROM dataset_versions WHERE dataset_id = :id AND version = :version", {
    replacements: { id: dataset.id, version },
    type: QueryTypes.SELECT,
  });
  if (!v) throw new HttpError(422, "validation_failed", `The dataset has no version ${version}.`, [{ path: "settings.datasetVersion", message: "No such version." }]);
  // A coverage configuration chosen as the exposure is copied into the settings (and sets the
  // zenith cut), so the analysis stays reproducible if the configuration is edited later.
  const { coverageConfigurationId, coverage: _ignored, ...rest } = input.settings as typeof input.settings & { coverage?: unknown };
  let coverage: AnalysisSettings["coverage"];
  let zenithMaxDeg = rest.zenithMaxDeg;
  if (coverageConfigurationId !== undefined) {
    const c = await models.CoverageConfiguration.findByPk(coverageConfigurationId);
    if (!c) throw new HttpError(422, "validation_failed", "The coverage configuration does not exist.", [{ path: "settings.coverageConfigurationId", message: "No such coverage configuration." }]);
    coverage = { configurationId: c.id, name: c.name, latitudeDeg: c.latitudeDeg, zenithMaxDeg: c.zenithMaxDeg, efficiency: c.efficiency };
    zenithMaxDeg = c.zenithMaxDeg;
  }
  const settings = AnalysisSettingsSchema.parse({ ...rest, zenithMaxDeg, datasetVersion: version, ...(coverage ? { coverage } : {}) });
  const canonical = canonicalJson(settings);
  const analysis = await models.Analysis.create({
    name: input.name,
    purpose: input.purpose,
    kind: settings.kind,
    ownerId: user.id,
    datasetId: dataset.id,
    datasetVersion: version,
    datasetHash: v.content_hash,
    settings: JSON.parse(canonical),
    settingsHash: sha256Hex(canonical),
    codeVersion: codeVersion(),
    seed: String(settings.seed),
    status: "queued",
    error: null,
    summary: null,
    startedAt: null,
    finishedAt: null,
    publishedAt: null,
  });
  await audit({ actorId: user.id, action: "analysis.run", targetType: "analysis", targetId: analysis.id, details: { settingsHash: analysis.settingsHash, datasetVersion: version } });
  await enqueue(QUEUES.analysis, { analysisId: analysis.id });
  return analysis;
}

export async function cancelAnalysis(user: PublicUser, id: number): Promise<void> {
  const a = await readableAnalysis(user, id);
  if (!can(user.role, "analyses:run")) throw forbidden("cancelling analyses");
  if (!["queued", "running"].includes(a.status)) throw new HttpError(409, "conflict", `The analysis is ${a.status}; only queued or running ones can be cancelled.`);
  await getDb().sequelize.query("UPDATE analyses SET status = 'cancelled', finished_at = now() WHERE id = :id AND status IN ('queued', 'running')", { replacements: { id } });
  await audit({ actorId: user.id, action: "analysis.cancel", targetType: "analysis", targetId: id });
}

export async function analysisMap(user: PublicUser, id: number, layer: MapLayer): Promise<{ nside: number; ordering: string; coordsys: string; unit: string; data: Buffer }> {
  await readableAnalysis(user, id);
  if (!Number.isSafeInteger(id) || !Object.hasOwn(MAP_UNITS, layer)) throw notFound("map layer");
  // COPY takes no bind parameters: id is an integer and layer one of the known names (checked above).
  const fields = await withRawClient((client) =>
    copyOutFirstRowBinary(client, `SELECT nside::int4, ordering, coordsys, unit, data FROM analysis_maps WHERE analysis_id = ${id} AND layer = '${layer}'`),
  );
  if (!fields) throw notFound("map layer (is the analysis finished?)");
  const [nside, ordering, coordsys, unit, data] = fields;
  return { nside: nside!.readInt32BE(0), ordering: ordering!.toString("utf8"), coordsys: coordsys!.toString("utf8"), unit: unit!.toString("utf8"), data: data! };
}

/** Analyses the user may see, newest first (only the columns of the list). */
export async function listAnalyses(user: PublicUser) {
  const { Analysis } = getDb().models;
  const attributes = ["id", "name", "kind", "status", "progress", "datasetId", "datasetVersion", "publishedAt", "createdAt", "summary"] as const;
  if (can(user.role, "analyses:run")) return Analysis.findAll({ attributes: [...attributes], order: [["id", "DESC"]], limit: 200 });
  const shared = can(user.role, "analyses:read-shared")
    ? (await getDb().sequelize.query<{ analysis_id: number }>("SELECT analysis_id FROM analysis_shares WHERE user_id = :id", { replacements: { id: user.id }, type: QueryTypes.SELECT })).map((r) => r.analysis_id)
    : [];
  const where = can(user.role, "analyses:read-published") ? { [Op.or]: [{ publishedAt: { [Op.ne]: null } }, { id: shared }] } : { id: shared };
  return Analysis.findAll({ attributes: [...attributes], where, order: [["id", "DESC"]], limit: 200 });
}

export async function shareAnalysis(user: PublicUser, id: number, refereeEmail: string): Promise<void> {
  if (!can(user.role, "analyses:publish")) throw forbidden("sharing analyses");
  const a = await readableAnalysis(user, id);
  const referee = await getDb().models.User.findOne({ where: getDb().sequelize.where(getDb().sequelize.fn("lower", getDb().sequelize.col("email")), refereeEmail.toLowerCase()) });
  if (!referee || referee.role !== "referee") throw new HttpError(422, "validation_failed", "No referee has this e-mail address.", [{ path: "email", message: "Not a referee." }]);
  await getDb().sequelize.query("INSERT INTO analysis_shares (analysis_id, user_id, shared_by, created_at) VALUES (:a, :u, :by, now()) ON CONFLICT DO NOTHING", {
    replacements: { a: a.id, u: referee.id, by: user.id },
  });
  await audit({ actorId: user.id, action: "analysis.share", targetType: "analysis", targetId: id, details: { referee: referee.email } });
}

export async function publishAnalysis(user: PublicUser, id: number): Promise<void> {
  if (!can(user.role, "analyses:publish")) throw forbidden("publishing analyses");
  const a = await readableAnalysis(user, id);
  if (a.status !== "done") throw new HttpError(409, "conflict", "Only a finished analysis can be published.");
  if (a.publishedAt) throw new HttpError(409, "conflict", "The analysis is already published; its settings are frozen.");
  await a.update({ publishedAt: new Date() });
  await audit({ actorId: user.id, action: "analysis.publish", targetType: "analysis", targetId: id });
}

/** Starts a reproduction (referee, analyst): the same settings on the same dataset version. */
export async function requestReproduction(user: PublicUser, id: number): Promise<number> {
  if (!can(user.role, "analyses:reproduce")) throw forbidden("reproducing analyses");
  const a = await readableAnalysis(user, id);
  if (a.status !== "done") throw new HttpError(409, "conflict", "Only a finished analysis can be reproduced.");
  const [row] = await getDb().sequelize.query<{ id: number }>(
    "INSERT INTO analysis_reproductions (analysis_id, requested_by, status, created_at) VALUES (:a, :u, 'queued', now()) RETURNING id",
    { replacements: { a: id, u: user.id }, type: QueryTypes.SELECT },
  );
  await audit({ actorId: user.id, action: "analysis.reproduce", targetType: "analysis", targetId: id, details: { reproduction: row!.id } });
  await enqueue(QUEUES.reproduction, { reproductionId: row!.id });
  return row!.id;
}

/** Numbers that a reproduction must match: the saved summary without its timings. */
export function headline(summary: Record<string, unknown> | null): Record<string, unknown> {
  const { timings, ...rest } = summary ?? {};
  void timings;
  return rest;
}

export async function listReproductions(analysisId: number) {
  return getDb().sequelize.query<{ id: number; status: string; comparison: { match: boolean; differences: unknown[]; tolerance: string } | null; created_at: Date; finished_at: Date | null; code_version: string | null; error: string | null; requested_by_name: string | null }>(
    `SELECT r.id, r.status, r.comparison, r.created_at, r.finished_at, r.code_version, r.error, u.name AS requested_by_name
       FROM analysis_reproductions r LEFT JOIN users u ON u.id = r.requested_by WHERE r.analysis_id = :id ORDER BY r.id DESC`,
    { replacements: { id: analysisId }, type: QueryTypes.SELECT },
  );
}

/** The reproduction bundle: settings, hashes, code version, seed and headline results. */
export async function reproductionBundle(user: PublicUser, id: number) {
  const a = await readableAnalysis(user, id);
  if (a.status !== "done") throw new HttpError(409, "conflict", "Only a finished analysis has a bundle.");
  const [site] = await getDb().sequelize.query<{ name: string; latitude_deg: number; longitude_deg: number; height_m: number; blinded: boolean; unblinded_at: Date | null }>(
    "SELECT s.name, s.latitude_deg, s.longitude_deg, s.height_m, d.blinded, d.unblinded_at FROM datasets d JOIN sites s ON s.id = d.site_id WHERE d.id = :id",
    { replacements: { id: a.datasetId }, type: QueryTypes.SELECT },
  );
  return {
    format: "siderea-reproduction-bundle",
    formatVersion: 1,
    analysis: { id: a.id, name: a.name, kind: a.kind },
    settings: a.settings,
    settingsHash: a.settingsHash,
    dataset: { id: a.datasetId, version: a.datasetVersion, contentHash: a.datasetHash, blindedWhenRun: Boolean((a.summary as { blinded?: boolean } | null)?.blinded) },
    site: site ? { name: site.name, latitudeDeg: site.latitude_deg, longitudeDeg: site.longitude_deg, heightM: site.height_m } : null,
    codeVersion: a.codeVersion,
    seed: Number(a.seed),
    headline: headline(a.summary),
  };
}
