import { sommersExposureUnnormalised } from "@/lib/sky/exposure";

/**
 * Expected counts per declination bin for an array with the analytic exposure (Sommers 2001):
 * N * integral_bin omega(dec) cos(dec) d dec / integral_all omega(dec) cos(dec) d dec,
 * by the midpoint rule on 0.05 deg steps.
 */
export function expectedDeclinationCounts(edgesDeg: number[], latDeg: number, zenithMaxDeg: number, n: number): number[] {
  const r = Math.PI / 180;
  const step = 0.05;
  const weight = (d0: number, d1: number) => {
    let s = 0;
    for (let d = d0 + step / 2; d < d1; d += step) s += sommersExposureUnnormalised(d * r, latDeg * r, zenithMaxDeg * r) * Math.cos(d * r);
    return s;
  };
  const w = edgesDeg.slice(0, -1).map((e, i) => weight(e, edgesDeg[i + 1]!));
  const total = w.reduce((a, b) => a + b, 0);
  return w.map((x) => (total > 0 ? (n * x) / total : 0));
}
