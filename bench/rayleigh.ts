/**
 * Large-scale analyses on 1,000,000 simulated events: Rayleigh (unweighted and weighted),
 * east-west, dipole. Events drawn in memory with uniform local sidereal time, zenith density
 * sin cos below 60 deg, uniform azimuth (lat -35.2 deg). One JSON line per measurement.
 *
 *   npx tsx bench/rayleigh.ts [--n 1000000]
 */
import { parseArgs } from "node:util";
import { reconstructDipole } from "../lib/sky/dipole";
import { eastWestAnalysis } from "../lib/sky/east-west";
import { createRandom } from "../lib/sky/random";
import { rayleighAnalysis, siderealCoverageWeights } from "../lib/sky/rayleigh";

const { values } = parseArgs({ options: { n: { type: "string", default: "1000000" } } });
const n = Number(values.n);
const D = Math.PI / 180, lat = -35.2 * D, c2 = 0.25;
const rnd = createRandom(2);
const raRad = new Float64Array(n), decRad = new Float64Array(n), zenithDeg = new Float64Array(n), azimuthDeg = new Float64Array(n), lst = new Float64Array(n);
for (let i = 0; i < n; i++) {
  const t = 2 * Math.PI * rnd.next(), cosT = Math.sqrt(c2 + rnd.next() * (1 - c2)), sinT = Math.sqrt(1 - cosT * cosT), az = 2 * Math.PI * rnd.next();
  const sd = Math.sin(lat) * cosT + Math.cos(lat) * sinT * Math.cos(az), dec = Math.asin(sd), cd = Math.cos(dec);
  const h = Math.atan2(-Math.sin(az) * sinT / cd, (cosT - Math.sin(lat) * sd) / (Math.cos(lat) * cd));
  raRad[i] = t - h; decRad[i] = dec; zenithDeg[i] = Math.acos(cosT) / D; azimuthDeg[i] = az / D; lst[i] = t;
}
const peak = () => Math.round((process.resourceUsage().maxRSS / 1024) * 10) / 10;
function time(name: string, f: () => unknown) {
  f(); // warm-up
  const t = performance.now(); f(); const s = (performance.now() - t) / 1000;
  console.log(JSON.stringify({ name, n, seconds: Math.round(s * 1e4) / 1e4, ratePerSecond: Math.round(n / s), peakRssMiB: peak() }));
}
time("rayleigh unweighted", () => rayleighAnalysis(raRad));
const w = siderealCoverageWeights(lst);
time("rayleigh weighted (weights precomputed)", () => rayleighAnalysis(raRad, w));
time("sidereal coverage weights", () => siderealCoverageWeights(lst));
time("east-west with RA conversion", () => eastWestAnalysis(azimuthDeg, lst, { zenithDeg, decRad }));
time("dipole (Rayleigh + azimuthal asymmetry)", () => reconstructDipole({ raRad, decRad, zenithDeg, azimuthDeg, latitudeDeg: -35.2 }));
