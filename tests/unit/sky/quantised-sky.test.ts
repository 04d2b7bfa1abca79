import { describe, expect, it } from "vitest";
import {
  countQuantisedInWindows, createQuantisedScratch, createQuantisedSkySampler, drawQuantisedSky, planQuantisedWindows, prefixSumsByRing,
  windowProbabilities,
} from "@/lib/sky/quantised-sky";
import { declinationWindowFractions } from "@/lib/sky/scan";
import { ringCentres, ringTable } from "@/lib/sky/ring-geometry";
import { tabulateZDensity } from "@/lib/sky/isotropic";
import { createSommersExposure } from "@/lib/sky/exposure";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const D = Math.PI / 180;

/** Brute force: every fine pixel centre against every window centre, unit-vector dot products. */
function bruteForce(counts: Int32Array, fineNside: number, scanNside: number, psi: number): Int32Array {
  const f = ringCentres(fineNside), c = ringCentres(scanNside), cosPsi = Math.cos(psi);
  const out = new Int32Array(c.x.length);
  for (let w = 0; w < c.x.length; w++) {
    let s = 0;
    for (let p = 0; p < f.x.length; p++) if (counts[p] && f.x[p] * c.x[w] + f.y[p] * c.y[w] + f.z[p] * c.z[w] >= cosPsi) s += counts[p];
    out[w] = s;
  }
  return out;
}

