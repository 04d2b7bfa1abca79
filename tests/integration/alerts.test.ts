import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "./database";
import { makeUser, requestAs } from "./auth-helpers";
import { POST as appendRoute } from "@/app/api/datasets/[id]/batches/route";
import { POST as createAnalysisRoute } from "@/app/api/analyses/route";
import { POST as publishRoute } from "@/app/api/analyses/[id]/publish/route";
import { POST as shareRoute } from "@/app/api/analyses/[id]/share/route";
import { GET as watchGetRoute, POST as watchRoute } from "@/app/api/analyses/[id]/watch/route";
import { GET as alertsRoute } from "@/app/api/alerts/route";
import { GET as listSubsRoute, POST as subscribeRoute } from "@/app/api/subscriptions/route";
import { PATCH as patchSubRoute } from "@/app/api/subscriptions/[id]/route";
import { POST as unsubscribeRoute } from "@/app/api/subscriptions/unsubscribe/route";
import { getDb } from "@/lib/db";
import { ingestDemoDataset } from "./demo-dataset";
import { linkSecret } from "@/lib/env";
import { stopBoss } from "@/lib/jobs/queue";
import { runAnalysisJob } from "@/lib/services/analysis-jobs";
import { queueDailyDigests } from "@/lib/services/mail";
import { inspectUnsubscribeLink } from "@/lib/services/subscriptions";
import { DEMO_SPAN_MS, DEMO_START_MS, CLUSTER_B_DEG, CLUSTER_L_DEG, generateDemoCsv } from "@/lib/demo/generate";
import { startSmtpSink, type RunningSink, type SinkEnvelope } from "@/lib/mail/sink";
import { parseMessage, type ParsedMessage } from "@/lib/mail/mime";
import { signLink, verifyLink } from "@/lib/links/signed-link";
import { angularDistanceDeg } from "@/lib/alerts/angles";

// The whole chain against the real PostgreSQL, the real worker process and a real SMTP server
// (smtp-server, the sink of npm start): append -> rerun of the watched analysis -> alert rule
// -> one delivery per subscriber -> mail job -> SMTP. Mail retries quickly here (1 s backoff base).
const db = useTestDatabase();
process.env.SIDEREA_MAIL_RETRY_DELAY_SECONDS = "1";
process.env.SIDEREA_MAIL_RETRY_LIMIT = "30";
process.env.SIDEREA_LINK_SECRET = "integration-test-link-secret-0123456789";
const SMTP_PORT = Number(process.env.SIDEREA_TEST_SMTP_PORT ?? 2526) + 1;
process.env.SIDEREA_SMTP_PORT = String(SMTP_PORT);
process.env.SIDEREA_SMTP_HOST = "127.0.0.1";

const SINK_DIR = mkdtempSync(join(tmpdir(), "siderea-alerts-sink-"));
let sink: RunningSink | null = null;
let worker: ChildProcess | null = null;
const users: Record<string, { id: number; email: string }> = {};
let datasetId = 0;
let rootId = 0;
let unwatchedId = 0;
const subs: Record<string, number> = {};
const LATER_MS = DEMO_START_MS + DEMO_SPAN_MS;
const DAY_MS = 86_400_000;

const json = (userId: number | null, url: string, body: unknown, method = "POST") =>
  requestAs(userId, url, { method, body: JSON.stringify(body), headers: { "content-type": "application/json" } });
const params = (id: number) => ({ params: Promise.resolve({ id: String(id) }) });

async function q<T extends object>(sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  return getDb().sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
}

