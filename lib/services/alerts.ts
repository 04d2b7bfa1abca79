import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { forbidden, HttpError } from "@/lib/http";
import { enqueue, QUEUES } from "@/lib/jobs/queue";
import { can } from "@/lib/auth/roles";
import { canonicalJson, sha256Hex } from "@/lib/analyses/canonical";
import { AnalysisSettingsSchema } from "@/lib/validations/analysis";
import type { WatchInput } from "@/lib/validations/alerts";
import { alertFiguresFromRow, type AlertFigures } from "@/lib/alerts/figures";
import { readableAnalysis } from "./analyses";
import { audit } from "./audit";
import type { PublicUser } from "./users";

/**
 * Watched analyses and their alerts (the web side: watching, listing, and the hook after an
 * append). The reruns and the alert rule run in the worker (alerts-jobs.ts).
 *
 * Seed policy of a rerun: the SAME seed as the watched analysis, so that a rerun differs from
 * the previous run only by the new events (the isotropic skies of the trials are the same
 * sequence of random numbers), and each rerun is itself reproducible from its saved settings.
 */

/** Marks an analysis watched (or not): analysts only; a finished hotspot scan only. */
export async function setWatch(user: PublicUser, analysisId: number, input: WatchInput) {
  if (!can(user.role, "analyses:run")) throw forbidden("watching analyses");
  const a = await readableAnalysis(user, analysisId);
  const { sequelize } = getDb();
  const [chained] = await sequelize.query<{ watched_analysis_id: number }>("SELECT watched_analysis_id FROM watch_runs WHERE run_analysis_id = :id", { replacements: { id: analysisId }, type: QueryTypes.SELECT });
  if (chained) throw new HttpError(409, "conflict", `This is a rerun of the watched analysis ${chained.watched_analysis_id}; watch that one.`);
  if (input.watched) {
    if (a.kind !== "hotspot") throw new HttpError(409, "conflict", "Only hotspot scans can be watched: alerts are about windows above a threshold.");
    if (a.status !== "done") throw new HttpError(409, "conflict", "Only a finished analysis can be watched: its result is the baseline the reruns are compared with.");
  }
  await sequelize.transaction(async (t) => {
    await sequelize.query("UPDATE analyses SET watched = :w, updated_at = now() WHERE id = :id", { replacements: { w: input.watched, id: analysisId }, transaction: t });
    if (input.watched) {
      await sequelize.query(
        `INSERT INTO analysis_watches (analysis_id, dedup_radius_deg, update_step_sigma, started_by, started_at, stopped_at) VALUES (:id, :r, :s, :u, now(), NULL)
         ON CONFLICT (analysis_id) DO UPDATE SET dedup_radius_deg = :r, update_step_sigma = :s, stopped_at = NULL`,
        { replacements: { id: analysisId, r: input.dedupRadiusDeg, s: input.updateStepSigma, u: user.id }, transaction: t },
      );
    } else {
      await sequelize.query("UPDATE analysis_watches SET stopped_at = now() WHERE analysis_id = :id", { replacements: { id: analysisId }, transaction: t });
    }
  });
  await audit({ actorId: user.id, action: input.watched ? "analysis.watch" : "analysis.unwatch", targetType: "analysis", targetId: analysisId, details: input.watched ? { dedupRadiusDeg: input.dedupRadiusDeg, updateStepSigma: input.updateStepSigma } : {} });
  return watchInfo(user, analysisId);
}