describe("quantised trial skies: exact window counts by per-ring prefix sums", () => {
  it("equal brute-force dot-product counts for windows of 3, 20, 61 and 125 deg (over the poles and across RA 0/360), Nside 8 windows on an Nside 32 grid", () => {
    const fineNside = 32, scanNside = 8;
    const fine = ringTable(fineNside);
    const rnd = createRandom(5);
    const counts = new Int32Array(12 * fineNside * fineNside);
    for (let p = 0; p < counts.length; p++) counts[p] = rnd.nextInt(4);
    const scratch = createQuantisedScratch(fine);
    prefixSumsByRing(counts, fine, scratch);
    for (const radiusDeg of [3, 20, 61, 125]) {
      const plan = planQuantisedWindows(ringTable(scanNside), fine, radiusDeg * D);
      const got = countQuantisedInWindows(plan, scratch, new Int32Array(12 * scanNside * scanNside));
      expect(Array.from(got)).toEqual(Array.from(bruteForce(counts, fineNside, scanNside, radiusDeg * D)));
    }
  });

  it("draws rings with the probabilities of the exposure's z-bands, summing to 1, none outside the covered band (lat -35.2, zenith max 60: dec < +24.8, METHODS section 8)", () => {
    const omega = createSommersExposure(-35.2 * D, 60 * D);
    const s = createQuantisedSkySampler(tabulateZDensity(omega), 64);
    let sum = 0;
    for (let r = 0; r < s.fine.nRings; r++) {
      sum += s.ringProbability[r];
      // a ring whose whole z-band lies north of the band edge gets nothing
      const zLo = r === s.fine.nRings - 1 ? -1 : 0.5 * (s.fine.z[r] + s.fine.z[r + 1]);
      if (Math.asin(zLo) > 24.81 * D) expect(s.ringProbability[r]).toBe(0);
    }
    expectClose(sum, 1, 1e-12);
    // the alias table reproduces the ring probabilities exactly: P(r) = (keep[r] + sum of (1 - keep[q]) over q aliased to r) / R
    const R = s.fine.nRings, fromAlias = new Float64Array(R);
    for (let q = 0; q < R; q++) { fromAlias[q] += s.aliasKeep[q] / R; if (s.aliasOther[q] !== q) fromAlias[s.aliasOther[q]] += (1 - s.aliasKeep[q]) / R; }
    for (let r = 0; r < R; r++) expectClose(fromAlias[r], s.ringProbability[r], 1e-12);
  });

  it("draws skies whose declination bands and RA follow the exposure (chi-square below the 0.999 quantiles)", () => {
    const omega = createSommersExposure(-35.2 * D, 60 * D);
    const s = createQuantisedSkySampler(tabulateZDensity(omega), 64);
    const counts = new Int32Array(12 * 64 * 64);
    const n = 200_000;
    drawQuantisedSky(n, s, createRandom(9), counts);
    expect(counts.reduce((a, b) => a + b, 0)).toBe(n);
    // 32 groups of consecutive rings with non-zero probability
    const ringsUsed: number[] = [];
    for (let r = 0; r < s.fine.nRings; r++) if (s.ringProbability[r] > 0) ringsUsed.push(r);
    const G = 32, obs = new Float64Array(G), exp = new Float64Array(G);
    ringsUsed.forEach((r, k) => {
      const g = Math.floor((k * G) / ringsUsed.length);
      exp[g] += n * s.ringProbability[r];
      for (let j = 0; j < s.fine.nPixels[r]; j++) obs[g] += counts[s.fine.firstPixel[r] + j];
    });
    let chi2 = 0;
    for (let g = 0; g < G; g++) chi2 += (obs[g] - exp[g]) ** 2 / exp[g];
    // 61.098 = chi-square 0.999 quantile, 31 dof (NIST/SEMATECH e-Handbook table 1.3.6.7.4; computed with jstat 1.9.6)
    expect(chi2).toBeLessThan(61.098);
    // right ascension: 16 equal sectors, in the equatorial belt (rings of 4 Nside pixels, 16 per sector), uniform
    const c = ringCentres(64), sectors = new Float64Array(16);
    let inBelt = 0;
    for (let p = 0; p < counts.length; p++) {
      const r = c.ring[p];
      if (s.fine.nPixels[r] !== 4 * 64) continue;
      sectors[((p - s.fine.firstPixel[r]) * 16) / (4 * 64) | 0] += counts[p]; // by pixel number in the ring: 16 pixels per sector
      inBelt += counts[p];
    }
    expect(inBelt).toBeGreaterThan(n / 2);
    let chiRa = 0;
    for (const o of sectors) chiRa += (o - inBelt / 16) ** 2 / (inBelt / 16);
    // 37.697 = chi-square 0.999 quantile, 15 dof (same table)
    expect(chiRa).toBeLessThan(37.697);
  });

  it("gives each window the probability of the fine pixels inside it (brute force), close to the cap integral of the exposure", () => {
    const omega = createSommersExposure(-35.2 * D, 60 * D);
    const fineNside = 64, scanNside = 8;
    const sampler = createQuantisedSkySampler(tabulateZDensity(omega), fineNside);
    const f = ringCentres(fineNside), c = ringCentres(scanNside);
    for (const radiusDeg of [10, 30]) {
      const psi = radiusDeg * D, cosPsi = Math.cos(psi);
      const got = windowProbabilities(planQuantisedWindows(ringTable(scanNside), sampler.fine, psi), sampler);
      const cap = declinationWindowFractions(scanNside, psi, omega);
      for (let w = 0; w < c.x.length; w++) {
        let p = 0;
        for (let k = 0; k < f.x.length; k++) {
          if (f.x[k] * c.x[w] + f.y[k] * c.y[w] + f.z[k] * c.z[w] >= cosPsi) { const r = f.ring[k]; p += sampler.ringProbability[r] / sampler.fine.nPixels[r]; }
        }
        expectClose(got[w], p, 1e-12, `window ${w}, ${radiusDeg} deg`);
        // the pixel centres inside a cap cover its area only roughly on this coarse grid (0.9 deg pixels)
        expect(Math.abs(got[w] - cap[w])).toBeLessThan(0.03 * cap[w] + 2e-4);
      }
    }
  });

  it("draws exactly the sky of its definition, deviate for deviate (so saved analyses keep their trial skies when the drawing code is tuned)", () => {
    // The definition, one next() at a time: n deviates for the rings (the integer part of
    // u x R is the alias column, its fraction the coin; Walker 1977), then one deviate per event
    // for its pixel, ring by ring from the north; each pass starts a fresh block of 4096 deviates
    // and leaves the rest of its last block unused.
    const reference = (n: number, s: ReturnType<typeof createQuantisedSkySampler>, rnd: ReturnType<typeof createRandom>, counts: Int32Array): void => {
      const R = s.fine.nRings, perRing = new Int32Array(R);
      for (let i = 0; i < n; i++) {
        const x = rnd.next() * R;
        let r = Math.floor(x);
        if (x - r >= s.aliasKeep[r]) r = s.aliasOther[r];
        perRing[r]++;
      }
      for (let i = n; i % 4096 !== 0; i++) rnd.next();
      for (let r = 0; r < R; r++) {
        for (let k = 0; k < perRing[r]; k++) counts[s.fine.firstPixel[r] + Math.floor(rnd.next() * s.fine.nPixels[r])]++;
      }
      for (let i = n; i % 4096 !== 0; i++) rnd.next();
    };
    const s = createQuantisedSkySampler(tabulateZDensity(createSommersExposure(-35.2 * D, 60 * D)), 32);
    // below one block, exactly one block, across blocks
    for (const n of [1, 1000, 4096, 10_007]) {
      const got = new Int32Array(12 * 32 * 32), want = new Int32Array(12 * 32 * 32);
      drawQuantisedSky(n, s, createRandom(n), got);
      reference(n, s, createRandom(n), want);
      expect(Array.from(got), `n = ${n}`).toEqual(Array.from(want));
    }
    // a nested second draw on the same map from the same stream (how the trials grow the subsets of energy thresholds)
    const got = new Int32Array(12 * 32 * 32), want = new Int32Array(12 * 32 * 32);
    const a = createRandom(77), b = createRandom(77);
    drawQuantisedSky(3000, s, a, got); drawQuantisedSky(5000, s, a, got);
    reference(3000, s, b, want); reference(5000, s, b, want);
    expect(Array.from(got)).toEqual(Array.from(want));
  });

  it("is deterministic for a seed and refuses a wrong map size or radius", () => {
    const s = createQuantisedSkySampler(tabulateZDensity(() => 1), 16);
    const a = new Int32Array(12 * 256), b = new Int32Array(12 * 256);
    drawQuantisedSky(5000, s, createRandom(3), a);
    drawQuantisedSky(5000, s, createRandom(3), b);
    expect(Array.from(a)).toEqual(Array.from(b));
    expect(() => drawQuantisedSky(1, s, createRandom(1), new Int32Array(10))).toThrow(RangeError);
    expect(() => planQuantisedWindows(ringTable(4), ringTable(16), 0)).toThrow(RangeError);
    expect(() => createQuantisedSkySampler(tabulateZDensity(() => 0), 16)).toThrow(RangeError);
  });
});
