/**
 * The coverage planner's recomputation, as the browser runs it on every input (lib/coverage/model.ts):
 * exposure table, summary, curve and the map at Nside 32, 64 and 128, for full efficiency and
 * for an efficiency table. Median of `--repeat` runs. One JSON line per measurement.
 *
 *   npx tsx bench/coverage.ts [--repeat 20]
 */
import { parseArgs } from "node:util";
import { configurationExposure, coverageCurve, coverageMap, coverageSummary } from "../lib/coverage/model";
import type { CoverageParameters } from "../lib/validations/coverage";

const { values } = parseArgs({ options: { repeat: { type: "string", default: "20" } } });
const repeat = Number(values.repeat);
const cases: [string, CoverageParameters][] = [
  ["full efficiency", { latitudeDeg: -31.4, zenithMaxDeg: 60, areaKm2: null, liveTimeYr: null, efficiency: { kind: "full", aboveEnergyEeV: null } }],
  ["efficiency table", { latitudeDeg: -31.4, zenithMaxDeg: 60, areaKm2: null, liveTimeYr: null, efficiency: { kind: "table", zenithDeg: [0, 40, 60], efficiency: [1, 1, 0.7] } }],
];
for (const [label, p] of cases) {
  for (const nside of [32, 64, 128]) {
    const run = () => {
      const e = configurationExposure(p);
      coverageSummary(p, e);
      coverageCurve(e, 0.5);
      coverageMap(e, nside, "equatorial");
    };
    run();
    const ms: number[] = [];
    for (let k = 0; k < repeat; k++) { const t = performance.now(); run(); ms.push(performance.now() - t); }
    ms.sort((a, b) => a - b);
    console.log(JSON.stringify({ name: `coverage recompute, ${label}`, nside, repeat, medianMs: Math.round(ms[ms.length >> 1]! * 100) / 100, maxMs: Math.round(ms[ms.length - 1]! * 100) / 100 }));
  }
}
