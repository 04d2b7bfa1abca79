/**
 * Post-trial benchmark: isotropic trial skies at Nside 64, 20 deg windows, Sommers exposure
 * (lat -35.2 deg, zenith max 60 deg), on worker threads. Prints one JSON line; for grid skies
 * (QUANTISED_SKIES_FROM events and more) a second line with the time per sky of each phase on one
 * core (drawing, prefix sums, counting), the mean of 20 skies.
 *
 *   npx tsx bench/trials.ts [--skies 1000] [--n 2000] [--workers 2] [--radii 20] [--thresholds ""]
 */
import { loadavg } from "node:os";
import { parseArgs } from "node:util";
import { sommersBreakpointsDecRad } from "../lib/sky/cap-exposure";
import { createSommersExposure } from "../lib/sky/exposure";
import { createDeclinationSampler, drawIsotropicSky, tabulateZDensity } from "../lib/sky/isotropic";
import { createRandom } from "../lib/sky/random";
import { countQuantisedInWindows, createQuantisedScratch, createQuantisedSkySampler, drawQuantisedSky, planQuantisedWindows, prefixSumsByRing } from "../lib/sky/quantised-sky";
import { ringTable } from "../lib/sky/ring-geometry";
import { declinationWindowFractions } from "../lib/sky/scan";
import { QUANTISED_SKIES_FROM, runTrials, trialSkyFineNside } from "../lib/sky/trials";

const { values } = parseArgs({ options: {
  skies: { type: "string", default: "1000" }, n: { type: "string", default: "2000" }, workers: { type: "string", default: "2" },
  radii: { type: "string", default: "20" }, thresholds: { type: "string", default: "" }, nside: { type: "string", default: "64" },
} });
const nSkies = Number(values.skies), n = Number(values.n), workers = Number(values.workers), nside = Number(values.nside);
const radiiDeg = values.radii.split(",").map(Number);
const thresholdsEeV = values.thresholds ? values.thresholds.split(",").map(Number) : [];
const D = Math.PI / 180, lat = -35.2 * D, zMax = 60 * D;
const omega = createSommersExposure(lat, zMax);
const obs = drawIsotropicSky(n, createDeclinationSampler(omega), createRandom(5));
const rnd = createRandom(6);
const energyEeV = Float64Array.from({ length: n }, () => 3 / (1 - rnd.next()) ** 0.5);
const fractions = radiiDeg.map((r) => declinationWindowFractions(nside, r * D, omega, { breakpointsDecRad: sommersBreakpointsDecRad(lat, zMax) }));
const t = performance.now();
const res = await runTrials({ events: { ...obs, energyEeV }, search: { nside, radiiDeg, fractions, thresholdsEeV }, skyModel: { kind: "declination", zDensity: tabulateZDensity(omega) }, nSkies, seed: 1, workers });
const seconds = (performance.now() - t) / 1000;
console.log(JSON.stringify({
  name: `trials: ${nSkies} isotropic skies, ${n} events, nside ${nside}, radii [${radiiDeg}] deg, thresholds [${thresholdsEeV}] EeV, ${workers} workers`,
  n: nSkies, seconds: Math.round(seconds * 100) / 100, ratePerSecond: Math.round((nSkies / seconds) * 10) / 10,
  peakRssMiB: Math.round(process.resourceUsage().maxRSS / 1024), localSigma: res.observed.significance, postTrialP: res.postTrialP,
  skies: res.skies, load1: Math.round(loadavg()[0] * 100) / 100,
}));

if (n >= QUANTISED_SKIES_FROM) {
  // The phases of one grid sky, on this thread, as a worker runs them (quantised-sky.ts).
  const fineNside = trialSkyFineNside(nside, radiiDeg);
  const sampler = createQuantisedSkySampler(tabulateZDensity(omega), fineNside);
  const plans = radiiDeg.map((r) => planQuantisedWindows(ringTable(nside), sampler.fine, r * D));
  const scratch = createQuantisedScratch(sampler.fine);
  const counts = new Int32Array(12 * fineNside * fineNside), ringCounts = new Int32Array(sampler.fine.nRings), out = new Int32Array(12 * nside * nside);
  const ms = { drawing: 0, prefixSums: 0, counting: 0 };
  const K = 20;
  for (let k = 0; k < K; k++) {
    counts.fill(0);
    let t0 = performance.now();
    drawQuantisedSky(n, sampler, createRandom(100 + k), counts, ringCounts);
    ms.drawing += performance.now() - t0;
    t0 = performance.now();
    prefixSumsByRing(counts, sampler.fine, scratch);
    ms.prefixSums += performance.now() - t0;
    t0 = performance.now();
    for (const plan of plans) countQuantisedInWindows(plan, scratch, out);
    ms.counting += performance.now() - t0;
  }
  console.log(JSON.stringify({
    name: `grid sky phases on one core, ${n} events, fine Nside ${fineNside}, mean of ${K} skies`,
    drawingMs: +(ms.drawing / K).toFixed(1), prefixSumsMs: +(ms.prefixSums / K).toFixed(1), countingMs: +(ms.counting / K).toFixed(1),
  }));
}
