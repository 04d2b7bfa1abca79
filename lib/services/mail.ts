import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { readEnv } from "@/lib/env";
import { enqueue, QUEUES } from "@/lib/jobs/queue";
import { createMailTransport } from "@/lib/mail/transport";
import { renderAlertMail, renderDigestMail, type MailAlert, type MailImage } from "@/lib/mail/render";
import { renderWindowImage } from "@/lib/mail/window-image";
import { alertFiguresFromRow } from "@/lib/alerts/figures";
import { unsubscribeLink } from "./subscriptions";

// Sending the alert e-mails (worker side). A delivery row is the truth: it stays 'pending'
// with its attempts and last error until the SMTP server accepted the message, so a dead
// server loses nothing; the mail job is retried with backoff, and the sweep queues again what
// is still pending after the retries ran out. Delivery is at least once: a worker killed
// between the server's acceptance and the commit sends that message again.

interface DeliveryRow { id: number; alert_id: number; user_id: number; subscription_id: number | null; delivery: "immediate" | "daily-digest"; to_address: string }

async function loadMailAlert(alertId: number): Promise<MailAlert & { nside: number | null; significance: Float32Array | null }> {
  const { sequelize } = getDb();
  const [r] = await sequelize.query<Record<string, unknown>>(
    `SELECT al.*, a.name AS analysis_name, d.name AS dataset_name, dv.batch_event_count, w.previous_analysis_id, p.dataset_version AS previous_version
       FROM alerts al JOIN analyses a ON a.id = al.watched_analysis_id JOIN datasets d ON d.id = al.dataset_id
       LEFT JOIN dataset_versions dv ON dv.dataset_id = al.dataset_id AND dv.version = al.dataset_version
       LEFT JOIN watch_runs w ON w.id = al.watch_run_id LEFT JOIN analyses p ON p.id = w.previous_analysis_id
      WHERE al.id = :id`,
    { replacements: { id: alertId }, type: QueryTypes.SELECT },
  );
  if (!r) throw new Error(`alert ${alertId} no longer exists`);
  const [map] = await sequelize.query<{ nside: number; data: Buffer }>("SELECT nside, data FROM analysis_maps WHERE analysis_id = :id AND layer = 'significance'", {
    replacements: { id: r.run_analysis_id }, type: QueryTypes.SELECT,
  });
  // Copy into an aligned buffer: the bytes from PostgreSQL may start at any offset.
  const significance = map ? new Float32Array(Uint8Array.from(map.data).buffer) : null;
  return {
    ...alertFiguresFromRow(r),
    analysisName: r.analysis_name as string, datasetName: r.dataset_name as string,
    previousVersion: (r.previous_version as number | null) ?? null, batchEvents: r.batch_event_count == null ? null : Number(r.batch_event_count),
    energyThresholdEeV: r.energy_threshold_eev as number | null,
    createdAt: new Date(r.created_at as string), nside: map?.nside ?? null, significance,
  };
}

function imageOf(a: Awaited<ReturnType<typeof loadMailAlert>>): MailImage | null {
  if (!a.significance || !a.nside) return null;
  return renderWindowImage({ nside: a.nside, significance: a.significance, centreRaDeg: a.raDeg, centreDecDeg: a.decDeg, radiusDeg: a.radiusDeg });
}

function thresholdText(s: { local_sigma_threshold: number; post_trial_sigma_threshold: number | null } | undefined): string {
  if (!s) return "as set on the Alerts page";
  return `${s.local_sigma_threshold}σ local${s.post_trial_sigma_threshold !== null ? ` and ${s.post_trial_sigma_threshold}σ post-trial` : ""}`;
}

/**
 * The mail job: sends one message for the given deliveries of one subscriber (one immediate
 * alert, or the day's digest), holding their rows locked meanwhile so two workers never send
 * the same delivery. Throws when the SMTP server refuses or cannot be reached: the attempt is
 * recorded on the rows and pg-boss retries the job with backoff.
 */
