import { describe, expect, it } from "vitest";
import { directIntegrationMap, timeScrambledDirections, timeScrambledMap } from "@/lib/sky/scramble";
import { createSommersExposure } from "@/lib/sky/exposure";
import { horizontalToEquatorial, localApparentSiderealAngleRad } from "@/lib/sky/coordinates";
import { countMap, pixelCentres, vectorsToPixels } from "@/lib/sky/healpix";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const DEG = Math.PI / 180;
const SITE = { latitudeDeg: -35.2, longitudeDeg: -69.3, heightM: 1400 };

/** Isotropic sky seen by an array fully efficient below 60 deg: density sin(theta) cos(theta), uniform azimuth and times. */
function simulateShowers(n: number, seed: number, t0 = Date.UTC(1999, 6, 1), spanMs = 365.25 * 86400e3) {
  const r = createRandom(seed);
  const zenithDeg = new Float64Array(n), azimuthDeg = new Float64Array(n), unixMs = new Float64Array(n);
  const s2 = Math.sin(60 * DEG) ** 2;
  for (let i = 0; i < n; i++) {
    zenithDeg[i] = Math.asin(Math.sqrt(r.next() * s2)) / DEG;
    azimuthDeg[i] = 360 * r.next();
    unixMs[i] = t0 + spanMs * r.next();
  }
  return { zenithDeg, azimuthDeg, unixMs };
}

/** Sommers expectation per pixel (sum = N) at nside 8 ring. */
function sommersExpectation(nside: number, n: number): Float64Array {
  const omega = createSommersExposure(SITE.latitudeDeg * DEG, 60 * DEG);
  const c = pixelCentres(nside, "ring");
  const e = Float64Array.from(c.decDeg, (d) => omega(d * DEG));
  let s = 0; for (const v of e) s += v;
  for (let p = 0; p < e.length; p++) e[p] *= n / s;
  return e;
}

/** Chi-square of a map against an expectation over pixels with expectation >= 20, with variance k x expectation. */
function chiSquare(map: ArrayLike<number>, expected: ArrayLike<number>, k: number): { chi2: number; dof: number } {
  let chi2 = 0, dof = 0;
  for (let p = 0; p < expected.length; p++) {
    if (expected[p] < 20) continue;
    chi2 += (map[p] - expected[p]) ** 2 / (k * expected[p]);
    dof++;
  }
  return { chi2, dof };
}

/**
 * Chi-square of the declination profile against the Sommers profile, from Nside 64 maps (pixels
 * of 0.9 deg, so that evaluating the exposure at pixel centres is accurate), in 20 bins equal in
 * sin(dec) over the covered band. The profile of a scrambled map is the data's own (multinomial)
 * profile, so chi2 ~ dof is expected; a biased method exceeds it.
 */
function profileChiSquare(map64: ArrayLike<number>, n: number): { chi2: number; dof: number } {
  const expected = sommersExpectation(64, n);
  const c = pixelCentres(64, "ring");
  const nb = 20, sMin = -1, sMax = Math.sin(24.8 * DEG);
  const obs = new Float64Array(nb), exp = new Float64Array(nb);
  for (let p = 0; p < c.z.length; p++) {
    const k = Math.floor((c.z[p] - sMin) / (sMax - sMin) * nb);
    if (k < 0 || k >= nb) continue;
    obs[k] += map64[p]; exp[k] += expected[p];
  }
  let chi2 = 0;
  for (let k = 0; k < nb; k++) chi2 += (obs[k] - exp[k]) ** 2 / exp[k];
  return { chi2, dof: nb - 1 };
}

describe("time scrambling (Alexandreas et al. 1993)", () => {
  it("reproduces the analytic Sommers exposure on an isotropic seeded sky (chi-square over Nside 8 pixels)", () => {
    const ev = simulateShowers(60000, 5);
    const map = timeScrambledMap(ev, SITE, { nside: 8, order: "ring", nScramble: 10, seed: 1 });
    let s = 0; for (const v of map.data) s += v;
    expectClose(s, 60000, 1e-6, "map sums to N");
    // The declination profile of scrambled events equals the data's (dec of date depends only on
    // local coordinates), so each pixel fluctuates like Poisson(E) (k = 1, a conservative bound).
    const { chi2, dof } = chiSquare(map.data, sommersExpectation(8, 60000), 1);
    const prof = profileChiSquare(timeScrambledMap(ev, SITE, { nside: 64, order: "ring", nScramble: 10, seed: 1 }).data, 60000);
    console.log(`time scrambling vs Sommers: chi2 ${chi2.toFixed(1)} for ${dof} pixels; declination profile chi2 ${prof.chi2.toFixed(1)} for ${prof.dof} dof`);
    // chi-square 0.1% critical value for 19 dof: 43.82 (standard tables; from memory)
    expect(prof.chi2).toBeLessThan(43.82);
    // chi-square 0.1% critical value ~ dof + 3.09 sqrt(2 dof) (normal approximation, common practice)
    expect(dof).toBeGreaterThan(400);
    expect(chi2).toBeLessThan(dof + 3.09 * Math.sqrt(2 * dof));
  });

  it("is deterministic for a seed, differs between seeds, and keeps each event's local coordinates", () => {
    const ev = simulateShowers(2000, 9);
    const a = timeScrambledDirections(ev, SITE, { nScramble: 3, seed: 42 });
    const b = timeScrambledDirections(ev, SITE, { nScramble: 3, seed: 42 });
    const c = timeScrambledDirections(ev, SITE, { nScramble: 3, seed: 43 });
    expect(a.x.length).toBe(6000);
    expect(Array.from(a.x)).toEqual(Array.from(b.x));
    expect(Array.from(a.x)).not.toEqual(Array.from(c.x));
    // the map variant bins the very same directions
    const m = timeScrambledMap(ev, SITE, { nside: 16, order: "nested", nScramble: 3, seed: 42 });
    const direct = countMap(16, "nested", a);
    for (let p = 0; p < m.data.length; p++) expectClose(m.data[p], direct.data[p] / 3, 1e-9);
    // the declination of date of scrambled event i equals that of event i (same zenith, azimuth, latitude):
    // check through the altitude-only invariant: angle between direction and the celestial pole of date is
    // unchanged to within precession over the 1-year span (< 0.01 deg)
    const orig = horizontalToEquatorial(ev, SITE);
    for (let i = 0; i < 50; i++) expectClose(a.z[i], orig.z[i], 2e-4, `event ${i} sin(dec)`);
  });
});

