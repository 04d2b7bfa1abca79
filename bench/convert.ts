/**
 * Benchmarks of the event pipeline on a simulated 1M-event CSV (bench/make-events.ts):
 * CSV read (streamed, parsed into typed arrays), horizontal -> ICRS conversion, ICRS ->
 * galactic, the convert command in process (no start-up), and `cli convert` end to end (spawned). One JSON line per measurement:
 * {name, n, seconds, ratePerSecond, peakRssMiB}.
 *
 *   npx tsx bench/convert.ts [--n 1000000] [--repeat 3]
 */
import { execFileSync, spawnSync } from "node:child_process";
import { createReadStream, createWriteStream, existsSync, statSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { horizontalToEquatorial, icrsToGalacticMatrix, vectorsToRotatedLonLatDeg } from "../lib/sky/coordinates";
import { EventCsvParser } from "../lib/sky/event-csv";
import { run as runConvert } from "../lib/cli/commands/convert";

const { values } = parseArgs({ options: { n: { type: "string", default: "1000000" }, repeat: { type: "string", default: "3" } } });
const n = Number(values.n), repeat = Number(values.repeat);
const root = join(import.meta.dirname, "..");
const file = join(root, "bench", "data", `events-${n}.csv`);
const tsx = join(root, "node_modules", ".bin", "tsx");
if (!existsSync(file)) execFileSync(tsx, ["bench/make-events.ts", "--n", String(n), "--out", file], { cwd: root, stdio: "inherit" });

const rssMiB = () => Math.round(process.resourceUsage().maxRSS / 1024);
const report = (name: string, count: number, seconds: number, peakRssMiB: number | null, extra: Record<string, unknown> = {}) =>
  console.log(JSON.stringify({ name, n: count, seconds: +seconds.toFixed(4), ratePerSecond: Math.round(count / seconds), peakRssMiB, ...extra }));
const best = <T>(f: () => Promise<T> | T) => async (): Promise<{ seconds: number; value: T }> => {
  let bestS = Infinity, value: T | undefined;
  for (let r = 0; r < repeat; r++) { const t0 = performance.now(); value = await f(); bestS = Math.min(bestS, (performance.now() - t0) / 1000); }
  return { seconds: bestS, value: value as T };
};

const readText = await best(async () => {
  const p = new EventCsvParser();
  for await (const chunk of createReadStream(file, { encoding: "utf8", highWaterMark: 1 << 20 })) p.feed(chunk as string);
  const r = p.end();
  if (!r.ok) throw new Error("bench file rejected");
  return r.table;
})();
report("csv-read text chunks (stream utf8 -> feed(string); best of repeats)", readText.value.n, readText.seconds, rssMiB());
const read = await best(async () => {
  const p = new EventCsvParser({ sizeHintBytes: statSync(file).size });
  for await (const chunk of createReadStream(file, { highWaterMark: 1 << 20 })) p.feedBytes(chunk as Buffer);
  const r = p.end();
  if (!r.ok) throw new Error("bench file rejected");
  return r.table;
})();
report("csv-read byte chunks (stream -> feedBytes, as the CLI; best of repeats)", read.value.n, read.seconds, rssMiB());

const t = read.value;
const site = { latitudeDeg: -35.2, longitudeDeg: -69.5, heightM: 1400 };
const eq = await best(() => horizontalToEquatorial({ zenithDeg: t.zenithDeg, azimuthDeg: t.azimuthDeg, unixMs: t.unixMs }, site))();
report("horizontal-to-icrs (per-event ERA, per-day precession-nutation)", t.n, eq.seconds, rssMiB());
const m = icrsToGalacticMatrix();
const gal = await best(() => vectorsToRotatedLonLatDeg(m, eq.value))();
report("icrs-to-galactic (l, b)", t.n, gal.seconds, rssMiB());

// the command's own work in this process (no start-up): read + parse + convert + galactic + format + write
const inProc = await best(async () => {
  const sink = createWriteStream("/dev/null");
  await runConvert(["--events", file, "--lat", "-35.2", "--lon", "-69.5", "--height", "1400"], sink);
  await new Promise<void>((resolve) => sink.end(resolve));
  return null;
})();
report("cli-convert in process (lib/cli/commands/convert.ts run -> /dev/null; no start-up)", t.n, inProc.seconds, rssMiB());

const hasTime = existsSync("/usr/bin/time");
for (const [name, cmd, args] of [
  ["cli-convert end to end (tsx lib/cli/main.ts)", tsx, ["lib/cli/main.ts"]],
  ["cli-convert end to end (npm run --silent cli)", "npm", ["run", "--silent", "cli", "--"]],
] as const) {
  let bestS = Infinity, rss: number | null = null;
  for (let r = 0; r < repeat; r++) {
    const full = [...args, "convert", "--events", file, "--lat", "-35.2", "--lon", "-69.5", "--height", "1400"];
    const t0 = performance.now();
    const res = hasTime
      ? spawnSync("/usr/bin/time", ["-f", "%M", cmd, ...full], { cwd: root, stdio: ["ignore", "ignore", "pipe"], encoding: "utf8" })
      : spawnSync(cmd, full, { cwd: root, stdio: ["ignore", "ignore", "pipe"], encoding: "utf8" });
    const s = (performance.now() - t0) / 1000;
    if (res.status !== 0) throw new Error(`cli convert failed: ${res.stderr}`);
    if (s < bestS) { bestS = s; rss = hasTime ? Math.round(Number(res.stderr.trim().split("\n").pop()) / 1024) : null; }
  }
  report(name, t.n, bestS, rss, { stdout: "/dev/null" });
}
