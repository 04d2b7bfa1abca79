/**
 * Window-scan benchmark: 1,000,000 isotropic events drawn in memory through the Sommers
 * exposure (lat -35.2 deg, zenith max 60 deg), index build (timed on its own), exact counting
 * and full scans at Nside 64 and 128 with 20 deg windows. Prints one JSON line per
 * measurement with the best and the slowest of --repeat runs and the 1-minute load average
 * (the machine is shared: compare best times, and only at similar load).
 *
 *   npx tsx bench/scan.ts [--n 1000000] [--repeat 5] [--nside 64,128]
 */
import { loadavg } from "node:os";
import { parseArgs } from "node:util";
import { sommersBreakpointsDecRad } from "../lib/sky/cap-exposure";
import { createSommersExposure } from "../lib/sky/exposure";
import { createDeclinationSampler, drawIsotropicSky } from "../lib/sky/isotropic";
import { createRandom } from "../lib/sky/random";
import { buildEventIndex, countEventsInWindows, declinationWindowFractions, scanGeometry, scanWindows, type EventIndex } from "../lib/sky/scan";

const { values } = parseArgs({ options: { n: { type: "string", default: "1000000" }, repeat: { type: "string", default: "5" }, nside: { type: "string", default: "64,128" } } });
const n = Number(values.n), repeat = Number(values.repeat);
const nsides = String(values.nside).split(",").map(Number);
const D = Math.PI / 180, lat = -35.2 * D, zMax = 60 * D;
const peak = () => Math.round((process.resourceUsage().maxRSS / 1024) * 10) / 10;
const emit = (name: string, seconds: number[]) => {
  const best = Math.min(...seconds), worst = Math.max(...seconds);
  console.log(JSON.stringify({
    name, n, runs: seconds.length, bestSeconds: Math.round(best * 1e4) / 1e4, worstSeconds: Math.round(worst * 1e4) / 1e4,
    eventsPerSecond: Math.round(n / best), load1: Math.round(loadavg()[0] * 100) / 100, peakRssMiB: peak(),
  }));
};
const timed = (runs: number, f: () => void): number[] => {
  const out: number[] = [];
  for (let k = 0; k < runs; k++) { const t = performance.now(); f(); out.push((performance.now() - t) / 1000); }
  return out;
};

const omega = createSommersExposure(lat, zMax);
let sky!: ReturnType<typeof drawIsotropicSky>;
emit("draw isotropic sky", timed(1, () => { sky = drawIsotropicSky(n, createDeclinationSampler(omega), createRandom(1)); }));
let index!: EventIndex;
emit("event index build (one-off, not part of the scan times below)", timed(repeat, () => { index = buildEventIndex(sky.x, sky.y, sky.z); }));
for (const nside of nsides) {
  const g = scanGeometry(nside);
  const fraction = declinationWindowFractions(nside, 20 * D, omega, { breakpointsDecRad: sommersBreakpointsDecRad(lat, zMax) });
  emit(`exact counts nside ${nside} radius 20 deg`, timed(repeat, () => { countEventsInWindows(index, g, 20 * D); }));
  emit(`scan nside ${nside} radius 20 deg, counts + Li-Ma`, timed(repeat, () => { scanWindows(index, { nside, radiusDeg: 20, expectation: { model: "fractions", fraction }, geometry: g }); }));
}