/** The watch of an analysis as its page shows it: settings, the chain of reruns, its alerts, and the viewer's subscription. */
export async function watchInfo(user: PublicUser, analysisId: number) {
  const a = await readableAnalysis(user, analysisId);
  const { sequelize } = getDb();
  const [chained] = await sequelize.query<{ watched_analysis_id: number; name: string }>(
    "SELECT w.watched_analysis_id, a.name FROM watch_runs w JOIN analyses a ON a.id = w.watched_analysis_id WHERE w.run_analysis_id = :id",
    { replacements: { id: analysisId }, type: QueryTypes.SELECT },
  );
  const rootId = chained?.watched_analysis_id ?? analysisId;
  const [watch] = await sequelize.query<{ dedup_radius_deg: number | null; update_step_sigma: number; started_at: Date; stopped_at: Date | null }>(
    "SELECT dedup_radius_deg, update_step_sigma, started_at, stopped_at FROM analysis_watches WHERE analysis_id = :id",
    { replacements: { id: rootId }, type: QueryTypes.SELECT },
  );
  const runs = await sequelize.query<{ id: number; run_analysis_id: number; previous_analysis_id: number | null; dataset_version: number; status: string; error: string | null; comparison: Record<string, unknown> | null; created_at: Date; run_status: string }>(
    `SELECT w.id, w.run_analysis_id, w.previous_analysis_id, w.dataset_version, w.status, w.error, w.comparison, w.created_at, a.status AS run_status
       FROM watch_runs w JOIN analyses a ON a.id = w.run_analysis_id WHERE w.watched_analysis_id = :id ORDER BY w.dataset_version`,
    { replacements: { id: rootId }, type: QueryTypes.SELECT },
  );
  const [subscription] = await sequelize.query<{ id: number; analysis_id: number | null; local_sigma_threshold: number; post_trial_sigma_threshold: number | null; delivery: string; paused: boolean }>(
    "SELECT id, analysis_id, local_sigma_threshold, post_trial_sigma_threshold, delivery, paused FROM subscriptions WHERE user_id = :u AND analysis_id = :id",
    { replacements: { u: user.id, id: rootId }, type: QueryTypes.SELECT },
  );
  const root = rootId === analysisId ? a : await getDb().models.Analysis.findByPk(rootId, { attributes: ["id", "watched", "name"] });
  return {
    analysisId,
    rootId,
    rootName: chained?.name ?? a.name,
    isRerun: Boolean(chained),
    watched: Boolean(root?.watched),
    dedupRadiusDeg: watch?.dedup_radius_deg ?? null,
    updateStepSigma: watch?.update_step_sigma ?? 1,
    since: watch && !watch.stopped_at ? new Date(watch.started_at).toISOString() : null,
    runs: runs.map((r) => ({
      id: r.id, runAnalysisId: r.run_analysis_id, previousAnalysisId: r.previous_analysis_id, datasetVersion: r.dataset_version, status: r.status, runStatus: r.run_status,
      error: r.error, comparison: r.comparison, createdAt: new Date(r.created_at).toISOString(),
    })),
    subscription: subscription
      ? { id: subscription.id, localSigmaThreshold: subscription.local_sigma_threshold, postTrialSigmaThreshold: subscription.post_trial_sigma_threshold, delivery: subscription.delivery, paused: subscription.paused }
      : null,
  };
}
export type WatchInfo = Awaited<ReturnType<typeof watchInfo>>;

/** An alert's figures as the alerts page lists them. */
export interface AlertListRow extends AlertFigures {
  parentAlertId: number | null;
  analysisName: string;
  datasetId: number;
  createdAt: string;
}

/** Alerts of the analyses the user may read (analysts all; members published; referees shared), newest first. */
export async function listAlerts(user: PublicUser, options: { analysisId?: number; limit?: number } = {}): Promise<AlertListRow[]> {
  const conditions: string[] = [];
  if (!can(user.role, "analyses:run")) {
    const visible: string[] = [];
    if (can(user.role, "analyses:read-published")) visible.push("a.published_at IS NOT NULL");
    if (can(user.role, "analyses:read-shared")) visible.push("EXISTS (SELECT 1 FROM analysis_shares s WHERE s.analysis_id = a.id AND s.user_id = :u)");
    conditions.push(visible.length ? `(${visible.join(" OR ")})` : "false");
  }
  if (options.analysisId) conditions.push("al.watched_analysis_id = :aid");
  const rows = await getDb().sequelize.query<Record<string, unknown>>(
    `SELECT al.*, a.name AS analysis_name FROM alerts al JOIN analyses a ON a.id = al.watched_analysis_id
      ${conditions.length ? `WHERE ${conditions.join(" AND ")}` : ""} ORDER BY al.id DESC LIMIT :limit`,
    { replacements: { u: user.id, aid: options.analysisId ?? null, limit: options.limit ?? 200 }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    ...alertFiguresFromRow(r),
    parentAlertId: r.parent_alert_id as number | null, analysisName: r.analysis_name as string, datasetId: r.dataset_id as number,
    createdAt: new Date(r.created_at as string).toISOString(),
  }));
}

/** Watched analyses the user may subscribe to (for the subscription form). */
export async function watchedAnalysesFor(user: PublicUser): Promise<{ id: number; name: string; published: boolean }[]> {
  const visible: string[] = ["a.watched"];
  if (!can(user.role, "analyses:run")) {
    const or: string[] = [];
    if (can(user.role, "analyses:read-published")) or.push("a.published_at IS NOT NULL");
    if (can(user.role, "analyses:read-shared")) or.push("EXISTS (SELECT 1 FROM analysis_shares s WHERE s.analysis_id = a.id AND s.user_id = :u)");
    visible.push(or.length ? `(${or.join(" OR ")})` : "false");
  }
  const rows = await getDb().sequelize.query<{ id: number; name: string; published_at: Date | null }>(
    `SELECT a.id, a.name, a.published_at FROM analyses a WHERE ${visible.join(" AND ")} ORDER BY a.id DESC LIMIT 200`,
    { replacements: { u: user.id }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, name: r.name, published: r.published_at !== null }));
}

/**
 * The hook of an append, called after its transaction committed: queues the creation of the
 * reruns of the dataset's watched analyses. Never throws and never waits on mail or on the
 * reruns; if the queue cannot be reached, the worker's sweep creates them later.
 */
