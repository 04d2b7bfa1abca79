import "server-only";
import { Op, QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { forbidden, HttpError, notFound } from "@/lib/http";
import { enqueue, QUEUES } from "@/lib/jobs/queue";
import { can } from "@/lib/auth/roles";
import { canonicalJson, compareSummaries, sha256Hex } from "@/lib/analyses/canonical";
import { computeHotspot, computeLargeScale, type ComputeResult, type MapLayer } from "@/lib/analyses/compute";
import { codeVersion } from "@/lib/version";
import { AnalysisSettingsSchema, type AnalysisSettings, type NewAnalysisInput } from "@/lib/validations/analysis";
import type { PublicUser } from "./users";
import { audit } from "./audit";
import { loadDatasetEvents } from "./event-arrays";

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
  const settings = AnalysisSettingsSchema.parse({ ...input.settings, datasetVersion: version });
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

/** Runs the computation of a settings object on its dataset version, checking the data's hash. */
export async function computeForSettings(settings: AnalysisSettings, expectedHash: string, opts: Parameters<typeof computeHotspot>[3] = {}): Promise<ComputeResult & { blinded: boolean }> {
  const loaded = await loadDatasetEvents(settings.datasetId, settings.datasetVersion);
  if (loaded.contentHash !== expectedHash) {
    throw new Error(`the stored events of dataset ${settings.datasetId} version ${settings.datasetVersion} no longer match their hash (${loaded.contentHash} != ${expectedHash})`);
  }
  const result = settings.kind === "hotspot" ? await computeHotspot(loaded.events, loaded.site, settings, opts) : await computeLargeScale(loaded.events, loaded.site, settings, opts);
  return { ...result, summary: { ...result.summary, blinded: loaded.blinded, datasetHash: loaded.contentHash }, blinded: loaded.blinded };
}

/** The analysis job: computes, stores summary and maps; cancellable between progress steps. */
export async function runAnalysisJob(analysisId: number): Promise<void> {
  const { models, sequelize } = getDb();
  const analysis = await models.Analysis.findByPk(analysisId);
  if (!analysis || analysis.status === "done" || analysis.status === "cancelled") return;
  const started = new Date();
  await analysis.update({ status: "running", startedAt: started, progress: 0, error: null });
  const controller = new AbortController();
  let lastWrite = 0;
  const poll = setInterval(async () => {
    const [row] = await sequelize.query<{ status: string }>("SELECT status FROM analyses WHERE id = :id", { replacements: { id: analysisId }, type: QueryTypes.SELECT });
    if (row?.status === "cancelled") controller.abort();
  }, 1000);
  try {
    const settings = AnalysisSettingsSchema.parse(analysis.settings);
    const result = await computeForSettings(settings, analysis.datasetHash, {
      signal: controller.signal,
      onProgress: (fraction) => {
        const now = Date.now();
        if (now - lastWrite > 500) {
          lastWrite = now;
          void sequelize.query("UPDATE analyses SET progress = :p WHERE id = :id AND status = 'running'", { replacements: { p: fraction, id: analysisId } });
        }
      },
    });
    await sequelize.transaction(async (t) => {
      await sequelize.query("DELETE FROM analysis_maps WHERE analysis_id = :id", { replacements: { id: analysisId }, transaction: t });
      for (const [layer, values] of Object.entries(result.maps) as [MapLayer, Float32Array][]) {
        await sequelize.query("INSERT INTO analysis_maps (analysis_id, layer, nside, ordering, coordsys, unit, data) VALUES ($1, $2, $3, 'RING', 'C', $4, $5)", {
          bind: [analysisId, layer, result.nside, MAP_UNITS[layer], Buffer.from(values.buffer, values.byteOffset, values.byteLength)],
          transaction: t,
        });
      }
      const finished = new Date();
      await sequelize.query(
        "UPDATE analyses SET status = 'done', progress = 1, summary = :summary, finished_at = :finished, updated_at = now() WHERE id = :id AND status = 'running'",
        { replacements: { id: analysisId, summary: JSON.stringify({ ...result.summary, timings: { seconds: (finished.getTime() - started.getTime()) / 1000 } }), finished }, transaction: t },
      );
    });
  } catch (error) {
    if ((error as Error).name === "AbortError" || controller.signal.aborted) {
      await sequelize.query("UPDATE analyses SET status = 'cancelled', finished_at = now() WHERE id = :id", { replacements: { id: analysisId } });
      return;
    }
    await sequelize.query("UPDATE analyses SET status = 'failed', error = :error, finished_at = now() WHERE id = :id", {
      replacements: { id: analysisId, error: (error as Error).message.slice(0, 2000) },
    });
    throw error;
  } finally {
    clearInterval(poll);
  }
}

export async function cancelAnalysis(user: PublicUser, id: number): Promise<void> {
  const a = await readableAnalysis(user, id);
  if (!can(user.role, "analyses:run")) throw forbidden("cancelling analyses");
  if (!["queued", "running"].includes(a.status)) throw new HttpError(409, "conflict", `The analysis is ${a.status}; only queued or running ones can be cancelled.`);
  await getDb().sequelize.query("UPDATE analyses SET status = 'cancelled', finished_at = now() WHERE id = :id AND status IN ('queued', 'running')", { replacements: { id } });
  await audit({ actorId: user.id, action: "analysis.cancel", targetType: "analysis", targetId: id });
}

export async function analysisMap(user: PublicUser, id: number, layer: MapLayer) {
  await readableAnalysis(user, id);
  const [row] = await getDb().sequelize.query<{ nside: number; ordering: string; coordsys: string; unit: string; data: Buffer }>(
    "SELECT nside, ordering, coordsys, unit, data FROM analysis_maps WHERE analysis_id = $1 AND layer = $2",
    { bind: [id, layer], type: QueryTypes.SELECT },
  );
  if (!row) throw notFound("map layer (is the analysis finished?)");
  return row;
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

export async function runReproductionJob(reproductionId: number): Promise<void> {
  const { sequelize, models } = getDb();
  const [r] = await sequelize.query<{ analysis_id: number; status: string }>("SELECT analysis_id, status FROM analysis_reproductions WHERE id = :id", {
    replacements: { id: reproductionId },
    type: QueryTypes.SELECT,
  });
  if (!r || r.status === "done") return;
  await sequelize.query("UPDATE analysis_reproductions SET status = 'running' WHERE id = :id", { replacements: { id: reproductionId } });
  try {
    const a = await models.Analysis.findByPk(r.analysis_id);
    if (!a) throw new Error("the analysis no longer exists");
    const settings = AnalysisSettingsSchema.parse(a.settings);
    const result = await computeForSettings(settings, a.datasetHash);
    // Compared as stored: through JSON, as the saved summary was.
    const differences = compareSummaries(headline(a.summary), headline(JSON.parse(JSON.stringify(result.summary))));
    await sequelize.query(
      "UPDATE analysis_reproductions SET status = 'done', summary = :summary, comparison = :comparison, code_version = :code, finished_at = now() WHERE id = :id",
      {
        replacements: {
          id: reproductionId,
          summary: JSON.stringify(result.summary),
          comparison: JSON.stringify({ match: differences.length === 0, tolerance: "identical strings; numbers within 1e-9 relative", differences: differences.slice(0, 50) }),
          code: codeVersion(),
        },
      },
    );
  } catch (error) {
    await sequelize.query("UPDATE analysis_reproductions SET status = 'failed', error = :e, finished_at = now() WHERE id = :id", {
      replacements: { id: reproductionId, e: (error as Error).message.slice(0, 2000) },
    });
    throw error;
  }
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
  return {
    format: "siderea-reproduction-bundle",
    formatVersion: 1,
    analysis: { id: a.id, name: a.name, kind: a.kind },
    settings: a.settings,
    settingsHash: a.settingsHash,
    dataset: { id: a.datasetId, version: a.datasetVersion, contentHash: a.datasetHash },
    codeVersion: a.codeVersion,
    seed: Number(a.seed),
    headline: headline(a.summary),
  };
}
