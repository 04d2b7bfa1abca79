import "server-only";
import { QueryTypes, UniqueConstraintError } from "sequelize";
import { getDb } from "@/lib/db";
import { linkSecret, readEnv } from "@/lib/env";
import { forbidden, HttpError, notFound } from "@/lib/http";
import { can } from "@/lib/auth/roles";
import { signLink, verifyLink } from "@/lib/links/signed-link";
import type { SubscriptionInput, SubscriptionUpdate } from "@/lib/validations/alerts";
import { readableAnalysis } from "./analyses";
import { audit } from "./audit";
import type { PublicUser } from "./users";

export interface SubscriptionRow {
  id: number;
  analysisId: number | null;
  analysisName: string | null;
  localSigmaThreshold: number;
  postTrialSigmaThreshold: number | null;
  delivery: "immediate" | "daily-digest";
  paused: boolean;
  createdAt: string;
}

/** The user's subscriptions, with the watched analysis's name. */
export async function listSubscriptions(user: PublicUser): Promise<SubscriptionRow[]> {
  const rows = await getDb().sequelize.query<{ id: number; analysis_id: number | null; name: string | null; local_sigma_threshold: number; post_trial_sigma_threshold: number | null; delivery: "immediate" | "daily-digest"; paused: boolean; created_at: Date }>(
    `SELECT s.id, s.analysis_id, a.name, s.local_sigma_threshold, s.post_trial_sigma_threshold, s.delivery, s.paused, s.created_at
       FROM subscriptions s LEFT JOIN analyses a ON a.id = s.analysis_id WHERE s.user_id = :u ORDER BY s.id`,
    { replacements: { u: user.id }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: r.id, analysisId: r.analysis_id, analysisName: r.name, localSigmaThreshold: r.local_sigma_threshold, postTrialSigmaThreshold: r.post_trial_sigma_threshold,
    delivery: r.delivery, paused: r.paused, createdAt: new Date(r.created_at).toISOString(),
  }));
}

/**
 * Subscribes the user. To one analysis: the user must be allowed to read it (a member the
 * published ones, a referee those shared with them) and it must be watched. To every published
 * analysis: only roles that read published results (not referees).
 */
export async function createSubscription(user: PublicUser, input: SubscriptionInput): Promise<SubscriptionRow> {
  if (!can(user.role, "alerts:subscribe")) throw forbidden("alert subscriptions");
  if (input.analysisId === null) {
    if (!can(user.role, "analyses:read-published")) throw forbidden("a subscription to every published analysis (referees subscribe to analyses shared with them)");
  } else {
    const a = await readableAnalysis(user, input.analysisId);
    if (!a.watched) throw new HttpError(409, "conflict", "This analysis is not watched: new data do not rerun it, so it raises no alerts. Ask an analyst to watch it.");
  }
  try {
    const s = await getDb().models.Subscription.create({
      userId: user.id,
      analysisId: input.analysisId,
      localSigmaThreshold: input.localSigmaThreshold,
      postTrialSigmaThreshold: input.postTrialSigmaThreshold,
      delivery: input.delivery,
      paused: false,
    });
    await audit({ actorId: user.id, action: "subscription.create", targetType: "subscription", targetId: s.id, details: { analysisId: input.analysisId, delivery: input.delivery, localSigmaThreshold: input.localSigmaThreshold, postTrialSigmaThreshold: input.postTrialSigmaThreshold } });
    return (await listSubscriptions(user)).find((r) => r.id === s.id)!;
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new HttpError(409, "conflict", input.analysisId === null ? "You already subscribe to every published analysis; change that subscription instead." : "You already subscribe to this analysis; change that subscription instead.");
    throw error;
  }
}

async function ownSubscription(user: PublicUser, id: number) {
  const s = await getDb().models.Subscription.findByPk(id);
  // Another user's subscription is reported missing, not forbidden: its existence is not theirs to learn.
  if (!s || s.userId !== user.id) throw notFound("subscription");
  return s;
}

export async function updateSubscription(user: PublicUser, id: number, changes: SubscriptionUpdate): Promise<SubscriptionRow> {
  if (!can(user.role, "alerts:subscribe")) throw forbidden("alert subscriptions");
  const s = await ownSubscription(user, id);
  await s.update(changes);
  await audit({ actorId: user.id, action: changes.paused === true ? "subscription.pause" : changes.paused === false ? "subscription.resume" : "subscription.change", targetType: "subscription", targetId: id, details: changes });
  return (await listSubscriptions(user)).find((r) => r.id === id)!;
}

