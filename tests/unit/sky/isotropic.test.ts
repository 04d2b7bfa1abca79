import { describe, expect, it } from "vitest";
import { createDeclinationSampler, drawFromReference, drawIsotropicSky, drawIsotropicSkyPrecessed } from "@/lib/sky/isotropic";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const D = Math.PI / 180;
/** Independent Sommers 2001 relative exposure (Astropart. Phys. 14, 271), written here for the tests. */
function sommers(latRad: number, zenithMaxRad: number) {
  return (d: number): number => {
    const xi = (Math.cos(zenithMaxRad) - Math.sin(latRad) * Math.sin(d)) / (Math.cos(latRad) * Math.cos(d));
    const am = xi > 1 ? 0 : xi < -1 ? Math.PI : Math.acos(xi);
    return Math.cos(latRad) * Math.cos(d) * Math.sin(am) + am * Math.sin(latRad) * Math.sin(d);
  };
}

/** Probability of each of nb equal declination bins: integral omega cos(dec) d dec by a 4000-step midpoint rule per bin. */
function binProbabilities(omega: (d: number) => number, nb: number): number[] {
  const p: number[] = [];
  for (let b = 0; b < nb; b++) {
    const d0 = -Math.PI / 2 + (b * Math.PI) / nb, h = Math.PI / nb / 4000;
    let s = 0;
    for (let k = 0; k < 4000; k++) { const d = d0 + (k + 0.5) * h; s += omega(d) * Math.cos(d) * h; }
    p.push(s);
  }
  const t = p.reduce((a, b) => a + b, 0);
  return p.map((v) => v / t);
}

describe("seeded isotropic skies through a declination-only exposure", () => {
  it("reproduces the Sommers declination distribution (lat -35.2 deg, zenith max 60 deg): chi-square below the 0.1% critical value", () => {
    const omega = sommers(-35.2 * D, 60 * D);
    const sampler = createDeclinationSampler(omega);
    const n = 200_000, nb = 36;
    const sky = drawIsotropicSky(n, sampler, createRandom(17));
    const counts = new Array(nb).fill(0);
    for (let i = 0; i < n; i++) counts[Math.min(nb - 1, Math.floor(((Math.asin(sky.z[i]) + Math.PI / 2) / Math.PI) * nb))]++;
    const p = binProbabilities(omega, nb);
    let chi2 = 0, dof = -1;
    for (let b = 0; b < nb; b++) {
      if (p[b] * n < 5) { expect(counts[b]).toBeLessThanOrEqual(Math.max(5, 10 * p[b] * n)); continue; }
      chi2 += (counts[b] - n * p[b]) ** 2 / (n * p[b]);
      dof++;
    }
    // Covered band dec < +24.8 deg (METHODS 8): bins 0..22 have events, 23 contains the edge.
    expect(dof).toBe(22);
    // chi-square 0.999 quantile for 22 dof = 48.268 (upper critical values of the chi-square
    // distribution, NIST/SEMATECH e-Handbook of Statistical Methods, table 1.3.6.7.4; value
    // computed with jstat 1.9.6 jStat.chisquare.inv(0.999, 22)).
    expect(chi2).toBeLessThan(48.268);
    // No event beyond the band edge dec = lat + zenith_max = 24.8 deg (Sommers geometry, METHODS 8).
    let maxDec = -90;
    for (let i = 0; i < n; i++) maxDec = Math.max(maxDec, Math.asin(sky.z[i]) / D);
    expect(maxDec).toBeLessThan(24.8 + 0.02);
    expect(maxDec).toBeGreaterThan(24.0);
    expectClose(sampler.coveredFraction, 0.71, 0.005, "covered sky fraction 71.0% (METHODS 8)");
  });

  it("draws uniform right ascension: chi-square over 24 RA bins below the 0.1% critical value (23 dof: 49.728)", () => {
    const sky = drawIsotropicSky(120_000, createDeclinationSampler(() => 1), createRandom(3));
    const counts = new Array(24).fill(0);
    for (let i = 0; i < sky.x.length; i++) {
      let ra = Math.atan2(sky.y[i], sky.x[i]); if (ra < 0) ra += 2 * Math.PI;
      counts[Math.min(23, Math.floor((ra / (2 * Math.PI)) * 24))]++;
    }
    const e = sky.x.length / 24;
    const chi2 = counts.reduce((s, c) => s + (c - e) ** 2 / e, 0);
    // 49.728 = chi-square 0.999 quantile, 23 dof (NIST/SEMATECH table 1.3.6.7.4; computed with jstat 1.9.6).
    expect(chi2).toBeLessThan(49.728);
    // A uniform sphere has <z> = 0 and <z^2> = 1/3 (standard errors ~ 0.0017 and 0.0009).
    let m1 = 0, m2 = 0;
    for (let i = 0; i < sky.z.length; i++) { m1 += sky.z[i]; m2 += sky.z[i] ** 2; }
    expectClose(m1 / sky.z.length, 0, 0.007, "<z>");
    expectClose(m2 / sky.z.length, 1 / 3, 0.004, "<z^2>");
  });

  it("is deterministic for a seed, gives unit vectors, and draws from a reference set only its own directions", () => {
    const s = createDeclinationSampler((d) => 1 + Math.sin(d));
    const a = drawIsotropicSky(1000, s, createRandom(9)), b = drawIsotropicSky(1000, s, createRandom(9));
    expect(Array.from(a.z)).toEqual(Array.from(b.z));
    for (let i = 0; i < 1000; i++) expectClose(a.x[i] ** 2 + a.y[i] ** 2 + a.z[i] ** 2, 1, 1e-12, "norm");
    const ref = drawFromReference(500, a, createRandom(1));
    const set = new Set(Array.from(a.x));
    for (let i = 0; i < 500; i++) expect(set.has(ref.x[i])).toBe(true);
    expect(() => createDeclinationSampler(() => 0)).toThrow(RangeError);
  });

  it("draws precessed skies in the frame of date: rotated back, every direction lies in the exposed cap of date", () => {
    // Exposure of date: dec > 60 deg only. Epoch frames tilted by 5 and 10 deg about x.
    const tilt = (a: number) => [1, 0, 0, 0, Math.cos(a), Math.sin(a), 0, -Math.sin(a), Math.cos(a)];
    const epochs = [{ weight: 1, icrsToDate: tilt(5 * D) }, { weight: 3, icrsToDate: tilt(10 * D) }];
    const sky = drawIsotropicSkyPrecessed(4000, createDeclinationSampler((d) => (d > 60 * D ? 1 : 0)), epochs, createRandom(2));
    let inFirst = 0, inSecond = 0;
    for (let i = 0; i < 4000; i++) {
      const zd = epochs.map((e) => e.icrsToDate[6] * sky.x[i] + e.icrsToDate[7] * sky.y[i] + e.icrsToDate[8] * sky.z[i]);
      expect(Math.max(...zd)).toBeGreaterThanOrEqual(Math.sin(60 * D) - 1e-3);
      const a = zd[0] >= Math.sin(60 * D), b = zd[1] >= Math.sin(60 * D);
      if (a && !b) inFirst++;
      if (b && !a) inSecond++;
    }
    // The two caps have equal radii, so the parts exclusive to each have equal areas and
    // their counts are in the ratio of the epoch weights, 3 (about 100 vs 300 events here;
    // a 4-sigma binomial band is about 2.2 to 4.3).
    expect(inFirst).toBeGreaterThan(40);
    expect(inSecond / inFirst).toBeGreaterThan(2.2);
    expect(inSecond / inFirst).toBeLessThan(4.3);
  });
});
