import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes } from "sequelize";
import { useTestDatabase } from "./database";
import { makeUser, requestAs } from "./auth-helpers";
import { GET as coverageRoute } from "@/app/api/coverage/route";
import { GET as listConfigurations, POST as createConfiguration } from "@/app/api/coverage/configurations/route";
import { DELETE as deleteConfiguration, GET as getConfiguration, PUT as putConfiguration } from "@/app/api/coverage/configurations/[id]/route";
import { POST as createAnalysisRoute } from "@/app/api/analyses/route";
import { GET as detailRoute } from "@/app/api/analyses/[id]/route";
import { POST as reproduceRoute } from "@/app/api/analyses/[id]/reproductions/route";
import { getDb } from "@/lib/db";
import { ingestDemoDataset } from "./demo-dataset";
import { HttpError } from "@/lib/http";
import { stopBoss } from "@/lib/jobs/queue";
import { runAnalysisJob, runReproductionJob } from "@/lib/services/analysis-jobs";
import { observedAgainstExpected } from "@/lib/services/coverage-observed";
import { findActiveUser } from "@/lib/services/users";
import { DEMO_SITE } from "@/lib/demo/generate";
import { canonicalJson, sha256Hex } from "@/lib/analyses/canonical";
import { expectClose } from "../unit/helpers";

useTestDatabase();
const users: Record<string, number> = {};
let datasetId: number;

const json = (userId: number | null, url: string, method: string, body: unknown) =>
  requestAs(userId, url, { method, body: JSON.stringify(body), headers: { "content-type": "application/json" } });
const idParams = (id: number) => ({ params: Promise.resolve({ id: String(id) }) });
const CONFIG = { name: "Test array, 60° cut", latitudeDeg: DEMO_SITE.latitudeDeg, zenithMaxDeg: 60, areaKm2: 100, liveTimeYr: 2, efficiency: { kind: "full", aboveEnergyEeV: 8 }, notes: "" };

beforeAll(async () => {
  for (const role of ["admin", "analyst", "referee", "member"] as const) users[role] = (await makeUser(role)).id;
  users.otherAnalyst = (await makeUser("analyst")).id;
  ({ datasetId } = await ingestDemoDataset(users.analyst!, "coverage-test", { n: 3000, seed: 21, clusterFraction: 0.01, idPrefix: "C-" }));
}, 60_000);

afterAll(async () => {
  await stopBoss();
});