/** Removes a subscription; its pending deliveries are cancelled. */
async function removeSubscription(subscriptionId: number, userId: number): Promise<void> {
  await getDb().sequelize.transaction(async (t) => {
    await getDb().sequelize.query("UPDATE alert_deliveries SET state = 'cancelled' WHERE subscription_id = :id AND state = 'pending'", { replacements: { id: subscriptionId }, transaction: t });
    await getDb().sequelize.query("DELETE FROM subscriptions WHERE id = :id AND user_id = :u", { replacements: { id: subscriptionId, u: userId }, transaction: t });
  });
}

export async function deleteSubscription(user: PublicUser, id: number): Promise<void> {
  if (!can(user.role, "alerts:subscribe")) throw forbidden("alert subscriptions");
  await ownSubscription(user, id);
  await removeSubscription(id, user.id);
  await audit({ actorId: user.id, action: "subscription.delete", targetType: "subscription", targetId: id });
}

/** The signed unsubscribe link of a subscription, valid for SIDEREA_UNSUBSCRIBE_LINK_DAYS and usable once. */
export function unsubscribeLink(subscriptionId: number, userId: number, nowMs = Date.now()): { url: string; apiUrl: string; expiresAt: Date } {
  const env = readEnv();
  const expiresAtS = Math.floor(nowMs / 1000 + env.SIDEREA_UNSUBSCRIBE_LINK_DAYS * 86_400);
  const token = signLink(linkSecret(env), { purpose: "unsubscribe", subscriptionId, userId, expiresAtS });
  const base = env.NEXTAUTH_URL.replace(/\/$/, "");
  return { url: `${base}/unsubscribe?token=${token}`, apiUrl: `${base}/api/subscriptions/unsubscribe?token=${token}`, expiresAt: new Date(expiresAtS * 1000) };
}

type LinkState =
  | { state: "valid"; subscriptionId: number; what: string }
  | { state: "used" | "expired" | "invalid" | "gone" };

/** What an unsubscribe link would do, without using it (the page shows this before the button). */
export async function inspectUnsubscribeLink(token: string): Promise<LinkState> {
  const check = verifyLink(linkSecret(), token, "unsubscribe");
  if (!check.ok) return { state: check.reason === "expired" ? "expired" : "invalid" };
  const [used] = await getDb().sequelize.query("SELECT 1 FROM used_links WHERE nonce = :n", { replacements: { n: check.payload.nonce }, type: QueryTypes.SELECT });
  if (used) return { state: "used" };
  const [s] = await getDb().sequelize.query<{ id: number; name: string | null; analysis_id: number | null }>(
    "SELECT s.id, s.analysis_id, a.name FROM subscriptions s LEFT JOIN analyses a ON a.id = s.analysis_id WHERE s.id = :id AND s.user_id = :u",
    { replacements: { id: check.payload.subscriptionId, u: check.payload.userId }, type: QueryTypes.SELECT },
  );
  if (!s) return { state: "gone" };
  return { state: "valid", subscriptionId: s.id, what: s.analysis_id === null ? "alerts of every published analysis" : `alerts of “${s.name}”` };
}

/**
 * Uses an unsubscribe link: checks signature and expiry, records its nonce (a link works
 * once) and removes the subscription. 400 for a link that is not ours, 410 expired, 409 used.
 */
export async function unsubscribeWithToken(token: string): Promise<{ what: string }> {
  const check = verifyLink(linkSecret(), token, "unsubscribe");
  if (!check.ok) {
    if (check.reason === "expired") throw new HttpError(410, "gone", "This unsubscribe link has expired. Sign in and remove the subscription on the Alerts page.");
    throw new HttpError(400, "bad_request", "This unsubscribe link is not valid (it may be incomplete: copy the whole link from the e-mail).");
  }
  const { nonce, subscriptionId, userId } = check.payload;
  const info = await inspectUnsubscribeLink(token);
  const outcome = await getDb().sequelize.transaction(async (t) => {
    const inserted = await getDb().sequelize.query<{ nonce: string }>("INSERT INTO used_links (nonce, purpose, used_at) VALUES (:n, 'unsubscribe', now()) ON CONFLICT DO NOTHING RETURNING nonce", {
      replacements: { n: nonce }, type: QueryTypes.SELECT, transaction: t,
    });
    if (!inserted.length) return "used" as const;
    await getDb().sequelize.query("UPDATE alert_deliveries SET state = 'cancelled' WHERE subscription_id = :id AND state = 'pending'", { replacements: { id: subscriptionId }, transaction: t });
    await getDb().sequelize.query("DELETE FROM subscriptions WHERE id = :id AND user_id = :u", { replacements: { id: subscriptionId, u: userId }, transaction: t });
    return "done" as const;
  });
  if (outcome === "used") throw new HttpError(409, "conflict", "This unsubscribe link has already been used.");
  await audit({ actorId: userId, action: "subscription.unsubscribe-link", targetType: "subscription", targetId: subscriptionId });
  return { what: info.state === "valid" ? info.what : "the subscription (it had already been removed)" };
}
