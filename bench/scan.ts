/**
 * Window-scan benchmark: 1,000,000 isotropic events drawn in memory through the Sommers
 * exposure (lat -35.2 deg, zenith max 60 deg), index build, exact counting and full scans
 * at Nside 64 and 128 with 20 deg windows. Prints one JSON line per measurement.
 *
 *   npx tsx bench/scan.ts [--n 1000000] [--repeat 3]
 */
import { parseArgs } from "node:util";
import { sommersBreakpointsDecRad } from "../lib/sky/cap-exposure";
import { createSommersExposure } from "../lib/sky/exposure";
import { createDeclinationSampler, drawIsotropicSky } from "../lib/sky/isotropic";
import { createRandom } from "../lib/sky/random";
import { buildEventIndex, countEventsInWindows, declinationWindowFractions, scanGeometry, scanWindows } from "../lib/sky/scan";

const { values } = parseArgs({ options: { n: { type: "string", default: "1000000" }, repeat: { type: "string", default: "3" } } });
const n = Number(values.n), repeat = Number(values.repeat);
const D = Math.PI / 180, lat = -35.2 * D, zMax = 60 * D;
const peak = () => Math.round((process.resourceUsage().maxRSS / 1024) * 10) / 10;
const emit = (name: string, count: number, seconds: number) =>
  console.log(JSON.stringify({ name, n: count, seconds: Math.round(seconds * 1e4) / 1e4, ratePerSecond: Math.round(count / seconds), peakRssMiB: peak() }));

const omega = createSommersExposure(lat, zMax);
let t = performance.now();
const sky = drawIsotropicSky(n, createDeclinationSampler(omega), createRandom(1));
emit("draw isotropic sky", n, (performance.now() - t) / 1000);
t = performance.now();
const index = buildEventIndex(sky.x, sky.y, sky.z);
emit("event index build", n, (performance.now() - t) / 1000);
for (const nside of [64, 128]) {
  const g = scanGeometry(nside);
  const fraction = declinationWindowFractions(nside, 20 * D, omega, { breakpointsDecRad: sommersBreakpointsDecRad(lat, zMax) });
  let best = Infinity;
  for (let k = 0; k < repeat; k++) { t = performance.now(); countEventsInWindows(index, g, 20 * D); best = Math.min(best, performance.now() - t); }
  emit(`exact counts nside ${nside} radius 20 deg (best of ${repeat}; rate = events/s)`, n, best / 1000);
  best = Infinity;
  for (let k = 0; k < repeat; k++) { t = performance.now(); scanWindows(index, { nside, radiusDeg: 20, expectation: { model: "fractions", fraction }, geometry: g }); best = Math.min(best, performance.now() - t); }
  emit(`scan nside ${nside} radius 20 deg, counts + Li-Ma (best of ${repeat})`, n, best / 1000);
}