describe("GET /api/coverage", () => {
  it("answers a member with the curve, the band and sky fraction of the geometry (METHODS: lat -35.2°, cut 60° covers dec < +24.8°, 71.0%)", async () => {
    const r = await coverageRoute(await requestAs(users.member!, "/api/coverage?lat=-35.2&zenithMax=60&nside=16"));
    expect(r.status).toBe(200);
    const body = await r.json();
    expect(body.band.decMinDeg).toBe(-90);
    expectClose(body.band.decMaxDeg, -35.2 + 60, 1e-12, "band edge lat + zenith_max");
    expectClose(body.skyFraction, (Math.sin((24.8 * Math.PI) / 180) + 1) / 2, 1e-12, "sky fraction formula");
    expectClose(body.skyFraction, 0.710, 5e-4, "METHODS 71.0%");
    expect(body.curve.decDeg).toHaveLength(181);
    expect(Math.max(...body.curve.exposure)).toBeCloseTo(1, 6);
    expect(body.curve.exposure[body.curve.decDeg.indexOf(30)]).toBe(0);
    expect(body.map).toMatchObject({ nside: 16, ordering: "RING", coordsys: "C", pixels: 3072 });
    expect(r.headers.get("etag")).toMatch(/^"cov-[0-9a-f]{32}"$/);
    expect(r.headers.get("cache-control")).toMatch(/max-age=/);
  });

  it("serves the map as Float32 RING with the HEALPix headers; its sum times the pixel area is the curve's integral", async () => {
    const r = await coverageRoute(await requestAs(users.referee!, "/api/coverage?lat=-31.4&zenithMax=60&nside=32&format=binary"));
    expect(r.status).toBe(200);
    expect(r.headers.get("x-healpix-nside")).toBe("32");
    expect(r.headers.get("x-healpix-ordering")).toBe("RING");
    expect(r.headers.get("x-healpix-coordsys")).toBe("C");
    const values = new Float32Array(await r.arrayBuffer());
    expect(values.length).toBe(12 * 32 * 32);
    const meta = await (await coverageRoute(await requestAs(users.referee!, "/api/coverage?lat=-31.4&zenithMax=60&nside=32"))).json();
    const sum = values.reduce((a, b) => a + b, 0) * (Math.PI / (3 * 32 * 32)); // pixel area pi / (3 Nside^2) sr (Gorski et al. 2005)
    expectClose(sum, meta.relativeIntegralSr, 5e-3 * meta.relativeIntegralSr, "map sum against curve integral");
  });

  it("answers 304 to a matching If-None-Match and gives absolute figures with an area and a live time (A T pi sin^2 zm)", async () => {
    const first = await coverageRoute(await requestAs(users.member!, "/api/coverage?lat=10&zenithMax=45&nside=8&areaKm2=100&liveTimeYr=2"));
    const etag = first.headers.get("etag")!;
    const body = await first.json();
    expectClose(body.absolute.totalKm2SrYr, 100 * 2 * Math.PI * Math.sin(Math.PI / 4) ** 2, 1e-9, "total exposure");
    const again = await coverageRoute(await requestAs(users.member!, "/api/coverage?lat=10&zenithMax=45&nside=8&areaKm2=100&liveTimeYr=2", { headers: { "if-none-match": etag } }));
    expect(again.status).toBe(304);
  });

  it("refuses bad input with 422 naming the parameter, and anonymous callers with 401", async () => {
    const cases: [string, string][] = [
      ["lat=91&zenithMax=60", "lat"], ["lat=-90.5&zenithMax=60", "lat"], ["zenithMax=60", "lat"], ["lat=abc&zenithMax=60", "lat"],
      ["lat=0&zenithMax=0", "zenithMax"], ["lat=0&zenithMax=90.1", "zenithMax"], ["lat=0&zenithMax=-5", "zenithMax"],
      ["lat=0&zenithMax=60&nside=3", "nside"], ["lat=0&zenithMax=60&nside=512", "nside"], ["lat=0&zenithMax=60&nside=16.5", "nside"],
    ];
    for (const [query, path] of cases) {
      const r = await coverageRoute(await requestAs(users.member!, `/api/coverage?${query}`));
      expect(r.status, query).toBe(422);
      const body = await r.json();
      expect(body.error.code).toBe("validation_failed");
      expect(body.error.issues.map((i: { path: string }) => i.path), query).toEqual([path]);
    }
    expect((await coverageRoute(await requestAs(users.member!, "/api/coverage?lat=90&zenithMax=90"))).status).toBe(200);
    expect((await coverageRoute(await requestAs(null, "/api/coverage?lat=0&zenithMax=60"))).status).toBe(401);
  });
});

