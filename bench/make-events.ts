/**
 * Seeded generator of a simulated canonical event CSV (METHODS section 1), for benchmarks and
 * manual tests: times uniform over two years (2023-01-01 to 2025-01-01 UTC), zenith with density
 * proportional to sin(theta) cos(theta) below 60 deg, uniform north-clockwise azimuth, energies
 * from a power law dN/dE ~ E^-3 above 3 EeV.
 *
 *   npx tsx bench/make-events.ts --n 1000000 --out bench/data/events-1m.csv [--seed 1] [--time-format iso|unix|gps]
 */
import { closeSync, mkdirSync, openSync, writeSync } from "node:fs";
import { dirname } from "node:path";
import { parseArgs } from "node:util";
import { createRandom } from "../lib/sky/random";
import { gpsSecondsFromUnixMs } from "../lib/sky/time";

const { values } = parseArgs({
  options: {
    n: { type: "string", default: "1000000" },
    out: { type: "string" },
    seed: { type: "string", default: "1" },
    "time-format": { type: "string", default: "iso" },
    "zenith-max": { type: "string", default: "60" },
  },
});
const n = Number(values.n);
const seed = Number(values.seed);
const timeFormat = values["time-format"];
const zenithMaxDeg = Number(values["zenith-max"]);
if (!values.out) throw new Error("--out PATH is required");
if (!(Number.isInteger(n) && n >= 0)) throw new Error("--n must be a non-negative integer");
if (!["iso", "unix", "gps"].includes(timeFormat)) throw new Error("--time-format must be iso, unix or gps");

const r = createRandom(seed);
const t0 = Date.UTC(2023, 0, 1), span = Date.UTC(2025, 0, 1) - t0;
const s2 = Math.sin(zenithMaxDeg * Math.PI / 180) ** 2;
mkdirSync(dirname(values.out), { recursive: true });
const fd = openSync(values.out, "w");
let buf = "id,time,zenith,azimuth,energy\n";
for (let i = 0; i < n; i++) {
  const unixMs = Math.floor(t0 + span * r.next());
  const zen = Math.asin(Math.sqrt(r.next() * s2)) * 180 / Math.PI;
  const az = 360 * r.next();
  const e = 3 * Math.pow(1 - r.next(), -1 / 2); // E^-3 differential above 3 EeV
  const time = timeFormat === "iso" ? new Date(unixMs).toISOString()
    : timeFormat === "unix" ? (unixMs / 1000).toFixed(3) : gpsSecondsFromUnixMs(unixMs).toFixed(3);
  buf += `evt${String(i + 1).padStart(7, "0")},${time},${zen.toFixed(4)},${az.toFixed(4)},${e.toFixed(3)}\n`;
  if (buf.length > 1 << 20) { writeSync(fd, buf); buf = ""; }
}
writeSync(fd, buf);
closeSync(fd);
