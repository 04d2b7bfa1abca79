/**
 * Benchmark: ingest 1,000,000 events from CSV into PostgreSQL end to end (store the upload,
 * parse, validate, convert, COPY, version hash, summary), in a database of its own.
 *
 *   npm run --silent bench:ingest            (needs the local PostgreSQL: npm run db -- start)
 *
 * Prints one JSON line: {name, n, seconds, ratePerSecond, peakRssMiB, phases}.
 */
import { execFileSync } from "node:child_process";
import { createReadStream, existsSync } from "node:fs";
import { Readable } from "node:stream";
import { freshBenchDatabase } from "./bench-db";

const N = Number(process.env.BENCH_N ?? 1_000_000);
const FILE = `bench/data/events-${N}.csv`;
const DB = "siderea_bench";

if (!existsSync(FILE)) execFileSync("./node_modules/.bin/tsx", ["bench/make-events.ts", "--n", String(N), "--out", FILE], { stdio: "inherit" });
await freshBenchDatabase(DB);

const { getDb, closeDb } = await import("@/lib/db");
const { receiveUpload } = await import("@/lib/services/uploads");
const { runIngest } = await import("@/lib/services/ingest");
const { models } = getDb();
const user = await models.User.create({ email: "bench@bench.test", name: "Bench", role: "analyst", passwordHash: "x", disabledAt: null });
const site = await models.Site.create({ name: "Bench site", latitudeDeg: -35.2, longitudeDeg: -69.3, heightM: 1400, zenithMaxDeg: 60, azimuthConvention: "north-clockwise", areaKm2: null, notes: "", createdBy: user.id });

let peak = 0;
const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 50);
const t0 = performance.now();
const id = await receiveUpload(Readable.toWeb(createReadStream(FILE)) as ReadableStream<Uint8Array>, {
  userId: user.id,
  datasetId: null,
  fileName: FILE,
  options: { mode: "new", name: "bench", siteId: site.id, mapping: { timeFormat: "iso", azimuthConvention: "north-clockwise", energyUnit: "EeV", columns: {} }, dropBadRows: false, blinded: false },
}, { queue: false });
const t1 = performance.now();
const outcome = await runIngest(id);
const t2 = performance.now();
clearInterval(sampler);
peak = Math.max(peak, process.memoryUsage().rss, process.resourceUsage().maxRSS * 1024);
if (outcome.status !== "done" || outcome.eventCount !== N) throw new Error(`ingest failed: ${JSON.stringify(outcome)}`);
console.log(JSON.stringify({
  name: "ingest-csv-to-postgresql",
  n: N,
  seconds: +((t2 - t0) / 1000).toFixed(2),
  ratePerSecond: Math.round(N / ((t2 - t0) / 1000)),
  peakRssMiB: Math.round(peak / 2 ** 20),
  phases: { receiveSeconds: +((t1 - t0) / 1000).toFixed(2), ...outcome.timings },
}));
// What an analysis job does first: read the stored version back into typed arrays, hash checked.
const { loadDatasetEvents } = await import("@/lib/services/event-arrays");
const dataset = await models.Dataset.findOne({ where: { name: "bench" } });
const t3 = performance.now();
const loaded = await loadDatasetEvents(dataset!.id, 1);
const t4 = performance.now();
if (loaded.events.n !== N) throw new Error(`loaded ${loaded.events.n} events, expected ${N}`);
console.log(JSON.stringify({ name: "load-dataset-version-for-analysis", n: N, seconds: +((t4 - t3) / 1000).toFixed(2), ratePerSecond: Math.round(N / ((t4 - t3) / 1000)) }));
await closeDb();