describe("saved coverage configurations", () => {
  let configId: number;

  it("lets an analyst save one (201, audited) and every signed-in role read it; refuses referees and members saving (403)", async () => {
    const r = await createConfiguration(await json(users.analyst!, "/api/coverage/configurations", "POST", CONFIG));
    expect(r.status).toBe(201);
    const { configuration } = await r.json();
    expect(configuration).toMatchObject({ name: CONFIG.name, latitudeDeg: CONFIG.latitudeDeg, zenithMaxDeg: 60, areaKm2: 100, liveTimeYr: 2, efficiency: { kind: "full", aboveEnergyEeV: 8 } });
    configId = configuration.id;
    for (const role of ["referee", "member"]) {
      const refused = await createConfiguration(await json(users[role]!, "/api/coverage/configurations", "POST", { ...CONFIG, name: `by ${role}` }));
      expect(refused.status, role).toBe(403);
      expect((await refused.json()).error.code).toBe("forbidden");
      const list = await (await listConfigurations(await requestAs(users[role]!, "/api/coverage/configurations"))).json();
      expect(list.configurations.map((c: { id: number }) => c.id)).toContain(configId);
      expect((await getConfiguration(await requestAs(users[role]!, `/api/coverage/configurations/${configId}`), idParams(configId))).status).toBe(200);
      expect((await putConfiguration(await json(users[role]!, `/api/coverage/configurations/${configId}`, "PUT", CONFIG), idParams(configId))).status).toBe(403);
      expect((await deleteConfiguration(await requestAs(users[role]!, `/api/coverage/configurations/${configId}`, { method: "DELETE" }), idParams(configId))).status).toBe(403);
    }
    expect((await listConfigurations(await requestAs(null, "/api/coverage/configurations"))).status).toBe(401);
    const entry = await getDb().models.AuditEntry.findOne({ where: { action: "coverage.create", targetId: String(configId) } });
    expect(entry).not.toBeNull();
  });

  it("checks the parameters (422 with paths), refuses a duplicate name (409) and another analyst's edit (403)", async () => {
    const bad = await createConfiguration(await json(users.analyst!, "/api/coverage/configurations", "POST", {
      ...CONFIG, name: "", latitudeDeg: 95, zenithMaxDeg: 0, efficiency: { kind: "table", zenithDeg: [0, 50, 40], efficiency: [1, 0.5, 0.2] },
    }));
    expect(bad.status).toBe(422);
    const paths = (await bad.json()).error.issues.map((i: { path: string }) => i.path).sort();
    expect(paths).toEqual(["efficiency.zenithDeg.2", "latitudeDeg", "name", "zenithMaxDeg"]);
    expect((await createConfiguration(await json(users.analyst!, "/api/coverage/configurations", "POST", CONFIG))).status).toBe(409);
    expect((await putConfiguration(await json(users.otherAnalyst!, `/api/coverage/configurations/${configId}`, "PUT", CONFIG), idParams(configId))).status).toBe(403);
    expect((await putConfiguration(await json(users.admin!, `/api/coverage/configurations/${configId}`, "PUT", { ...CONFIG, notes: "checked by admin" }), idParams(configId))).status).toBe(200);
  });

  it("is used as an analysis's exposure: copied into the settings, the same numbers as Sommers at that latitude, unchanged by a later edit", async () => {
    const base = { kind: "hotspot", datasetId, zenithMaxDeg: 45, energyThresholdsEeV: [], nside: 16, radiiDeg: [15], exposure: "sommers", nSkies: 20, seed: 777 };
    // Without a configuration: the settings as before (no coverage key), hashed as before.
    const plain = await createAnalysisRoute(await json(users.analyst!, "/api/analyses", "POST", { name: "plain", settings: { ...base, zenithMaxDeg: 60 } }));
    expect(plain.status).toBe(202);
    const plainId = (await plain.json()).analysis.id;
    const plainRow = await getDb().models.Analysis.findByPk(plainId);
    expect(Object.keys(plainRow!.settings as object)).not.toContain("coverage");
    expect(plainRow!.settingsHash).toBe(sha256Hex(canonicalJson(plainRow!.settings)));

    const withCoverage = await createAnalysisRoute(await json(users.analyst!, "/api/analyses", "POST", { name: "with coverage", settings: { ...base, coverageConfigurationId: configId } }));
    expect(withCoverage.status).toBe(202);
    const coverageId = (await withCoverage.json()).analysis.id;
    const row = await getDb().models.Analysis.findByPk(coverageId);
    const settings = row!.settings as Record<string, unknown>;
    expect(settings.zenithMaxDeg).toBe(60); // set by the configuration, not the 45 sent
    expect(settings.coverage).toEqual({ configurationId: configId, name: CONFIG.name, latitudeDeg: CONFIG.latitudeDeg, zenithMaxDeg: 60, efficiency: { kind: "full", aboveEnergyEeV: 8 } });

    await runAnalysisJob(plainId);
    await runAnalysisJob(coverageId);
    const a = (await (await detailRoute(await requestAs(users.analyst!, `/api/analyses/${plainId}`), idParams(plainId))).json()).analysis;
    const b = (await (await detailRoute(await requestAs(users.analyst!, `/api/analyses/${coverageId}`), idParams(coverageId))).json()).analysis;
    expect(b.status).toBe("done");
    // Full efficiency at the site's own latitude is Sommers' closed form: identical numbers.
    expect(b.summary.best.localSignificance).toBe(a.summary.best.localSignificance);
    expect(b.summary.best.postTrial).toEqual(a.summary.best.postTrial);
    expect(b.summary.coverageConfiguration).toMatchObject({ id: configId, name: CONFIG.name });

    // Editing the configuration later does not change the analysis: it kept its copy and still reproduces.
    expect((await putConfiguration(await json(users.analyst!, `/api/coverage/configurations/${configId}`, "PUT", { ...CONFIG, latitudeDeg: 10, zenithMaxDeg: 30 }), idParams(configId))).status).toBe(200);
    const again = await getDb().models.Analysis.findByPk(coverageId);
    expect((again!.settings as { coverage: { latitudeDeg: number } }).coverage.latitudeDeg).toBe(CONFIG.latitudeDeg);
    const rep = await reproduceRoute(await requestAs(users.analyst!, `/api/analyses/${coverageId}/reproductions`, { method: "POST" }), idParams(coverageId));
    expect(rep.status).toBe(202);
    await runReproductionJob((await rep.json()).reproduction.id);
    const detail = (await (await detailRoute(await requestAs(users.analyst!, `/api/analyses/${coverageId}`), idParams(coverageId))).json()).analysis;
    expect(detail.reproductions[0].comparison.match).toBe(true);

    // A configuration with time scrambling is refused; an unknown configuration is a 422.
    const scrambled = await createAnalysisRoute(await json(users.analyst!, "/api/analyses", "POST", { name: "x", settings: { ...base, exposure: "scrambled", coverageConfigurationId: configId } }));
    expect(scrambled.status).toBe(422);
    const missing = await createAnalysisRoute(await json(users.analyst!, "/api/analyses", "POST", { name: "x", settings: { ...base, coverageConfigurationId: 99999 } }));
    expect(missing.status).toBe(422);
    expect((await missing.json()).error.issues[0].path).toBe("settings.coverageConfigurationId");
  }, 120_000);

  it("runs an analysis whose exposure is a configuration with an efficiency table: same band, a different exposure map", async () => {
    const table = await createConfiguration(await json(users.analyst!, "/api/coverage/configurations", "POST", {
      ...CONFIG, name: "Efficiency falling with zenith", efficiency: { kind: "table", zenithDeg: [0, 30, 60], efficiency: [1, 1, 0.3] },
    }));
    expect(table.status).toBe(201);
    const tableId = (await table.json()).configuration.id;
    const base = { kind: "hotspot", datasetId, zenithMaxDeg: 60, energyThresholdsEeV: [], nside: 16, radiiDeg: [15], exposure: "sommers", nSkies: 20, seed: 778 };
    const ids: number[] = [];
    for (const settings of [base, { ...base, coverageConfigurationId: tableId }]) {
      const r = await createAnalysisRoute(await json(users.analyst!, "/api/analyses", "POST", { name: "exposure map", settings }));
      ids.push((await r.json()).analysis.id);
      await runAnalysisJob(ids[ids.length - 1]!);
    }
    const maps = await Promise.all(ids.map(async (id) => {
      const [row] = await getDb().sequelize.query<{ data: Buffer }>("SELECT data FROM analysis_maps WHERE analysis_id = :id AND layer = 'exposure'", { replacements: { id }, type: QueryTypes.SELECT });
      return new Float32Array(row!.data.buffer.slice(row!.data.byteOffset, row!.data.byteOffset + row!.data.byteLength));
    }));
    const detail = (await (await detailRoute(await requestAs(users.analyst!, `/api/analyses/${ids[1]}`), idParams(ids[1]!))).json()).analysis;
    expect(detail.status).toBe("done");
    expect(detail.summary.coverageConfiguration).toMatchObject({ name: "Efficiency falling with zenith", efficiency: "table" });
    // Same band (the cut is the same), a different shape inside it.
    for (let p = 0; p < maps[0]!.length; p++) expect(maps[1]![p]! > 0, `pixel ${p}`).toBe(maps[0]![p]! > 0);
    expect(Array.from(maps[0]!)).not.toEqual(Array.from(maps[1]!));
  }, 120_000);

  it("lets the owner delete it (204)", async () => {
    const extra = await (await createConfiguration(await json(users.analyst!, "/api/coverage/configurations", "POST", { ...CONFIG, name: "to delete" }))).json();
    const r = await deleteConfiguration(await requestAs(users.analyst!, `/api/coverage/configurations/${extra.configuration.id}`, { method: "DELETE" }), idParams(extra.configuration.id));
    expect(r.status).toBe(204);
    expect((await getConfiguration(await requestAs(users.analyst!, `/api/coverage/configurations/${extra.configuration.id}`), idParams(extra.configuration.id))).status).toBe(404);
  });
});

