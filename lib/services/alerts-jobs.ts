import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { getDb } from "@/lib/db";
import { enqueue, QUEUES } from "@/lib/jobs/queue";
import { can } from "@/lib/auth/roles";
import { DEFAULT_LOCAL_SIGMA_THRESHOLD, decideAlerts, meetsThresholds, previousWindowNear, type RuleWindow } from "@/lib/alerts/rule";
import { queryDiscCentres } from "@/lib/sky/healpix";
import { runAnalysisJob } from "./analysis-jobs";
import { scheduleWatchedReruns } from "./alerts";
import { findActiveUser } from "./users";

// The worker's side of watched analyses: run a rerun, apply the alert rule to its result,
// create one delivery per alert and subscriber, and queue the immediate e-mails. Imported by
// the worker only (the reruns start worker threads).

interface SummaryWindow {
  raDeg: number; decDeg: number; lDeg: number; bDeg: number; nOn: number; nExpected: number; localSignificance: number;
  postTrial: { p: number; pUpperBound: number | null; sigma: number | null; sigmaLowerBound: number | null; nReached: number };
}
interface HotspotSummary {
  kind: "hotspot";
  nEvents: number;
  best: { radiusDeg: number; thresholdEeV: number | null; localSignificance: number; postTrial: { nSkies: number; p: number; sigma: number | null } };
  trials: { counted: string; nSkies: number };
  windows: SummaryWindow[];
}

const toRule = (w: SummaryWindow): RuleWindow & { source: SummaryWindow } => ({
  raDeg: w.raDeg, decDeg: w.decDeg, lDeg: w.lDeg, bDeg: w.bDeg, nOn: w.nOn, nExpected: w.nExpected, localSignificance: w.localSignificance,
  postTrialSigma: w.postTrial.sigma ?? w.postTrial.sigmaLowerBound, source: w,
});

interface SubscriberRow { id: number; user_id: number; analysis_id: number | null; local_sigma_threshold: number; post_trial_sigma_threshold: number | null; delivery: "immediate" | "daily-digest" }

/** Active (not paused) subscriptions that concern a watched analysis: to it, or to every published one when it is published. */
async function subscriptionsOf(rootId: number, published: boolean, t: Transaction): Promise<SubscriberRow[]> {
  return getDb().sequelize.query<SubscriberRow>(
    `SELECT id, user_id, analysis_id, local_sigma_threshold, post_trial_sigma_threshold, delivery FROM subscriptions
      WHERE NOT paused AND (analysis_id = :a ${published ? "OR analysis_id IS NULL" : ""}) ORDER BY (analysis_id IS NULL), id`,
    { replacements: { a: rootId }, type: QueryTypes.SELECT, transaction: t },
  );
}

/** Whether the subscriber may still read the watched analysis (checked at every alert, so a role change counts). */
async function mayReceive(userId: number, root: { id: number; publishedAt: Date | null }, viaAllPublished: boolean): Promise<{ email: string } | null> {
  const user = await findActiveUser(userId);
  if (!user || !can(user.role, "alerts:subscribe")) return null;
  if (viaAllPublished) return root.publishedAt && can(user.role, "analyses:read-published") ? user : null;
  if (can(user.role, "analyses:run")) return user;
  if (root.publishedAt && can(user.role, "analyses:read-published")) return user;
  if (can(user.role, "analyses:read-shared")) {
    const [row] = await getDb().sequelize.query("SELECT 1 FROM analysis_shares WHERE analysis_id = :a AND user_id = :u", { replacements: { a: root.id, u: userId }, type: QueryTypes.SELECT });
    if (row) return user;
  }
  return null;
}

/**
 * The job of one rerun: computes it (the analysis job), then applies the alert rule against the
 * alerts already raised for the watched analysis, in one transaction that also marks the run
 * evaluated (so a job delivered twice raises nothing twice), then queues the immediate e-mails.
 */