async function waitFor<T>(what: string, fn: () => Promise<T | undefined | null | false>, timeoutMs = 90_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** Messages the SMTP sink received: envelope and parsed message. */
function inbox(): { envelope: SinkEnvelope; mail: ParsedMessage }[] {
  return readdirSync(SINK_DIR)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .map((f) => {
      const envelope = JSON.parse(readFileSync(join(SINK_DIR, f), "utf8")) as SinkEnvelope;
      return { envelope, mail: parseMessage(readFileSync(join(SINK_DIR, `${envelope.id}.eml`))) };
    });
}

async function append(csv: string, name: string): Promise<string> {
  const r = await appendRoute(await requestAs(users.analyst!.id, `/api/datasets/${datasetId}/batches?fileName=${name}`, { method: "POST", body: csv, duplex: "half" } as RequestInit), params(datasetId));
  expect(r.status).toBe(202);
  return (await r.json()).job.id as string;
}

async function uploadStatus(id: string): Promise<string> {
  return (await q<{ status: string }>("SELECT status FROM uploads WHERE id = :id", { id }))[0]!.status;
}

async function watchRunOf(version: number) {
  return (await q<{ id: number; status: string; comparison: Record<string, unknown> | null }>("SELECT id, status, comparison FROM watch_runs WHERE watched_analysis_id = :a AND dataset_version = :v", { a: rootId, v: version }))[0];
}

function startWorker(): ChildProcess {
  const child = spawn(process.execPath, ["--import", "tsx", "--conditions=react-server", "lib/worker/main.ts"], {
    env: { ...process.env, DATABASE_URL: db.url() },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", () => {});
  child.stderr?.on("data", (d) => process.stderr.write(`[worker] ${d}`));
  return child;
}

beforeAll(async () => {
  for (const role of ["analyst", "member", "member2", "member3", "member4", "member5", "referee", "otherReferee"] as const) {
    users[role] = await makeUser(role.startsWith("member") ? "member" : role.toLowerCase().includes("referee") ? "referee" : "analyst");
  }
  // Version 1: background only (isotropic with the demo's weak dipole), no cluster.
  ({ datasetId } = await ingestDemoDataset(users.analyst!.id, "alerts-test", { n: 3000, seed: 41, clusterFraction: 0, idPrefix: "A-" }));
  const settings = { kind: "hotspot", datasetId, zenithMaxDeg: 60, energyThresholdsEeV: [], nside: 16, radiiDeg: [10], exposure: "sommers", nSkies: 20, seed: 2024 };
  for (const name of ["Watched scan", "Unwatched scan"]) {
    const a = await createAnalysisRoute(await json(users.analyst!.id, "/api/analyses", { name, settings }));
    const id = (await a.json()).analysis.id as number;
    await runAnalysisJob(id);
    if (name === "Watched scan") rootId = id;
    else unwatchedId = id;
  }
  sink = await startSmtpSink({ port: SMTP_PORT, dir: SINK_DIR });
}, 120_000);

afterAll(async () => {
  worker?.kill("SIGKILL");
  await sink?.close();
  await stopBoss();
  rmSync(SINK_DIR, { recursive: true, force: true });
});

describe("watching and subscribing, by role", () => {
  it("lets only an analyst watch, and only a finished hotspot scan; refuses anonymous callers with 401", async () => {
    expect((await watchRoute(await json(null, `/api/analyses/${rootId}/watch`, { watched: true }), params(rootId))).status).toBe(401);
    for (const role of ["member", "referee"]) {
      expect((await watchRoute(await json(users[role]!.id, `/api/analyses/${rootId}/watch`, { watched: true }), params(rootId))).status).toBe(403);
    }
    const bad = await watchRoute(await json(users.analyst!.id, `/api/analyses/${rootId}/watch`, { watched: true, updateStepSigma: 0 }), params(rootId));
    expect(bad.status).toBe(422);
    const ok = await watchRoute(await json(users.analyst!.id, `/api/analyses/${rootId}/watch`, { watched: true }), params(rootId));
    expect(ok.status).toBe(200);
    expect((await ok.json()).watch).toMatchObject({ watched: true, dedupRadiusDeg: null, updateStepSigma: 1, runs: [] });
  });

  it("refuses a member an unpublished analysis (403) and a subscription to an analysis nobody watches (409)", async () => {
    expect((await subscribeRoute(await json(users.member!.id, "/api/subscriptions", { analysisId: rootId }))).status).toBe(403);
    expect((await subscribeRoute(await json(null, "/api/subscriptions", { analysisId: null }))).status).toBe(401);
    expect((await publishRoute(await requestAs(users.analyst!.id, `/api/analyses/${rootId}/publish`, { method: "POST" }), params(rootId))).status).toBe(200);
    expect((await publishRoute(await requestAs(users.analyst!.id, `/api/analyses/${unwatchedId}/publish`, { method: "POST" }), params(unwatchedId))).status).toBe(200);
    expect((await subscribeRoute(await json(users.member!.id, "/api/subscriptions", { analysisId: unwatchedId }))).status).toBe(409);
  });

  it("limits a referee to analyses shared with them: no 'all published' subscription, no unshared analysis", async () => {
    expect((await subscribeRoute(await json(users.referee!.id, "/api/subscriptions", { analysisId: null }))).status).toBe(403);
    expect((await shareRoute(await json(users.analyst!.id, `/api/analyses/${rootId}/share`, { email: users.referee!.email }), params(rootId))).status).toBe(200);
    // Published, but a referee reads only what is shared with them.
    expect((await subscribeRoute(await json(users.otherReferee!.id, "/api/subscriptions", { analysisId: rootId }))).status).toBe(403);
    const r = await subscribeRoute(await json(users.referee!.id, "/api/subscriptions", { analysisId: rootId }));
    expect(r.status).toBe(201);
    subs.referee = (await r.json()).subscription.id;
  });

  it("subscribes members with their own thresholds and delivery, validates the input, and refuses a second subscription (409)", async () => {
    const make = async (who: string, body: Record<string, unknown>) => {
      const r = await subscribeRoute(await json(users[who]!.id, "/api/subscriptions", body));
      expect(r.status).toBe(201);
      return (await r.json()).subscription.id as number;
    };
    subs.member = await make("member", { analysisId: rootId });
    subs.member2 = await make("member2", { analysisId: null });
    subs.member3 = await make("member3", { analysisId: rootId, delivery: "daily-digest" });
    subs.member4 = await make("member4", { analysisId: rootId, localSigmaThreshold: 49 });
    subs.member5 = await make("member5", { analysisId: rootId });
    expect((await patchSubRoute(await json(users.member5!.id, `/api/subscriptions/${subs.member5}`, { paused: true }, "PATCH"), params(subs.member5))).status).toBe(200);
    // Someone else's subscription is not found, not merely forbidden.
    expect((await patchSubRoute(await json(users.member!.id, `/api/subscriptions/${subs.member5}`, { paused: false }, "PATCH"), params(subs.member5))).status).toBe(404);
    expect((await subscribeRoute(await json(users.member!.id, "/api/subscriptions", { analysisId: rootId }))).status).toBe(409);
    const bad = await subscribeRoute(await json(users.member!.id, "/api/subscriptions", { analysisId: rootId, localSigmaThreshold: -1, delivery: "weekly" }));
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.issues.map((i: { path: string }) => i.path).sort()).toEqual(["delivery", "localSigmaThreshold"]);
    const list = (await (await listSubsRoute(await requestAs(users.member!.id, "/api/subscriptions"))).json()).subscriptions;
    expect(list).toEqual([expect.objectContaining({ analysisId: rootId, analysisName: "Watched scan", localSigmaThreshold: 4, postTrialSigmaThreshold: null, delivery: "immediate", paused: false })]);
  });
});

describe("appending new data to a watched dataset", () => {
  it("raises exactly one alert for the injected cluster and sends one e-mail per immediate subscriber, with the right coordinates", async () => {
    worker = startWorker();
    // Version 2: two months more, 6% of them from the demo's cluster at l = 310, b = +20 (lib/demo/generate.ts).
    const job = await append(generateDemoCsv({ n: 1500, seed: 42, clusterFraction: 0.06, fromMs: LATER_MS, toMs: LATER_MS + 60 * DAY_MS, idPrefix: "B-" }), "cluster.csv");
    const run = await waitFor("the rerun on version 2 to be evaluated", async () => ((await watchRunOf(2))?.status === "evaluated" ? watchRunOf(2) : undefined));
    expect(await uploadStatus(job)).toBe("done");
    const alerts = await q<{ id: number; kind: string; ra_deg: number; dec_deg: number; l_deg: number; b_deg: number; n_on: number; n_expected: number; local_sigma: number; run_analysis_id: number; dataset_version: number }>("SELECT * FROM alerts WHERE watched_analysis_id = :a", { a: rootId });
    expect(alerts).toHaveLength(1);
    const alert = alerts[0]!;
    expect(alert).toMatchObject({ kind: "new", dataset_version: 2 });
    expect(alert.local_sigma).toBeGreaterThanOrEqual(4);
    // Within one window radius (10°) of where the cluster was injected, in galactic coordinates.
    expect(angularDistanceDeg(alert.l_deg, alert.b_deg, CLUSTER_L_DEG, CLUSTER_B_DEG)).toBeLessThan(10);
    expect(run!.comparison).toMatchObject({ previousVersion: 1, newAlerts: 1, updates: 0 });

    // The rerun: same settings but the dataset version, the same seed, chained to the watched scan.
    const [rerun] = await q<{ settings: Record<string, unknown>; seed: string; published_at: Date | null }>("SELECT settings, seed, published_at FROM analyses WHERE id = :id", { id: alert.run_analysis_id });
    const [root] = await q<{ settings: Record<string, unknown>; seed: string }>("SELECT settings, seed FROM analyses WHERE id = :id", { id: rootId });
    expect(rerun!.settings).toEqual({ ...root!.settings, datasetVersion: 2 });
    expect(rerun!.seed).toBe(root!.seed);
    expect(rerun!.published_at).not.toBeNull();

    // One e-mail per immediate subscriber who may read it; not the 49σ one, not the paused one, not the digest one (yet).
    const messages = await waitFor("three messages in the SMTP sink", async () => (inbox().length >= 3 ? inbox() : undefined));
    await new Promise((r) => setTimeout(r, 1500));
    expect(inbox()).toHaveLength(3);
    expect(messages.map((m) => m.envelope.to[0]).sort()).toEqual([users.member!.email, users.member2!.email, users.referee!.email].sort());
    for (const { mail } of messages) {
      expect(mail.subject).toMatch(/^\[Siderea\] Alert: Watched scan, \d+\.\d\dσ local at RA \d+\.\d°, Dec [+−]\d+\.\d° \(preliminary\)$/);
      const text = mail.text!;
      expect(text).toContain(`RA ${alert.ra_deg.toFixed(2)}°, Dec ${alert.dec_deg >= 0 ? "+" : "−"}${Math.abs(alert.dec_deg).toFixed(2)}°`);
      expect(text).toContain(`l ${alert.l_deg.toFixed(2)}°, b ${alert.b_deg >= 0 ? "+" : "−"}${Math.abs(alert.b_deg).toFixed(2)}°`);
      expect(text).toContain(`N_on (observed): ${alert.n_on}`);
      expect(text).toContain(`N_exp (expected): ${alert.n_expected.toFixed(2)}`);
      expect(text).toContain(`Local significance (pre-trial, Li & Ma eq. 17): ${alert.local_sigma.toFixed(2)}σ`);
      expect(text).toMatch(/Post-trial \(chance of a best window this strong in an isotropic sky\): p [<=] [\d.e-]+ \(.*20 isotropic skies/);
      expect(text).toContain("Trials counted: 1 radii x 1 energy thresholds x 3072 windows (Nside 16), against 20 isotropic skies");
      expect(text).toContain("PRELIMINARY: Preliminary until reviewed under the collaboration's own rules.");
      expect(text).toContain(`/analyses/${alert.run_analysis_id}`);
      expect(text).toMatch(/\/unsubscribe\?token=[\w-]+\.[\w-]+/);
      expect(mail.html).toContain(`src="cid:window-${alert.id}@siderea"`);
      const png = mail.attachments.find((a) => a.contentId === `window-${alert.id}@siderea`)!;
      expect(png.contentType).toBe("image/png");
      expect([...png.content.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    }
    const deliveries = await q<{ user_id: number; state: string; delivery: string }>("SELECT user_id, state, delivery FROM alert_deliveries ORDER BY id");
    expect(deliveries.filter((d) => d.state === "sent")).toHaveLength(3);
    expect(deliveries.filter((d) => d.user_id === users.member3!.id)).toEqual([{ user_id: users.member3!.id, state: "pending", delivery: "daily-digest" }]);
    expect(deliveries.some((d) => d.user_id === users.member4!.id || d.user_id === users.member5!.id)).toBe(false);

    // The alerts page's API: members see it (published), the referee too (shared), the other referee not.
    const list = async (who: string) => (await (await alertsRoute(await requestAs(users[who]!.id, "/api/alerts"))).json()).alerts as { id: number }[];
    expect((await list("member")).map((a) => a.id)).toEqual([alert.id]);
    expect((await list("referee")).map((a) => a.id)).toEqual([alert.id]);
    expect(await list("otherReferee")).toEqual([]);
    const watch = (await (await watchGetRoute(await requestAs(users.member!.id, `/api/analyses/${rootId}/watch`), params(rootId))).json()).watch;
    expect(watch.runs).toEqual([expect.objectContaining({ datasetVersion: 2, status: "evaluated", previousAnalysisId: rootId, runAnalysisId: alert.run_analysis_id })]);
  }, 180_000);

  it("sends the digest subscriber one message with the day's alerts when the digest runs", async () => {
    expect(await queueDailyDigests()).toBe(1);
    const digest = await waitFor("the digest", async () => inbox().find((m) => m.envelope.to[0] === users.member3!.email));
    expect(digest.mail.subject).toMatch(/^\[Siderea\] Daily digest \d{4}-\d\d-\d\d: 1 alert \(preliminary\)$/);
    expect(digest.mail.text).toContain("1 alert was raised on your subscriptions since the last digest.");
    expect(await queueDailyDigests()).toBe(0);
  }, 60_000);

  it("raises nothing when a batch without new signal is appended", async () => {
    const before = inbox().length;
    const job = await append(generateDemoCsv({ n: 300, seed: 43, clusterFraction: 0, fromMs: LATER_MS + 60 * DAY_MS, toMs: LATER_MS + 80 * DAY_MS, idPrefix: "C-" }), "quiet.csv");
    const run = await waitFor("the rerun on version 3 to be evaluated", async () => ((await watchRunOf(3))?.status === "evaluated" ? watchRunOf(3) : undefined));
    expect(await uploadStatus(job)).toBe("done");
    expect(run!.comparison).toMatchObject({ previousVersion: 2, newAlerts: 0, updates: 0 });
    expect(await q("SELECT id FROM alerts")).toHaveLength(1);
    expect(await q("SELECT id FROM alert_deliveries")).toHaveLength(4);
    await new Promise((r) => setTimeout(r, 2000));
    expect(inbox()).toHaveLength(before);
  }, 120_000);
});

describe("the unsubscribe link", () => {
  it("works once without signing in, then says it was used (409)", async () => {
    const mail = inbox().find((m) => m.envelope.to[0] === users.member!.email)!.mail;
    const token = /\/unsubscribe\?token=([\w-]+\.[\w-]+)/.exec(mail.text!)![1]!;
    expect(await inspectUnsubscribeLink(token)).toMatchObject({ state: "valid", subscriptionId: subs.member });
    const first = await unsubscribeRoute(await json(null, "/api/subscriptions/unsubscribe", { token }));
    expect(first.status).toBe(200);
    expect((await first.json()).message).toBe("You no longer receive alerts of “Watched scan”.");
    expect(await q("SELECT id FROM subscriptions WHERE id = :id", { id: subs.member })).toHaveLength(0);
    const second = await unsubscribeRoute(await json(null, "/api/subscriptions/unsubscribe", { token }));
    expect(second.status).toBe(409);
    expect(await inspectUnsubscribeLink(token)).toEqual({ state: "used" });
    // One-click from a mail client (RFC 8058): the token in the query, a form body.
    const tampered = `${token.slice(0, -2)}${token.endsWith("A") ? "B" : "A"}A`;
    const bad = await unsubscribeRoute(new Request(`http://127.0.0.1:3000/api/subscriptions/unsubscribe?token=${tampered}`, { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded" }, body: "List-Unsubscribe=One-Click" }));
    expect(bad.status).toBe(400);
  });

  it("expires: the e-mail's link is refused after its date, and an expired link is answered 410", async () => {
    const mail = inbox().find((m) => m.envelope.to[0] === users.member2!.email)!.mail;
    const token = /\/unsubscribe\?token=([\w-]+\.[\w-]+)/.exec(mail.text!)![1]!;
    const check = verifyLink(linkSecret(), token, "unsubscribe");
    expect(check.ok).toBe(true);
    if (!check.ok) return;
    // 30 days by default (SIDEREA_UNSUBSCRIBE_LINK_DAYS).
    expect(check.payload.expiresAtS - Date.now() / 1000).toBeGreaterThan(29.9 * 86_400);
    expect(verifyLink(linkSecret(), token, "unsubscribe", check.payload.expiresAtS + 1)).toEqual({ ok: false, reason: "expired" });
    const expired = signLink(linkSecret(), { purpose: "unsubscribe", subscriptionId: subs.member2!, userId: users.member2!.id, expiresAtS: Math.floor(Date.now() / 1000) - 1 });
    const r = await unsubscribeRoute(await json(null, "/api/subscriptions/unsubscribe", { token: expired }));
    expect(r.status).toBe(410);
    expect((await r.json()).error.code).toBe("gone");
    expect(await q("SELECT id FROM subscriptions WHERE id = :id", { id: subs.member2 })).toHaveLength(1);
  });
});

describe("a dead SMTP server", () => {
  it("never blocks the append; the alert waits in its delivery rows and is sent after the server returns", async () => {
    await sink!.close();
    sink = null;
    const before = inbox().length;
    // Version 4: a strong further rise of the cluster: an update of the alert (at least 1σ more).
    const job = await append(generateDemoCsv({ n: 1500, seed: 44, clusterFraction: 0.1, fromMs: LATER_MS + 80 * DAY_MS, toMs: LATER_MS + 140 * DAY_MS, idPrefix: "D-" }), "rise.csv");
    await waitFor("the append to finish", async () => (await uploadStatus(job)) === "done");
    await waitFor("the rerun on version 4 to be evaluated", async () => (await watchRunOf(4))?.status === "evaluated");
    const [update] = await q<{ id: number; kind: string; parent_alert_id: number; previous_announced_sigma: number; local_sigma: number }>("SELECT * FROM alerts WHERE dataset_version = 4");
    expect(update).toMatchObject({ kind: "update" });
    expect(update!.local_sigma - update!.previous_announced_sigma).toBeGreaterThanOrEqual(1);
    const failing = await waitFor("failed attempts on the pending deliveries", async () => {
      const rows = await q<{ state: string; attempts: number; last_error: string | null; user_id: number }>("SELECT state, attempts, last_error, user_id FROM alert_deliveries WHERE alert_id = :a AND delivery = 'immediate'", { a: update!.id });
      return rows.length === 2 && rows.every((r) => r.state === "pending" && r.attempts >= 2 && r.last_error) ? rows : undefined;
    }, 60_000);
    // The unsubscribed member gets nothing; member2 (all published) and the referee wait.
    expect(failing.map((r) => r.user_id).sort()).toEqual([users.member2!.id, users.referee!.id].sort());
    expect(inbox()).toHaveLength(before);

    sink = await startSmtpSink({ port: SMTP_PORT, dir: SINK_DIR });
    const arrived = await waitFor("the waiting messages after the restart", async () => (inbox().length >= before + 2 ? inbox().slice(before) : undefined), 90_000);
    expect(arrived.map((m) => m.envelope.to[0]).sort()).toEqual([users.member2!.email, users.referee!.email].sort());
    for (const { mail } of arrived) expect(mail.subject).toMatch(/^\[Siderea\] Update: Watched scan/);
    const rows = await q<{ state: string; delivery: string }>("SELECT state, delivery FROM alert_deliveries WHERE alert_id = :a ORDER BY delivery", { a: update!.id });
    // The two immediate ones sent; the digest subscriber's waits for the next digest.
    expect(rows).toEqual([{ state: "sent", delivery: "immediate" }, { state: "sent", delivery: "immediate" }, { state: "pending", delivery: "daily-digest" }]);
  }, 240_000);
});