describe("observed against expected for a dataset", () => {
  it("counts the events inside the cut, compares them and words a verdict; members and referees are refused", async () => {
    const analyst = (await findActiveUser(users.analyst!))!;
    const r = (await observedAgainstExpected(analyst, datasetId))!;
    const [row] = await getDb().sequelize.query<{ n: string }>("SELECT count(*) AS n FROM events WHERE dataset_id = :id AND zenith_deg <= 60", { replacements: { id: datasetId }, type: QueryTypes.SELECT });
    expect(r.n).toBe(Number(row!.n));
    for (const h of [r.declination.counts, r.rightAscension.counts, r.sidereal.counts, r.solar.counts]) expect(h.reduce((a, b) => a + b, 0)).toBe(r.n);
    expect(r.declination.counts.slice(-11).every((c) => c === 0)).toBe(true); // dec > +35°: outside the band (+28.6°)
    expect(r.verdict.text.length).toBeGreaterThan(20);
    for (const p of [r.declination.chiSquare.pValue, r.declination.ks.pValue, r.sidereal.chiSquare.pValue]) expect(p).toBeGreaterThanOrEqual(0);
    for (const role of ["member", "referee"]) {
      const u = (await findActiveUser(users[role]!))!;
      await expect(observedAgainstExpected(u, datasetId)).rejects.toMatchObject({ status: 403 });
    }
    await expect(observedAgainstExpected(analyst, 999999)).rejects.toBeInstanceOf(HttpError);
  });
});
