import { describe, expect, it } from "vitest";
import {
  capExposureFractionTable, capExposureFractions, capExposureIntegral, capHalfWidthRaRad, sommersBreakpointsDecRad, totalExposureIntegral,
} from "@/lib/sky/cap-exposure";
import { ringTable } from "@/lib/sky/ring-geometry";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const D = Math.PI / 180;

/**
 * Independent Sommers 2001 (Astropart. Phys. 14, 271) relative exposure written here for
 * the tests only: omega ~ cos(lat) cos(dec) sin(a_m) + a_m sin(lat) sin(dec).
 */
function sommers(latRad: number, zenithMaxRad: number) {
  return (d: number): number => {
    const xi = (Math.cos(zenithMaxRad) - Math.sin(latRad) * Math.sin(d)) / (Math.cos(latRad) * Math.cos(d));
    const am = xi > 1 ? 0 : xi < -1 ? Math.PI : Math.acos(xi);
    return Math.cos(latRad) * Math.cos(d) * Math.sin(am) + am * Math.sin(latRad) * Math.sin(d);
  };
}
const LAT = -35.2 * D, ZMAX = 60 * D;
const omegaS = sommers(LAT, ZMAX);
const BANDS = sommersBreakpointsDecRad(LAT, ZMAX);

/** Brute-force sum of omega over the RING pixel centres of one Nside that lie in the cap. */
function pixelSum(omega: (d: number) => number, nside: number, cDecRad: number, cRaRad: number, psiRad: number): number {
  const t = ringTable(nside);
  const cx = Math.cos(cDecRad) * Math.cos(cRaRad), cy = Math.cos(cDecRad) * Math.sin(cRaRad), cz = Math.sin(cDecRad);
  const cosPsi = Math.cos(psiRad), area = Math.PI / (3 * nside * nside);
  let s = 0;
  for (let r = 0; r < t.nRings; r++) {
    const z = t.z[r], rho = Math.sqrt(1 - z * z), w = omega(t.latRad[r]);
    for (let j = 0; j < t.nPixels[r]; j++) {
      const phi = t.phi0Rad[r] + j * t.dPhiRad[r];
      if (rho * Math.cos(phi) * cx + rho * Math.sin(phi) * cy + z * cz >= cosPsi) s += w * area;
    }
  }
  return s;
}