export async function deliverMail(deliveryIds: number[]): Promise<"sent" | "nothing-to-send"> {
  const { sequelize } = getDb();
  const env = readEnv();
  const t = await sequelize.transaction();
  let rows: DeliveryRow[] = [];
  try {
    rows = await sequelize.query<DeliveryRow>(
      "SELECT id, alert_id, user_id, subscription_id, delivery, to_address FROM alert_deliveries WHERE id IN (:ids) AND state = 'pending' ORDER BY alert_id FOR UPDATE SKIP LOCKED",
      { replacements: { ids: deliveryIds }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!rows.length) {
      await t.commit();
      return "nothing-to-send";
    }
    const userId = rows[0]!.user_id;
    rows = rows.filter((r) => r.user_id === userId);
    const [user] = await sequelize.query<{ name: string }>("SELECT name FROM users WHERE id = :id", { replacements: { id: userId }, type: QueryTypes.SELECT, transaction: t });
    const subId = rows.find((r) => r.subscription_id !== null)?.subscription_id ?? null;
    const [sub] = subId
      ? await sequelize.query<{ local_sigma_threshold: number; post_trial_sigma_threshold: number | null }>("SELECT local_sigma_threshold, post_trial_sigma_threshold FROM subscriptions WHERE id = :id", { replacements: { id: subId }, type: QueryTypes.SELECT, transaction: t })
      : [];
    const link = subId ? unsubscribeLink(subId, userId) : null;
    const baseUrl = env.NEXTAUTH_URL.replace(/\/$/, "");
    const ctx = { baseUrl, recipientName: user?.name ?? "", thresholdText: thresholdText(sub), unsubscribeUrl: link?.url ?? `${baseUrl}/alerts`, unsubscribeExpires: link?.expiresAt ?? new Date() };
    const alerts = await Promise.all(rows.map((r) => loadMailAlert(r.alert_id)));
    const digest = rows[0]!.delivery === "daily-digest";
    const mail = digest ? renderDigestMail(alerts.map((a) => ({ alert: a, image: imageOf(a) })), ctx, new Date()) : renderAlertMail(alerts[0]!, ctx, imageOf(alerts[0]!));
    const info = await createMailTransport(env).sendMail({
      from: env.SIDEREA_MAIL_FROM,
      to: rows[0]!.to_address,
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      attachments: mail.attachments,
      headers: link ? { "List-Unsubscribe": `<${link.apiUrl}>`, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" } : undefined,
    });
    await sequelize.query("UPDATE alert_deliveries SET state = 'sent', sent_at = now(), attempts = attempts + 1, last_attempt_at = now(), last_error = NULL, smtp_message_id = :m WHERE id IN (:ids)", {
      replacements: { m: info.messageId ?? null, ids: rows.map((r) => r.id) }, transaction: t,
    });
    await t.commit();
    return "sent";
  } catch (error) {
    await t.rollback().catch(() => {});
    const ids = rows.length ? rows.map((r) => r.id) : deliveryIds;
    await sequelize.query("UPDATE alert_deliveries SET attempts = attempts + 1, last_attempt_at = now(), last_error = :e WHERE id IN (:ids) AND state = 'pending'", {
      replacements: { e: (error as Error).message.slice(0, 1000), ids },
    });
    throw error;
  }
}

/** The scheduled digest: one mail job per subscriber with pending digest deliveries. Returns the number of jobs. */
export async function queueDailyDigests(): Promise<number> {
  const groups = await getDb().sequelize.query<{ user_id: number; ids: number[] }>(
    "SELECT user_id, array_agg(id ORDER BY alert_id) AS ids FROM alert_deliveries WHERE state = 'pending' AND delivery = 'daily-digest' GROUP BY user_id",
    { type: QueryTypes.SELECT },
  );
  for (const g of groups) await enqueue(QUEUES.mail, { deliveryIds: g.ids });
  return groups.length;
}

/**
 * Immediate deliveries still pending long after their last attempt (the job's retries ran out,
 * or the job was never queued): queued again. Run by the worker every minute.
 */
export async function sweepPendingMail(quietMinutes = 15): Promise<number> {
  const rows = await getDb().sequelize.query<{ id: number }>(
    `SELECT id FROM alert_deliveries WHERE state = 'pending' AND delivery = 'immediate'
       AND COALESCE(last_attempt_at, created_at) < now() - make_interval(mins => :m)`,
    { replacements: { m: quietMinutes }, type: QueryTypes.SELECT },
  );
  for (const r of rows) await enqueue(QUEUES.mail, { deliveryIds: [r.id] });
  return rows.length;
}