export async function runWatchRun(watchRunId: number): Promise<{ alerts: number; deliveries: number }> {
  const { sequelize, models } = getDb();
  const [w] = await sequelize.query<{ id: number; watched_analysis_id: number; run_analysis_id: number; previous_analysis_id: number | null; dataset_version: number; status: string }>(
    "SELECT id, watched_analysis_id, run_analysis_id, previous_analysis_id, dataset_version, status FROM watch_runs WHERE id = :id",
    { replacements: { id: watchRunId }, type: QueryTypes.SELECT },
  );
  if (!w || w.status !== "queued") return { alerts: 0, deliveries: 0 };
  await runAnalysisJob(w.run_analysis_id);
  const run = await models.Analysis.findByPk(w.run_analysis_id);
  if (!run || run.status !== "done") {
    await sequelize.query("UPDATE watch_runs SET status = 'failed', error = :e, evaluated_at = now() WHERE id = :id", { replacements: { id: watchRunId, e: run?.error ?? `the rerun is ${run?.status ?? "missing"}` } });
    return { alerts: 0, deliveries: 0 };
  }
  const summary = run.summary as unknown as HotspotSummary;
  const previous = w.previous_analysis_id ? await models.Analysis.findByPk(w.previous_analysis_id, { attributes: ["id", "datasetVersion", "summary"] }) : null;
  const prevSummary = previous?.summary as unknown as HotspotSummary | null;

  const immediate: number[] = [];
  let nAlerts = 0;
  let nDeliveries = 0;
  await sequelize.transaction(async (t) => {
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext(:k))", { replacements: { k: `siderea-watch:${w.watched_analysis_id}` }, transaction: t });
    const claimed = await sequelize.query("UPDATE watch_runs SET status = 'evaluated', evaluated_at = now() WHERE id = :id AND status = 'queued' RETURNING id", { replacements: { id: watchRunId }, type: QueryTypes.SELECT, transaction: t });
    if (!claimed.length) return;
    const root = await models.Analysis.findByPk(w.watched_analysis_id, { attributes: ["id", "publishedAt", "name", "datasetId"], transaction: t });
    if (!root) return;
    const [watch] = await sequelize.query<{ dedup_radius_deg: number | null; update_step_sigma: number }>("SELECT dedup_radius_deg, update_step_sigma FROM analysis_watches WHERE analysis_id = :id", { replacements: { id: root.id }, type: QueryTypes.SELECT, transaction: t });
    const subs = await subscriptionsOf(root.id, root.publishedAt !== null, t);
    // The rule raises alerts at the lowest threshold anyone asked for (at most the default), so
    // the alerts page is complete at the default; each subscriber receives those meeting theirs.
    const raiseAt = Math.min(DEFAULT_LOCAL_SIGMA_THRESHOLD, ...subs.map((s) => s.local_sigma_threshold));
    const known = await sequelize.query<{ id: number; ra_deg: number; dec_deg: number; level: number }>(
      `SELECT a.id, a.ra_deg, a.dec_deg, GREATEST(a.local_sigma, COALESCE((SELECT max(u.local_sigma) FROM alerts u WHERE u.parent_alert_id = a.id), 0)) AS level
         FROM alerts a WHERE a.watched_analysis_id = :id AND a.kind = 'new'`,
      { replacements: { id: root.id }, type: QueryTypes.SELECT, transaction: t },
    );
    const radiusDeg = summary.best.radiusDeg;
    const dedupRadiusDeg = watch?.dedup_radius_deg ?? radiusDeg;
    // Peaks: a window with a more significant window centre within the deduplication distance
    // (on the rerun's significance map, at the same radius) is the flank of a stronger excess.
    const [map] = await sequelize.query<{ nside: number; data: Buffer }>("SELECT nside, data FROM analysis_maps WHERE analysis_id = :id AND layer = 'significance'", { replacements: { id: run.id }, type: QueryTypes.SELECT, transaction: t });
    const sig = map ? new Float32Array(Uint8Array.from(map.data).buffer) : null;
    const windows = summary.windows.map((sw) => {
      const w = toRule(sw);
      if (sig && map) {
        const ra = (sw.raDeg * Math.PI) / 180, dec = (sw.decDeg * Math.PI) / 180;
        const disc = queryDiscCentres(map.nside, "ring", Math.cos(dec) * Math.cos(ra), Math.cos(dec) * Math.sin(ra), Math.sin(dec), (dedupRadiusDeg * Math.PI) / 180);
        // Float32 map against the 6-decimal summary: a tolerance of 1e-4 sigma.
        w.peak = !disc.some((p) => sig[p]! > sw.localSignificance + 1e-4);
      }
      return w;
    });
    const decisions = decideAlerts(windows, known.map((k) => ({ id: k.id, raDeg: k.ra_deg, decDeg: k.dec_deg, announcedLocalSigma: k.level })), {
      localSigmaThreshold: raiseAt,
      postTrialSigmaThreshold: null,
      dedupRadiusDeg,
      updateStepSigma: watch?.update_step_sigma ?? 1,
    });
    const newIds = new Map<number, number>(); // provisional id of a new alert in this run -> stored id
    for (const d of decisions) {
      const win = (d.window as RuleWindow & { source: SummaryWindow }).source;
      const prev = prevSummary?.windows ? previousWindowNear(prevSummary.windows, win.raDeg, win.decDeg, dedupRadiusDeg) : null;
      const parentId = d.kind === "update" ? (d.alertId < 0 ? newIds.get(d.alertId) ?? null : d.alertId) : null;
      const alert = await models.Alert.create(
        {
          watchedAnalysisId: root.id, runAnalysisId: run.id, watchRunId, parentAlertId: parentId, kind: d.kind,
          datasetId: run.datasetId, datasetVersion: run.datasetVersion,
          raDeg: win.raDeg, decDeg: win.decDeg, lDeg: win.lDeg, bDeg: win.bDeg, radiusDeg, energyThresholdEeV: summary.best.thresholdEeV,
          nOn: win.nOn, nExpected: win.nExpected, localSigma: win.localSignificance,
          postTrialP: win.postTrial.p, postTrialPUpperBound: win.postTrial.pUpperBound, postTrialSigma: win.postTrial.sigma, postTrialSigmaLowerBound: win.postTrial.sigmaLowerBound,
          nSkies: summary.trials.nSkies, trialsCounted: summary.trials.counted,
          previousLocalSigma: prev?.localSignificance ?? null, previousAnnouncedSigma: d.kind === "update" ? d.previousAnnouncedSigma : null,
        },
        { transaction: t },
      );
      if (d.kind === "new") newIds.set(-(decisions.indexOf(d) + 1), alert.id);
      nAlerts++;
      // One delivery per subscriber (a specific subscription first, then "all published").
      const served = new Set<number>();
      for (const s of subs) {
        if (served.has(s.user_id)) continue;
        if (!meetsThresholds({ localSignificance: win.localSignificance, postTrialSigma: win.postTrial.sigma ?? win.postTrial.sigmaLowerBound }, s.local_sigma_threshold, s.post_trial_sigma_threshold)) continue;
        const to = await mayReceive(s.user_id, root, s.analysis_id === null);
        if (!to) continue;
        served.add(s.user_id);
        const [row] = await sequelize.query<{ id: number }>(
          `INSERT INTO alert_deliveries (alert_id, user_id, subscription_id, delivery, to_address, state, attempts, created_at)
           VALUES (:a, :u, :s, :d, :to, 'pending', 0, now()) ON CONFLICT DO NOTHING RETURNING id`,
          { replacements: { a: alert.id, u: s.user_id, s: s.id, d: s.delivery, to: to.email }, type: QueryTypes.SELECT, transaction: t },
        );
        if (row) {
          nDeliveries++;
          if (s.delivery === "immediate") immediate.push(row.id);
        }
      }
    }
    const comparison = {
      previousAnalysisId: previous?.id ?? null,
      previousVersion: previous?.datasetVersion ?? null,
      previousBestLocalSigma: prevSummary?.best?.localSignificance ?? null,
      bestLocalSigma: summary.best.localSignificance,
      previousEvents: prevSummary?.nEvents ?? null,
      events: summary.nEvents,
      alertThresholdSigma: raiseAt,
      dedupRadiusDeg,
      newAlerts: decisions.filter((d) => d.kind === "new").length,
      updates: decisions.filter((d) => d.kind === "update").length,
    };
    await sequelize.query("UPDATE watch_runs SET comparison = :c WHERE id = :id", { replacements: { c: JSON.stringify(comparison), id: watchRunId }, transaction: t });
  });
  // After the commit: one mail job per immediate delivery. If the queue fails here, the sweep sends them.
  for (const id of immediate) await enqueue(QUEUES.mail, { deliveryIds: [id] });
  return { alerts: nAlerts, deliveries: nDeliveries };
}

/** The worker's periodic sweep: reruns never created (the append's hook could not queue) and runs whose job was lost. */
export async function sweepWatchedAnalyses(): Promise<number> {
  const created = await scheduleWatchedReruns();
  const stuck = await getDb().sequelize.query<{ id: number }>(
    "SELECT w.id FROM watch_runs w JOIN analyses a ON a.id = w.run_analysis_id WHERE w.status = 'queued' AND w.created_at < now() - interval '10 minutes' AND a.status IN ('queued', 'done', 'failed')",
    { type: QueryTypes.SELECT },
  );
  for (const s of stuck) await enqueue(QUEUES.watchRun, { watchRunId: s.id });
  return created.length + stuck.length;
}