export async function requestWatchedReruns(datasetId: number, version: number): Promise<void> {
  try {
    await enqueue(QUEUES.watchSchedule, { datasetId, version });
  } catch (error) {
    console.error(`could not queue the reruns of watched analyses of dataset ${datasetId} v${version} (the worker's sweep will): ${(error as Error).message}`);
  }
}

/**
 * Creates the rerun of every watched analysis whose dataset has a newer version than its
 * latest run: a new analysis row with the same settings except the dataset version, the same
 * seed, visible to whoever could see the watched analysis (published with it, shared with the
 * same referees), chained to the previous run. Idempotent (one rerun per analysis and version).
 * Returns the watch-run ids created.
 */
export async function scheduleWatchedReruns(datasetId?: number): Promise<number[]> {
  const { sequelize } = getDb();
  const roots = await sequelize.query<{ id: number; dataset_id: number; latest: number }>(
    `SELECT a.id, a.dataset_id, d.version AS latest FROM analyses a JOIN datasets d ON d.id = a.dataset_id
      WHERE a.watched AND a.kind = 'hotspot' AND a.status = 'done' AND d.status = 'ready' ${datasetId ? "AND a.dataset_id = :ds" : ""}
        AND d.version > GREATEST(a.dataset_version, COALESCE((SELECT max(w.dataset_version) FROM watch_runs w WHERE w.watched_analysis_id = a.id), 0))`,
    { replacements: { ds: datasetId ?? null }, type: QueryTypes.SELECT },
  );
  const created: number[] = [];
  for (const r of roots) {
    const id = await sequelize.transaction(async (t) => {
      await sequelize.query("SELECT pg_advisory_xact_lock(hashtext(:k))", { replacements: { k: `siderea-watch:${r.id}` }, transaction: t });
      const [exists] = await sequelize.query("SELECT 1 FROM watch_runs WHERE watched_analysis_id = :a AND dataset_version = :v", { replacements: { a: r.id, v: r.latest }, type: QueryTypes.SELECT, transaction: t });
      if (exists) return null;
      const root = await getDb().models.Analysis.findByPk(r.id, { transaction: t });
      if (!root) return null;
      const [v] = await sequelize.query<{ content_hash: string }>("SELECT content_hash FROM dataset_versions WHERE dataset_id = :d AND version = :v", { replacements: { d: r.dataset_id, v: r.latest }, type: QueryTypes.SELECT, transaction: t });
      if (!v) return null;
      const [previous] = await sequelize.query<{ run_analysis_id: number }>(
        "SELECT run_analysis_id FROM watch_runs WHERE watched_analysis_id = :a AND status = 'evaluated' ORDER BY dataset_version DESC LIMIT 1",
        { replacements: { a: r.id }, type: QueryTypes.SELECT, transaction: t },
      );
      const settings = AnalysisSettingsSchema.parse({ ...root.settings, datasetVersion: r.latest });
      const canonical = canonicalJson(settings);
      const run = await getDb().models.Analysis.create(
        {
          name: `${root.name} · rerun on v${r.latest}`.slice(0, 160),
          purpose: `Rerun of the watched analysis ${root.id} on version ${r.latest} of its dataset (same settings and seed).`,
          kind: root.kind,
          ownerId: root.ownerId,
          datasetId: root.datasetId,
          datasetVersion: r.latest,
          datasetHash: v.content_hash,
          settings: JSON.parse(canonical),
          settingsHash: sha256Hex(canonical),
          codeVersion: root.codeVersion,
          seed: root.seed,
          status: "queued",
          error: null,
          summary: null,
          startedAt: null,
          finishedAt: null,
          publishedAt: root.publishedAt ? new Date() : null,
        },
        { transaction: t },
      );
      await sequelize.query("INSERT INTO analysis_shares (analysis_id, user_id, shared_by, created_at) SELECT :run, user_id, shared_by, now() FROM analysis_shares WHERE analysis_id = :root", {
        replacements: { run: run.id, root: root.id }, transaction: t,
      });
      const [w] = await sequelize.query<{ id: number }>(
        "INSERT INTO watch_runs (watched_analysis_id, run_analysis_id, previous_analysis_id, dataset_version, status, created_at) VALUES (:a, :run, :prev, :v, 'queued', now()) RETURNING id",
        { replacements: { a: root.id, run: run.id, prev: previous?.run_analysis_id ?? root.id, v: r.latest }, type: QueryTypes.SELECT, transaction: t },
      );
      return w!.id;
    });
    if (id !== null) {
      created.push(id);
      await audit({ actorId: null, action: "analysis.watch-rerun", targetType: "analysis", targetId: r.id, details: { watchRun: id, datasetVersion: r.latest } });
      await enqueue(QUEUES.watchRun, { watchRunId: id });
    }
  }
  return created;
}