describe("exposure integrated over a spherical cap", () => {
  it("gives the cap area 2 pi (1 - cos psi) for omega = 1 at any centre, including over a pole (1e-12 relative)", () => {
    for (const [decDeg, psiDeg] of [[0, 20], [45, 10], [80, 20], [90, 20], [-90, 5], [-75, 30], [10, 90], [0, 179]]) {
      const exact = 2 * Math.PI * (1 - Math.cos(psiDeg * D));
      expectClose(capExposureIntegral(() => 1, decDeg * D, psiDeg * D) / exact, 1, 1e-12, `dec ${decDeg} psi ${psiDeg}`);
    }
    expectClose(totalExposureIntegral(() => 1), 4 * Math.PI, 1e-12, "whole sphere");
  });

  it("reproduces the first and second moments of a cap: integral of sin(dec) = pi sin^2(psi) sin(dec_c), and of sin^2(dec)", () => {
    // Analytic (rotational symmetry of the cap about its centre c): integral v dOmega = pi sin^2 psi c;
    // integral z^2 dOmega = sin^2 dc 2pi (1 - cos^3 psi)/3 + cos^2 dc pi [(1 - cos psi) - (1 - cos^3 psi)/3].
    for (const [decDeg, psiDeg] of [[0, 20], [60, 40], [85, 20], [-70, 25], [30, 120]]) {
      const dc = decDeg * D, psi = psiDeg * D, c = Math.cos(psi);
      const m1 = Math.PI * Math.sin(psi) ** 2 * Math.sin(dc);
      const m2 = Math.sin(dc) ** 2 * (2 * Math.PI * (1 - c ** 3)) / 3 + Math.cos(dc) ** 2 * Math.PI * (1 - c - (1 - c ** 3) / 3);
      expectClose(capExposureIntegral(Math.sin, dc, psi), m1, 1e-11, `first moment dec ${decDeg}`);
      expectClose(capExposureIntegral((d) => Math.sin(d) ** 2, dc, psi), m2, 1e-11, `second moment dec ${decDeg}`);
    }
  });

  it("meets 1e-5 relative accuracy for the Sommers exposure across its band edge, with or without breakpoints", () => {
    // Reference: the same integral at relTol 1e-13; without breakpoints the adaptive bisection must find the kinks.
    for (const decDeg of [-89, -60, -20, 0, 15, 24.8, 30, 44]) {
      const ref = capExposureIntegral(omegaS, decDeg * D, 20 * D, { breakpointsDecRad: BANDS, relTol: 1e-13 });
      const noBreaks = capExposureIntegral(omegaS, decDeg * D, 20 * D);
      const withBreaks = capExposureIntegral(omegaS, decDeg * D, 20 * D, { breakpointsDecRad: BANDS });
      expect(Math.abs(withBreaks - ref)).toBeLessThanOrEqual(1e-5 * ref + 1e-15);
      expect(Math.abs(noBreaks - ref)).toBeLessThanOrEqual(1e-5 * ref + 1e-15);
    }
    // A window entirely outside the band (dec_c - psi > lat + zenith_max = 24.8 deg) gets nothing.
    expect(capExposureIntegral(omegaS, 50 * D, 20 * D, { breakpointsDecRad: BANDS })).toBe(0);
  });

  it("agrees with a brute-force sum over Nside 512 pixel centres within the pixelisation noise of the cap edge", () => {
    // Tolerance: the edge of a 20 deg cap crosses about 2 pi sin(20 deg) / 0.115 deg = 1070 pixels of
    // area 4e-6 sr at Nside 512; each is in or out, so the sum scatters by about
    // sqrt(1070 / 6) * 4e-6 = 5e-5 sr, i.e. ~1.5e-4 of a 0.38 sr cap; allow 1e-3 relative.
    for (const [decDeg, raDeg] of [[-50, 10], [10, 359.9], [-85, 200], [20, 0]]) {
      const quad = capExposureIntegral(omegaS, decDeg * D, 20 * D, { breakpointsDecRad: BANDS });
      const brute = pixelSum(omegaS, 512, decDeg * D, raDeg * D, 20 * D);
      expectClose(brute / quad, 1, 1e-3, `dec ${decDeg}`);
    }
  });

  it("sums to the whole-sky integral over a HEALPix partition, and agrees with a seeded Monte Carlo", () => {
    // Partition: summing omega(pixel) x pixel area over all Nside 256 pixels approximates the total
    // integral to the midpoint-rule error in declination (~1e-5 here).
    const t = ringTable(256);
    let sum = 0;
    for (let r = 0; r < t.nRings; r++) sum += omegaS(t.latRad[r]) * t.nPixels[r] * (Math.PI / (3 * 256 * 256));
    expectClose(sum / totalExposureIntegral(omegaS, { breakpointsDecRad: BANDS }), 1, 1e-4, "partition");
    // Monte Carlo: 400000 uniform directions on the sphere; the fraction in a cap times the mean omega in it.
    const rnd = createRandom(2024);
    const n = 400_000, dc = -10 * D, psi = 25 * D;
    const cz = Math.sin(dc), cx = Math.cos(dc), cosPsi = Math.cos(psi);
    let acc = 0;
    for (let i = 0; i < n; i++) {
      const z = 2 * rnd.next() - 1, phi = 2 * Math.PI * rnd.next(), rho = Math.sqrt(1 - z * z);
      if (rho * Math.cos(phi) * cx + z * cz >= cosPsi) acc += omegaS(Math.asin(z));
    }
    const mc = (acc / n) * 4 * Math.PI;
    // Binomial-type standard error ~ sqrt(p/n) relative with p ~ 0.047: ~0.7%; allow 3%.
    expectClose(mc / capExposureIntegral(omegaS, dc, psi, { breakpointsDecRad: BANDS }), 1, 0.03, "Monte Carlo");
  });

  it("lists the Sommers kinks: band edge lat + zenith_max = 24.8 deg and circumpolar edge -(180 - 60) - lat = -84.8 deg", () => {
    // xi = +1 and xi = -1 in Sommers 2001; lat - zenith_max = -95.2 deg is off the sphere.
    const b = sommersBreakpointsDecRad(LAT, ZMAX).map((d) => d / D).sort((x, y) => x - y);
    expect(b.length).toBe(2);
    expectClose(b[0], -84.8, 1e-12, "circumpolar edge");
    expectClose(b[1], 24.8, 1e-12, "band edge");
  });

  it("tabulates fractions that interpolate to within 1e-6 relative (or 1e-9 absolute) of direct quadrature", () => {
    const table = capExposureFractionTable(omegaS, 20 * D, { breakpointsDecRad: BANDS });
    const rnd = createRandom(5);
    const decs = Array.from({ length: 60 }, () => Math.asin(2 * rnd.next() - 1));
    decs.push(-Math.PI / 2, Math.PI / 2, 4.8 * D, 44.8 * D);
    const direct = capExposureFractions(omegaS, decs, 20 * D, { breakpointsDecRad: BANDS, relTol: 1e-11 });
    decs.forEach((d, k) => {
      expect(Math.abs(table(d) - direct[k])).toBeLessThanOrEqual(1e-6 * direct[k] + 1e-9);
    });
  });

  it("has an RA half-width of pi inside a cap over the pole and 0 outside the cap's declinations", () => {
    expect(capHalfWidthRaRad(89 * D, 80 * D, 20 * D)).toBe(Math.PI);
    expect(capHalfWidthRaRad(50 * D, 80 * D, 20 * D)).toBe(0);
    // On the centre's own declination at dec_c = 0 the half-width equals psi.
    expectClose(capHalfWidthRaRad(0, 0, 20 * D), 20 * D, 1e-15, "equator");
  });
});
