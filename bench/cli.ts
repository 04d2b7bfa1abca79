/**
 * Benchmark: the command line end to end on 1,000,000 simulated events, as a user runs it
 * (`npm run --silent cli -- ...`), wall time and peak memory from /usr/bin/time.
 *
 *   npx tsx bench/cli.ts [--n 1000000] [--repeat 3]
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parseArgs } from "node:util";

const { values } = parseArgs({ options: { n: { type: "string", default: "1000000" }, repeat: { type: "string", default: "3" } } });
const n = Number(values.n);
const repeat = Number(values.repeat);
const events = `bench/data/events-${n}.csv`;
if (!existsSync(events)) spawnSync("./node_modules/.bin/tsx", ["bench/make-events.ts", "--n", String(n), "--out", events], { stdio: "inherit" });
const dir = mkdtempSync(join(tmpdir(), "siderea-bench-"));
const site = ["--lat", "-35.2", "--lon", "-69.5", "--height", "1400"];
const cases: { name: string; args: string[] }[] = [
  { name: "cli-convert", args: ["convert", "--events", events, ...site] },
  { name: "cli-scan-nside64-r20-map", args: ["scan", "--events", events, ...site, "--zenith-max", "60", "--nside", "64", "--radius", "20", "--map", join(dir, "map.csv")] },
  { name: "cli-dipole", args: ["dipole", "--events", events, ...site, "--zenith-max", "60"] },
];
for (const c of cases) {
  let best = Infinity, peakKiB = 0;
  for (let r = 0; r < repeat; r++) {
    const t0 = performance.now();
    const res = spawnSync("/usr/bin/time", ["-f", "%M", "npm", "run", "--silent", "cli", "--", ...c.args], { stdio: ["ignore", "ignore", "pipe"], encoding: "utf8" });
    const seconds = (performance.now() - t0) / 1000;
    if (res.status !== 0) throw new Error(`${c.name} failed: ${res.stderr}`);
    best = Math.min(best, seconds);
    peakKiB = Math.max(peakKiB, Number(res.stderr.trim().split("\n").pop()));
  }
  console.log(JSON.stringify({ name: c.name, n, seconds: +best.toFixed(2), ratePerSecond: Math.round(n / best), peakRssMiB: Math.round(peakKiB / 1024), repeat }));
}
