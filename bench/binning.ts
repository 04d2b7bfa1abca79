/**
 * Benchmark of HEALPix binning (lib/sky/healpix.ts vectorsToPixels) at Nside 64 and 1024, both
 * orders, on seeded uniform random directions, with @hscmap/healpix one call per direction for
 * comparison. One JSON line per measurement: {name, n, seconds, ratePerSecond, peakRssMiB}.
 *
 *   npx tsx bench/binning.ts [--n 4000000] [--repeat 5]
 */
import { parseArgs } from "node:util";
import * as hp from "@hscmap/healpix";
import { vectorsToPixels } from "../lib/sky/healpix";
import { createRandom } from "../lib/sky/random";

const { values } = parseArgs({ options: { n: { type: "string", default: "4000000" }, repeat: { type: "string", default: "5" } } });
const n = Number(values.n), repeat = Number(values.repeat);
const r = createRandom(2024);
const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
for (let i = 0; i < n; i++) {
  const zz = 2 * r.next() - 1, ph = 2 * Math.PI * r.next(), s = Math.sqrt(1 - zz * zz);
  x[i] = s * Math.cos(ph); y[i] = s * Math.sin(ph); z[i] = zz;
}
const out = new Int32Array(n);
const rssMiB = () => Math.round(process.resourceUsage().maxRSS / 1024);
for (const nside of [64, 1024]) for (const order of ["nested", "ring"] as const) {
  let best = Infinity;
  for (let k = 0; k < repeat; k++) { const t0 = performance.now(); vectorsToPixels(nside, order, { x, y, z }, out); best = Math.min(best, (performance.now() - t0) / 1000); }
  console.log(JSON.stringify({ name: `vectorsToPixels nside ${nside} ${order} (best of ${repeat})`, n, seconds: +best.toFixed(4), ratePerSecond: Math.round(n / best), peakRssMiB: rssMiB() }));
}
const m = Math.min(n, 1_000_000);
for (const nside of [64, 1024]) {
  const t0 = performance.now();
  for (let i = 0; i < m; i++) out[i] = hp.vec2pix_nest(nside, [x[i], y[i], z[i]]);
  const s = (performance.now() - t0) / 1000;
  console.log(JSON.stringify({ name: `@hscmap/healpix vec2pix_nest nside ${nside} (reference, one call per direction)`, n: m, seconds: +s.toFixed(4), ratePerSecond: Math.round(m / s), peakRssMiB: rssMiB() }));
}
