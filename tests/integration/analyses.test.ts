import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "./database";
import { makeUser, requestAs } from "./auth-helpers";
import { GET as listRoute, POST as createRoute } from "@/app/api/analyses/route";
import { GET as detailRoute } from "@/app/api/analyses/[id]/route";
import { GET as mapRoute } from "@/app/api/analyses/[id]/maps/[layer]/route";
import { POST as publishRoute } from "@/app/api/analyses/[id]/publish/route";
import { POST as shareRoute } from "@/app/api/analyses/[id]/share/route";
import { POST as reproduceRoute } from "@/app/api/analyses/[id]/reproductions/route";
import { GET as bundleRoute } from "@/app/api/analyses/[id]/bundle/route";
import { getDb } from "@/lib/db";
import { ingestDemoDataset } from "./demo-dataset";
import { stopBoss } from "@/lib/jobs/queue";
import { runAnalysisJob, runReproductionJob } from "@/lib/services/analysis-jobs";
import { liMaSignificanceFromFraction } from "@/lib/sky/lima";
import { afterAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

useTestDatabase();
const users: Record<string, { id: number; email: string }> = {};
let datasetId: number;
let hotspotId: number;

const json = (userId: number | null, url: string, body: unknown) =>
  requestAs(userId, url, { method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json" } });
const params = (id: number, extra: Record<string, string> = {}) => ({ params: Promise.resolve({ id: String(id), layer: "", ...extra }) });

beforeAll(async () => {
  for (const role of ["analyst", "referee", "member"] as const) users[role] = await makeUser(role);
  users.otherReferee = await makeUser("referee");
  ({ datasetId } = await ingestDemoDataset(users.analyst!.id, "analysis-test", { n: 3000, seed: 7, clusterFraction: 0.05, idPrefix: "T-" }));
}, 60_000);

afterAll(async () => {
  await stopBoss();
});

const SETTINGS = { kind: "hotspot", zenithMaxDeg: 60, energyThresholdsEeV: [], nside: 16, radiiDeg: [10, 20], exposure: "sommers", nSkies: 20, seed: 12345 };

describe("hotspot analyses, saved and reproduced", () => {
  it("refuses a referee and a member starting an analysis (403), and checks the settings (422)", async () => {
    for (const role of ["referee", "member"]) {
      const r = await createRoute(await json(users[role]!.id, "/api/analyses", { name: "x", settings: { ...SETTINGS, datasetId } }));
      expect(r.status).toBe(403);
    }
    const bad = await createRoute(await json(users.analyst!.id, "/api/analyses", { name: "", settings: { ...SETTINGS, datasetId, nside: 17, radiiDeg: [] } }));
    expect(bad.status).toBe(422);
    const paths = (await bad.json()).error.issues.map((i: { path: string }) => i.path).sort();
    expect(paths).toEqual(["name", "settings.nside", "settings.radiiDeg"]);
  });

  it("queues a scan with its settings hash and the dataset version's content hash, then runs it", async () => {
    const r = await createRoute(await json(users.analyst!.id, "/api/analyses", { name: "Cluster search", purpose: "test", settings: { ...SETTINGS, datasetId } }));
    expect(r.status).toBe(202);
    const { analysis } = await r.json();
    hotspotId = analysis.id;
    expect(analysis.settingsHash).toMatch(/^[0-9a-f]{64}$/);
    await runAnalysisJob(hotspotId);
    const detail = (await (await detailRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).json()).analysis;
    expect(detail.status).toBe("done");
    expect(detail.dataset.version).toBe(1);
    const dv = await getDb().models.Dataset.findByPk(datasetId);
    expect(detail.dataset.contentHash).toBe(dv!.contentHash);
    const best = detail.summary.best;
    expect(best.postTrial.nSkies).toBe(20);
    expect(detail.summary.trials.radiiDeg).toEqual([10, 20]);
    // The headline window's significance is Li & Ma eq. 17 of its own counts (independent recomputation).
    const f = best.nExpected / detail.summary.nEvents;
    expect(Math.abs(liMaSignificanceFromFraction(best.nOn, detail.summary.nEvents, f) - best.localSignificance)).toBeLessThan(1e-5);
    expect(detail.summary.caution).toMatch(/Preliminary/);
  }, 120_000);

  it("serves each result map as 12 Nside^2 Float32 values with its Nside and ordering", async () => {
    for (const layer of ["counts", "expected", "excess", "significance", "exposure"]) {
      const r = await mapRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/maps/${layer}`), params(hotspotId, { layer }));
      expect(r.status).toBe(200);
      expect(r.headers.get("x-healpix-nside")).toBe("16");
      expect(r.headers.get("x-healpix-ordering")).toBe("RING");
      expect((await r.arrayBuffer()).byteLength).toBe(12 * 16 * 16 * 4);
    }
    // The binary body (read by binary COPY) holds the very bytes PostgreSQL stores, read here by a plain SELECT.
    const served = new Uint8Array(await (await mapRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/maps/significance`), params(hotspotId, { layer: "significance" }))).arrayBuffer());
    const [stored] = await getDb().sequelize.query<{ data: Buffer }>("SELECT data FROM analysis_maps WHERE analysis_id = $1 AND layer = 'significance'", { bind: [hotspotId], type: QueryTypes.SELECT });
    expect(Buffer.from(served).equals(stored!.data)).toBe(true);
    const csv = await (await mapRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/maps/significance?format=csv`), params(hotspotId, { layer: "significance" }))).text();
    expect(csv.trim().split("\n")).toHaveLength(1 + 12 * 16 * 16);
    const fits = await mapRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/maps/significance?format=fits`), params(hotspotId, { layer: "significance" }));
    expect((await fits.arrayBuffer()).byteLength % 2880).toBe(0);
    const j = await (await mapRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/maps/counts?format=json`), params(hotspotId, { layer: "counts" }))).json();
    expect(j).toMatchObject({ nside: 16, ordering: "RING", coordsys: "C" });
    expect(j.values).toHaveLength(12 * 16 * 16);
    const bad = await mapRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/maps/colour`), params(hotspotId, { layer: "colour" }));
    expect(bad.status).toBe(422);
  });

  it("lists the events of a pinned window: as many as the window's N_on", async () => {
    const { GET: windowRoute } = await import("@/app/api/analyses/[id]/window/route");
    const detail = (await (await detailRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).json()).analysis;
    const best = detail.summary.best;
    const r = await windowRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/window?ra=${best.raDeg}&dec=${best.decDeg}`), params(hotspotId));
    expect(r.status).toBe(200);
    const w = await r.json();
    // Counted by PostgreSQL's own trigonometry, independently of the scan's counter.
    expect(w.count).toBe(best.nOn);
    expect(w.mostEnergetic.length).toBeLessThanOrEqual(10);
  });

  it("hides an unshared analysis from a referee (403) and an unpublished one from a member (403)", async () => {
    expect((await detailRoute(await requestAs(users.referee!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).status).toBe(403);
    expect((await detailRoute(await requestAs(users.member!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).status).toBe(403);
    expect((await mapRoute(await requestAs(users.member!.id, `/api/analyses/${hotspotId}/maps/counts`), params(hotspotId, { layer: "counts" }))).status).toBe(403);
    const memberList = await (await listRoute(await requestAs(users.member!.id, "/api/analyses"))).json();
    expect(memberList.analyses).toEqual([]);
  });

  it("lets the shared referee read and reproduce it, with a match; another referee still cannot", async () => {
    expect((await shareRoute(await json(users.analyst!.id, `/api/analyses/${hotspotId}/share`, { email: users.referee!.email }), params(hotspotId))).status).toBe(200);
    expect((await detailRoute(await requestAs(users.referee!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).status).toBe(200);
    expect((await detailRoute(await requestAs(users.otherReferee!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).status).toBe(403);
    const r = await reproduceRoute(await requestAs(users.referee!.id, `/api/analyses/${hotspotId}/reproductions`, { method: "POST" }), params(hotspotId));
    expect(r.status).toBe(202);
    const { reproduction } = await r.json();
    await runReproductionJob(reproduction.id);
    const detail = (await (await detailRoute(await requestAs(users.referee!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).json()).analysis;
    const rep = detail.reproductions.find((x: { id: number }) => x.id === reproduction.id);
    expect(rep.status).toBe("done");
    expect(rep.comparison.match).toBe(true);
    expect(detail.audit.map((e: { action: string }) => e.action)).toEqual(expect.arrayContaining(["analysis.run", "analysis.share", "analysis.reproduce"]));
    // A referee may not publish or start analyses.
    expect((await publishRoute(await requestAs(users.referee!.id, `/api/analyses/${hotspotId}/publish`, { method: "POST" }), params(hotspotId))).status).toBe(403);
  }, 120_000);

  it("shows a mismatch when the saved numbers do not come back", async () => {
    const a = await getDb().models.Analysis.findByPk(hotspotId);
    const tampered = { ...a!.summary, nEvents: 1 };
    await getDb().sequelize.query("UPDATE analyses SET summary = :s WHERE id = :id", { replacements: { s: JSON.stringify(tampered), id: hotspotId } });
    const r = await reproduceRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/reproductions`, { method: "POST" }), params(hotspotId));
    const { reproduction } = await r.json();
    await runReproductionJob(reproduction.id);
    const detail = (await (await detailRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).json()).analysis;
    const rep = detail.reproductions.find((x: { id: number }) => x.id === reproduction.id);
    expect(rep.comparison.match).toBe(false);
    expect(rep.comparison.differences).toEqual([{ path: "nEvents", saved: 1, rerun: 3000 }]);
    await getDb().sequelize.query("UPDATE analyses SET summary = :s WHERE id = :id", { replacements: { s: JSON.stringify(a!.summary), id: hotspotId } });
  }, 120_000);

  it("publishes to members, and gives a bundle with the hashes and the seed", async () => {
    expect((await publishRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/publish`, { method: "POST" }), params(hotspotId))).status).toBe(200);
    expect((await detailRoute(await requestAs(users.member!.id, `/api/analyses/${hotspotId}`), params(hotspotId))).status).toBe(200);
    const again = await publishRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/publish`, { method: "POST" }), params(hotspotId));
    expect(again.status).toBe(409);
    const bundle = await (await bundleRoute(await requestAs(users.member!.id, `/api/analyses/${hotspotId}/bundle`), params(hotspotId))).json();
    expect(bundle.format).toBe("siderea-reproduction-bundle");
    expect(bundle.seed).toBe(12345);
    expect(bundle.dataset.contentHash).toMatch(/^[0-9a-f]{64}$/);
    expect(bundle.headline.best.postTrial.nSkies).toBe(20);
  });

  it("is reproduced from its bundle and the exported events by the command line (cli reproduce), and a changed event is caught", async () => {
    const { GET: eventsRoute } = await import("@/app/api/datasets/[id]/events.csv/route");
    const dir = mkdtempSync(join(tmpdir(), "siderea-repro-"));
    const bundle = await (await bundleRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/bundle`), params(hotspotId))).json();
    writeFileSync(join(dir, "bundle.json"), JSON.stringify(bundle));
    const events = await (await eventsRoute(await requestAs(users.analyst!.id, `/api/datasets/${datasetId}/events.csv`), { params: Promise.resolve({ id: String(datasetId) }) })).text();
    writeFileSync(join(dir, "events.csv"), events);
    const ok = spawnSync("node", ["scripts/cli.mjs", "reproduce", "--bundle", join(dir, "bundle.json"), "--events", join(dir, "events.csv")], { encoding: "utf8", timeout: 120_000 });
    expect(ok.stderr).toBe("");
    const out = JSON.parse(ok.stdout);
    expect(out.data.match).toBe(true);
    expect(out.differences).toEqual([]);
    expect(ok.status).toBe(0);
    // One zenith angle changed in the last row: the data hash no longer matches, exit code 3.
    const lines = events.trim().split("\n");
    const last = lines[lines.length - 1]!.split(",");
    last[2] = String(Number(last[2]) + 0.001);
    lines[lines.length - 1] = last.join(",");
    writeFileSync(join(dir, "events-changed.csv"), `${lines.join("\n")}\n`);
    const bad = spawnSync("node", ["scripts/cli.mjs", "reproduce", "--bundle", join(dir, "bundle.json"), "--events", join(dir, "events-changed.csv")], { encoding: "utf8", timeout: 120_000 });
    expect(bad.status).toBe(3);
    expect(JSON.parse(bad.stdout).data.match).toBe(false);
  }, 240_000);
});

describe("cancelling", () => {
  it("stops a running scan when an analyst cancels it, and says so", async () => {
    const { POST: cancelRoute } = await import("@/app/api/analyses/[id]/cancel/route");
    const r = await createRoute(await json(users.analyst!.id, "/api/analyses", { name: "Long", settings: { ...SETTINGS, datasetId, nside: 64, nSkies: 5000 } }));
    const { analysis } = await r.json();
    const job = runAnalysisJob(analysis.id);
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect((await cancelRoute(await requestAs(users.referee!.id, `/api/analyses/${analysis.id}/cancel`, { method: "POST" }), params(analysis.id))).status).toBe(403);
    expect((await cancelRoute(await requestAs(users.analyst!.id, `/api/analyses/${analysis.id}/cancel`, { method: "POST" }), params(analysis.id))).status).toBe(200);
    const started = Date.now();
    await job;
    expect(Date.now() - started).toBeLessThan(30_000);
    const detail = (await (await detailRoute(await requestAs(users.analyst!.id, `/api/analyses/${analysis.id}`), params(analysis.id))).json()).analysis;
    expect(detail.status).toBe("cancelled");
    expect(detail.summary).toBeNull();
    expect(detail.audit.map((e: { action: string }) => e.action)).toContain("analysis.cancel");
  }, 120_000);
});

describe("verifying a bundle with its events in the web app", () => {
  it("checks an uploaded bundle against the uploaded events CSV as a job, and refuses members (403)", async () => {
    const { POST: createVerification } = await import("@/app/api/verifications/route");
    const { POST: attachEvents } = await import("@/app/api/verifications/[id]/events/route");
    const { GET: getVerification } = await import("@/app/api/verifications/[id]/route");
    const { GET: eventsRoute } = await import("@/app/api/datasets/[id]/events.csv/route");
    const { runVerificationJob } = await import("@/lib/services/analysis-jobs");
    const bundle = await (await bundleRoute(await requestAs(users.analyst!.id, `/api/analyses/${hotspotId}/bundle`), params(hotspotId))).json();
    const events = await (await eventsRoute(await requestAs(users.analyst!.id, `/api/datasets/${datasetId}/events.csv`), { params: Promise.resolve({ id: String(datasetId) }) })).text();
    expect((await createVerification(await json(users.member!.id, "/api/verifications", bundle))).status).toBe(403);
    const bad = await createVerification(await json(users.referee!.id, "/api/verifications", { hello: "world" }));
    expect(bad.status).toBe(422);
    const created = await createVerification(await json(users.referee!.id, "/api/verifications", bundle));
    expect(created.status).toBe(201);
    const { verification } = await created.json();
    const sent = await attachEvents(await requestAs(users.referee!.id, verification.events, { method: "POST", body: events, duplex: "half" } as RequestInit), params(verification.id));
    expect(sent.status).toBe(202);
    await runVerificationJob(verification.id);
    const v = (await (await getVerification(await requestAs(users.referee!.id, verification.url), params(verification.id))).json()).verification;
    expect(v.status).toBe("done");
    expect(v.result.data.match).toBe(true);
    expect(v.result.match).toBe(true);
    expect((await getVerification(await requestAs(users.otherReferee!.id, verification.url), params(verification.id))).status).toBe(403);
  }, 120_000);
});

describe("large-scale analyses", () => {
  it("fits the first harmonic and the dipole and reports the chance probability exp(-N r^2/4) (Linsley 1975)", async () => {
    const r = await createRoute(await json(users.analyst!.id, "/api/analyses", { name: "Dipole", settings: { ...SETTINGS, kind: "large-scale", datasetId } }));
    const { analysis } = await r.json();
    await runAnalysisJob(analysis.id);
    const detail = (await (await detailRoute(await requestAs(users.analyst!.id, `/api/analyses/${analysis.id}`), params(analysis.id))).json()).analysis;
    expect(detail.status).toBe("done");
    const { rayleigh, nEvents } = detail.summary;
    expect(Math.abs(rayleigh.p - Math.exp((-nEvents * rayleigh.amplitude ** 2) / 4)) / rayleigh.p).toBeLessThan(1e-6);
    expect(detail.summary.raHistogram.counts.reduce((a: number, b: number) => a + b, 0)).toBe(nEvents);
    expect(detail.summary.dipole.amplitude).toBeGreaterThan(0);
  }, 60_000);
});
