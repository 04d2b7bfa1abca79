/**
 * Benchmark: a full hotspot analysis as the worker runs it (lib/analyses/compute.ts
 * computeHotspot: cuts, precessed exposure, the observed scan, isotropic trial skies on two
 * worker threads, maps), on 1,000,000 simulated events, Nside 64, one 20 deg radius.
 * No database: the events are drawn in memory (isotropic through the Sommers exposure,
 * lat -35.2 deg, zenith max 60 deg, times uniform over 2 years).
 *
 *   npx tsx --conditions=react-server bench/analysis.ts [--n 1000000] [--skies 1000]
 *
 * Prints one JSON line: seconds, seconds per sky (from two runs with different sky counts when
 * --skies is below 1000, with the extrapolation to 1,000 skies labelled as such).
 */
import { parseArgs } from "node:util";
import { computeHotspot, type AnalysisEvents } from "../lib/analyses/compute";
import { createSommersExposure } from "../lib/sky/exposure";
import { createDeclinationSampler, drawIsotropicSky } from "../lib/sky/isotropic";
import { createRandom } from "../lib/sky/random";
import { AnalysisSettingsSchema } from "../lib/validations/analysis";

const { values } = parseArgs({ options: { n: { type: "string", default: "1000000" }, skies: { type: "string", default: "1000" } } });
const n = Number(values.n), nSkies = Number(values.skies);
const D = Math.PI / 180;
const site = { latitudeDeg: -35.2, longitudeDeg: -69.5, heightM: 1400 };
const omega = createSommersExposure(site.latitudeDeg * D, 60 * D);
const sky = drawIsotropicSky(n, createDeclinationSampler(omega), createRandom(11));
const rnd = createRandom(12);
const events: AnalysisEvents = {
  n, unixMs: new Float64Array(n), zenithDeg: new Float64Array(n).fill(30), azimuthDeg: new Float64Array(n), energyEeV: new Float64Array(n),
  raDeg: new Float64Array(n), decDeg: new Float64Array(n),
};
for (let i = 0; i < n; i++) {
  events.unixMs[i] = Date.UTC(2024, 0, 1) + rnd.next() * 2 * 365.25 * 86_400_000;
  events.energyEeV[i] = 3 / (1 - rnd.next()) ** 0.5;
  let ra = Math.atan2(sky.y[i]!, sky.x[i]!) / D;
  if (ra < 0) ra += 360;
  events.raDeg[i] = ra;
  events.decDeg[i] = Math.asin(sky.z[i]!) / D;
}
const settingsFor = (skies: number) => AnalysisSettingsSchema.parse({
  kind: "hotspot", datasetId: 1, datasetVersion: 1, zenithMaxDeg: 60, nside: 64, radiiDeg: [20], exposure: "sommers-precessed", nSkies: skies, seed: 3,
});
async function timed(skies: number): Promise<number> {
  const t = performance.now();
  await computeHotspot(events, site, settingsFor(skies), { workers: 2 });
  return (performance.now() - t) / 1000;
}
if (nSkies >= 1000) {
  const seconds = await timed(nSkies);
  console.log(JSON.stringify({ name: `full hotspot analysis, ${n} events, ${nSkies} isotropic skies, nside 64, radius 20 deg, 2 workers`, n, nSkies, seconds: +seconds.toFixed(1), peakRssMiB: Math.round(process.resourceUsage().maxRSS / 1024) }));
} else {
  const small = Math.max(10, Math.floor(nSkies / 2));
  const a = await timed(small), b = await timed(nSkies);
  const perSky = (b - a) / (nSkies - small);
  const fixed = b - perSky * nSkies;
  console.log(JSON.stringify({
    name: `full hotspot analysis, ${n} events, nside 64, radius 20 deg, 2 workers: ${small} and ${nSkies} skies measured, 1,000 extrapolated`,
    n, measured: { [small]: +a.toFixed(1), [nSkies]: +b.toFixed(1) }, secondsPerSky: +perSky.toFixed(3), fixedSeconds: +fixed.toFixed(1),
    extrapolatedSecondsFor1000Skies: Math.round(fixed + perSky * 1000), peakRssMiB: Math.round(process.resourceUsage().maxRSS / 1024),
  }));
}
