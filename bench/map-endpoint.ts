/**
 * Benchmark: the binary map endpoint serving an Nside 256 significance map (786,432 Float32,
 * 3 MiB) to a signed-in analyst: the route handler called in process with a real Request and
 * a session cookie, against PostgreSQL (HTTP transfer not included). Own database.
 *
 *   npm run --silent bench:map-endpoint      (needs the local PostgreSQL: npm run db -- start)
 */
import { freshBenchDatabase } from "./bench-db";
import { encode } from "next-auth/jwt";

const DB = "siderea_bench_maps";
await freshBenchDatabase(DB);

const { getDb, closeDb } = await import("@/lib/db");
const { authSecret } = await import("@/lib/env");
const { GET } = await import("@/app/api/analyses/[id]/maps/[layer]/route");
const { sequelize, models } = getDb();
const user = await models.User.create({ email: "bench@bench.test", name: "Bench", role: "analyst", passwordHash: "x", disabledAt: null });
const site = await models.Site.create({ name: "Bench site", latitudeDeg: -35, longitudeDeg: -69, heightM: 0, zenithMaxDeg: 60, azimuthConvention: "north-clockwise", areaKm2: null, notes: "", createdBy: user.id });
const dataset = await models.Dataset.create({ name: "bench", siteId: site.id, ownerId: user.id, status: "ready", contentHash: "0".repeat(64), timeStart: null, timeEnd: null, blindSeed: null, unblindedAt: null, summary: null });
const analysis = await models.Analysis.create({
  name: "bench", kind: "hotspot", ownerId: user.id, datasetId: dataset.id, datasetVersion: 1, datasetHash: "0".repeat(64), settings: {}, settingsHash: "0".repeat(64),
  codeVersion: "bench", seed: "1", status: "done", error: null, summary: {}, startedAt: null, finishedAt: null, publishedAt: null,
});
const nside = 256;
const values = Float32Array.from({ length: 12 * nside * nside }, (_, i) => Math.sin(i));
await sequelize.query("INSERT INTO analysis_maps (analysis_id, layer, nside, unit, data) VALUES ($1, 'significance', $2, 'sigma', $3)", {
  bind: [analysis.id, nside, Buffer.from(values.buffer)],
});
const token = await encode({ token: { sub: String(user.id) }, secret: authSecret() });
const times: number[] = [];
for (let i = 0; i < 40; i++) {
  const t0 = performance.now();
  const response = await GET(new Request(`http://127.0.0.1:3000/api/analyses/${analysis.id}/maps/significance`, { headers: { cookie: `next-auth.session-token=${token}` } }), {
    params: Promise.resolve({ id: String(analysis.id), layer: "significance" }),
  });
  const bytes = (await response.arrayBuffer()).byteLength;
  times.push(performance.now() - t0);
  if (bytes !== 12 * nside * nside * 4) throw new Error(`wrong length ${bytes}: status ${response.status}`);
}
times.sort((a, b) => a - b);
const warm = times.slice(0, 35);
console.log(JSON.stringify({
  name: "map-endpoint nside 256 significance (in process, warm)",
  n: 40, bytes: 12 * nside * nside * 4,
  medianMs: +warm[Math.floor(warm.length / 2)]!.toFixed(1), p90Ms: +times[Math.floor(times.length * 0.9)]!.toFixed(1), maxMs: +times[times.length - 1]!.toFixed(1),
  peakRssMiB: Math.round(process.memoryUsage().rss / 2 ** 20),
}));
await closeDb();