describe("direct integration (Atkins et al. 2003)", () => {
  it("reproduces the analytic Sommers exposure on an isotropic seeded sky and sums to N", () => {
    const ev = simulateShowers(60000, 11);
    const map = directIntegrationMap(ev, SITE, { nside: 8, order: "ring", seed: 3 });
    let s = 0; for (const v of map.data) s += v;
    expectClose(s, 60000, 1e-6);
    const { chi2, dof } = chiSquare(map.data, sommersExpectation(8, 60000), 1);
    const prof = profileChiSquare(directIntegrationMap(ev, SITE, { nside: 64, order: "ring", seed: 3 }).data, 60000);
    console.log(`direct integration vs Sommers: chi2 ${chi2.toFixed(1)} for ${dof} pixels; declination profile chi2 ${prof.chi2.toFixed(1)} for ${prof.dof} dof`);
    expect(prof.chi2).toBeLessThan(43.82);
    expect(dof).toBeGreaterThan(400);
    expect(chi2).toBeLessThan(dof + 3.09 * Math.sqrt(2 * dof));
  });

  it("follows a non-uniform event-rate history: an array that runs only at night-side sidereal angles gets an RA-structured expectation", () => {
    // keep only events with local sidereal angle in [0, pi): the expectation must then vanish in RA bands never overhead
    const all = simulateShowers(40000, 12);
    const lst = localApparentSiderealAngleRad(all.unixMs, SITE.longitudeDeg);
    const keep: number[] = [];
    for (let i = 0; i < lst.length; i++) if (lst[i] < Math.PI) keep.push(i);
    const ev = { zenithDeg: Float64Array.from(keep, (i) => all.zenithDeg[i]), azimuthDeg: Float64Array.from(keep, (i) => all.azimuthDeg[i]), unixMs: Float64Array.from(keep, (i) => all.unixMs[i]) };
    const map = directIntegrationMap(ev, SITE, { nside: 8, order: "ring", seed: 4 });
    const scr = timeScrambledMap(ev, SITE, { nside: 8, order: "ring", nScramble: 5, seed: 4 });
    const data = countMap(8, "ring", horizontalToEquatorial(ev, SITE));
    // both expectations agree with each other and with the data, pixel by pixel within statistics
    const { chi2, dof } = chiSquare(data.data, map.data, 1);
    expect(chi2).toBeLessThan(dof + 3.09 * Math.sqrt(2 * dof));
    const c2 = chiSquare(scr.data, map.data, 1);
    expect(c2.chi2).toBeLessThan(c2.dof + 3.09 * Math.sqrt(2 * c2.dof));
    // and differ strongly from the uniform-coverage Sommers form (which ignores the rate history)
    const sommers = chiSquare(data.data, sommersExpectation(8, ev.zenithDeg.length), 1);
    console.log(`half-sidereal-day data: chi2/dof vs direct ${(chi2 / dof).toFixed(2)}, scrambled vs direct ${(c2.chi2 / c2.dof).toFixed(2)}, vs Sommers ${(sommers.chi2 / sommers.dof).toFixed(1)}`);
    expect(sommers.chi2).toBeGreaterThan(5 * sommers.dof);
  });

  it("is deterministic for a seed and rejects bad options", () => {
    const ev = simulateShowers(3000, 13);
    const a = directIntegrationMap(ev, SITE, { nside: 4, order: "nested", seed: 7, siderealBins: 60 });
    const b = directIntegrationMap(ev, SITE, { nside: 4, order: "nested", seed: 7, siderealBins: 60 });
    expect(Array.from(a.data)).toEqual(Array.from(b.data));
    expect(() => directIntegrationMap(ev, SITE, { nside: 4, order: "nested", seed: 7, zenithBins: 0 })).toThrow(RangeError);
    expect(() => timeScrambledMap(ev, SITE, { nside: 4, order: "nested", nScramble: 0, seed: 1 })).toThrow(RangeError);
    expect(vectorsToPixels(4, "nested", { x: Float64Array.of(1), y: Float64Array.of(0), z: Float64Array.of(0) })[0]).toBeGreaterThanOrEqual(0);
  });
});
