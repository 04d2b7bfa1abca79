/**
 * What a binned count of the data would cost and how wrong it would be. The events of one
 * simulated million-event sky (Sommers exposure, lat -35.2 deg, zenith max 60 deg) are binned
 * at a fine Nside and every Nside-64 window of 20 deg is counted from the fine pixels whose
 * centres lie inside it (per-ring prefix sums: the grid-sky counter of the trials). The counts
 * are compared window for window with the exact counter, and so are the Li-Ma significances
 * (same expectation for both). One JSON line per fine Nside.
 *
 *   npx tsx bench/binned-scan.ts [--n 1000000] [--fine 256,512,1024,2048]
 */
import { parseArgs } from "node:util";
import { sommersBreakpointsDecRad } from "../lib/sky/cap-exposure";
import { createSommersExposure } from "../lib/sky/exposure";
import { countMap } from "../lib/sky/healpix";
import { createDeclinationSampler, drawIsotropicSky } from "../lib/sky/isotropic";
import { liMaSignificanceFromFraction } from "../lib/sky/lima";
import { countQuantisedInWindows, createQuantisedScratch, planQuantisedWindows, prefixSumsByRing } from "../lib/sky/quantised-sky";
import { createRandom } from "../lib/sky/random";
import { ringTable } from "../lib/sky/ring-geometry";
import { buildEventIndex, countEventsInWindows, declinationWindowFractions, scanGeometry } from "../lib/sky/scan";

const { values } = parseArgs({ options: { n: { type: "string", default: "1000000" }, fine: { type: "string", default: "256,512,1024,2048" } } });
const n = Number(values.n);
const fineNsides = String(values.fine).split(",").map(Number);
const D = Math.PI / 180, lat = -35.2 * D, zMax = 60 * D, psi = 20 * D;
const peak = () => Math.round((process.resourceUsage().maxRSS / 1024) * 10) / 10;

const omega = createSommersExposure(lat, zMax);
const sky = drawIsotropicSky(n, createDeclinationSampler(omega), createRandom(1));
const geometry = scanGeometry(64);
const exact = countEventsInWindows(buildEventIndex(sky.x, sky.y, sky.z), geometry, psi);
const fraction = declinationWindowFractions(64, psi, omega, { breakpointsDecRad: sommersBreakpointsDecRad(lat, zMax) });

for (const fineNside of fineNsides) {
  const fine = ringTable(fineNside);
  const plan = planQuantisedWindows(geometry.rings, fine, psi);
  const scratch = createQuantisedScratch(fine);
  const counts = countMap(fineNside, "ring", sky).data as Int32Array;
  const binned = new Int32Array(exact.length);
  let best = Infinity;
  for (let k = 0; k < 5; k++) {
    const t = performance.now();
    prefixSumsByRing(counts, fine, scratch);
    countQuantisedInWindows(plan, scratch, binned);
    best = Math.min(best, performance.now() - t);
  }
  let maxCount = 0, sumSq = 0, windows = 0, maxSigma = 0;
  for (let p = 0; p < exact.length; p++) {
    if (!(fraction[p] > 0)) continue;
    const d = binned[p] - exact[p];
    maxCount = Math.max(maxCount, Math.abs(d));
    sumSq += d * d;
    windows++;
    const s = liMaSignificanceFromFraction(binned[p], n, fraction[p]) - liMaSignificanceFromFraction(exact[p], n, fraction[p]);
    maxSigma = Math.max(maxSigma, Math.abs(s));
  }
  console.log(JSON.stringify({
    name: `binned count of the data at fine Nside ${fineNside} vs exact, Nside 64, 20 deg`, n, windows,
    countingSeconds: Math.round(best * 10) / 1e4, maxAbsCountError: maxCount, rmsCountError: Math.round(Math.sqrt(sumSq / windows) * 10) / 10,
    maxAbsSignificanceError: Math.round(maxSigma * 1000) / 1000, peakRssMiB: peak(),
  }));
}
