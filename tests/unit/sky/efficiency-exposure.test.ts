import { describe, expect, it } from "vitest";
import * as Astronomy from "astronomy-engine";
import { coveredDeclinationBand, skyFractionCovered, sommersExposureMaximum, sommersExposureUnnormalised, totalExposureKm2SrYr } from "@/lib/sky/exposure";
import {
  createEfficiencyExposure, declinationExposureMap, directionVisibility, efficiencyExposureUnnormalised, exposureSphereIntegralSr,
  mapIntegralSr, skyFractionAboveExposure, tabulatedZenithEfficiency,
} from "@/lib/sky/efficiency-exposure";
import { expectClose } from "../helpers";

const DEG = Math.PI / 180;

describe("efficiency-weighted exposure (Sommers 2001 generalised to eps(theta))", () => {
  it("equals Sommers' closed form (eq. 3) when the efficiency is 1 at every zenith angle, to 1e-9", () => {
    const one = () => 1;
    for (const lat of [-90, -35.2, -31.4, 0, 12, 45, 89.9, 90]) {
      for (const zm of [20, 45, 60, 80, 90]) {
        for (let dec = -90; dec <= 90; dec += 7.5) {
          const closed = sommersExposureUnnormalised(dec * DEG, lat * DEG, zm * DEG);
          const numeric = efficiencyExposureUnnormalised(dec * DEG, lat * DEG, zm * DEG, one);
          expectClose(numeric, closed, 1e-9 + 1e-9 * closed, `lat ${lat} zm ${zm} dec ${dec}`);
        }
      }
    }
  });

  it("with an efficiency of 1 below 40° and 0 above, equals Sommers with a 40° cut (to 2e-4 of the maximum)", () => {
    // The integral is split at the table's rows, so the 0.002° ramp is integrated on its own.
    const step = tabulatedZenithEfficiency([0, 39.999, 40.001, 90], [1, 1, 0, 0]);
    for (const dec of [-80, -60, -31.4, -10, 0, 8]) {
      const expected = sommersExposureUnnormalised(dec * DEG, -31.4 * DEG, 40 * DEG);
      const got = efficiencyExposureUnnormalised(dec * DEG, -31.4 * DEG, 60 * DEG, step);
      expectClose(got, expected, 2e-4 * sommersExposureMaximum(-31.4 * DEG, 40 * DEG), `dec ${dec}`);
    }
  });

  it("agrees with a brute-force midpoint sum over the hour angle (200,000 steps) for a sloping efficiency table", () => {
    const table = tabulatedZenithEfficiency([0, 30, 50, 70], [1, 0.9, 0.5, 0.1]);
    const brute = (dec: number, lat: number, zm: number) => {
      const n = 200000;
      let s = 0;
      for (let k = 0; k < n; k++) {
        const h = (Math.PI * (k + 0.5)) / n;
        const c = Math.sin(lat) * Math.sin(dec) + Math.cos(lat) * Math.cos(dec) * Math.cos(h);
        if (c > Math.cos(zm)) s += table(Math.acos(c)) * c;
      }
      return (s * Math.PI) / n;
    };
    for (const dec of [-75, -40, -5, 20]) {
      const got = efficiencyExposureUnnormalised(dec * DEG, -31.4 * DEG, 70 * DEG, table);
      expectClose(got, brute(dec * DEG, -31.4 * DEG, 70 * DEG), 1e-5, `dec ${dec}`);
    }
  });

  it("integrates over the sphere to pi^2 sin^2(theta_max) times a constant efficiency (cos-weighted solid angle)", () => {
    // A T pi sin^2(theta_max) km^2 sr yr is the total of a flat array (Sommers 2001); in units of the
    // unnormalised form (A T / pi = 1) that is pi^2 sin^2(theta_max).
    // At the pole the exposure jumps at the band edge (the zenith angle is constant all day), so
    // Simpson's rule is only good to ~h x jump there: 1e-3 relative; elsewhere 1e-5.
    for (const [lat, zm, c, rel] of [[-31.4, 60, 1, 1e-5], [20, 75, 0.5, 1e-5], [90, 30, 0.8, 1e-3]] as const) {
      const eff = () => c;
      // Simpson in declination across the kinks of the exposure at the band edges: 1e-5 relative.
      const total = exposureSphereIntegralSr((d) => efficiencyExposureUnnormalised(d, lat * DEG, zm * DEG, eff), 8000);
      const expected = c * Math.PI ** 2 * Math.sin(zm * DEG) ** 2;
      expectClose(total, expected, rel * expected, `lat ${lat} zm ${zm}`);
      // (A T / pi) times the integral is the total in km^2 sr yr (A = 1 km^2, T = 1 yr).
      expectClose(total / Math.PI, c * totalExposureKm2SrYr(zm * DEG, 1, 1), rel * expected, "same as totalExposureKm2SrYr");
    }
  });

  it("interpolates an efficiency table linearly in zenith and holds the end values", () => {
    const e = tabulatedZenithEfficiency([0, 30, 60], [1, 0.8, 0.2]);
    expectClose(e(15 * DEG), 0.9, 1e-12);
    expectClose(e(45 * DEG), 0.5, 1e-12);
    expectClose(e(75 * DEG), 0.2, 1e-12);
    expect(() => tabulatedZenithEfficiency([0, 30, 20], [1, 1, 1])).toThrow(/ascend/);
    expect(() => tabulatedZenithEfficiency([0, 30], [1, 1.2])).toThrow(/\[0, 1\]/);
  });
});

describe("covered band and sky fraction against the geometry (|dec - lat| < zenith_max)", () => {
  // Band [lat - zm, lat + zm] clipped to [-90, 90]; fraction (sin dec_max - sin dec_min) / 2 (METHODS sec. 8).
  const cases: [number, number, number, number, number][] = [
    // lat, zm, decMin, decMax, sky fraction computed by hand from the formula
    [-35.2, 60, -90, 24.8, (Math.sin(24.8 * DEG) + 1) / 2], // METHODS: 71.0%
    [-35.2, 80, -90, 44.8, (Math.sin(44.8 * DEG) + 1) / 2], // METHODS: 85.2%
    [0, 60, -60, 60, Math.sin(60 * DEG)],
    [45, 60, -15, 90, (1 + Math.sin(15 * DEG)) / 2],
    [90, 30, 60, 90, (1 - Math.sin(60 * DEG)) / 2],
    [-31.4, 60, -90, 28.6, (Math.sin(28.6 * DEG) + 1) / 2],
  ];
  it("gives the band and fraction of the formula, and the METHODS worked values 71.0% and 85.2%", () => {
    for (const [lat, zm, lo, hi, f] of cases) {
      const b = coveredDeclinationBand(lat, zm);
      expectClose(b.decMinDeg, lo, 1e-12, `decMin lat ${lat} zm ${zm}`);
      expectClose(b.decMaxDeg, hi, 1e-12, `decMax lat ${lat} zm ${zm}`);
      expectClose(skyFractionCovered(lat, zm), f, 1e-12, `fraction lat ${lat} zm ${zm}`);
    }
    expectClose(skyFractionCovered(-35.2, 60), 0.710, 5e-4, "METHODS 71.0%");
    expectClose(skyFractionCovered(-35.2, 80), 0.852, 5e-4, "METHODS 85.2%");
  });

  it("has non-zero exposure just inside each unclipped band edge and none just outside", () => {
    for (const [lat, zm, lo, hi] of cases) {
      const w = createEfficiencyExposure(lat * DEG, zm * DEG, undefined, 0.01).relative;
      if (hi < 90) { expect(w((hi - 0.05) * DEG)).toBeGreaterThan(0); expect(w((hi + 0.05) * DEG)).toBe(0); }
      if (lo > -90) { expect(w((lo + 0.05) * DEG)).toBeGreaterThan(0); expect(w((lo - 0.05) * DEG)).toBe(0); }
    }
  });

  it("never covers the whole sky from one site with a cut below 90°, at any latitude", () => {
    // Both poles need 90 - lat < zm and 90 + lat < zm, i.e. zm > 90.
    for (let lat = -90; lat <= 90; lat += 2.5) {
      for (const zm of [10, 45, 60, 80, 89, 89.99]) expect(skyFractionCovered(lat, zm)).toBeLessThan(1);
    }
    expect(skyFractionCovered(0, 90)).toBe(1); // the equator with a 90° cut reaches both poles' neighbourhood
  });

  it("sky fraction above an exposure threshold tends to the covered fraction as the threshold goes to 0", () => {
    for (const [lat, zm, , , f] of cases) {
      const w = createEfficiencyExposure(lat * DEG, zm * DEG).relative;
      expectClose(skyFractionAboveExposure(w, 1e-9), f, 2e-4, `lat ${lat} zm ${zm}`);
    }
  });

  it("at the pole the exposure is sin(dec) and the fraction above t is (1 - max(t, cos zm)) / 2 (closed form)", () => {
    // At lat 90 the zenith angle is 90 - dec all day: omega = pi sin(dec) for dec > 90 - zm.
    const w = createEfficiencyExposure(90 * DEG, 50 * DEG).relative;
    for (const dec of [45, 60, 75, 89]) expectClose(w(dec * DEG), Math.sin(dec * DEG), 1e-6, `dec ${dec}`);
    for (const t of [0.2, 0.8, 0.9, 0.99]) expectClose(skyFractionAboveExposure(w, t), (1 - Math.max(t, Math.cos(50 * DEG))) / 2, 2e-4, `t ${t}`);
  });
});

describe("exposure maps", () => {
  it("sum (times the pixel area) to the integral of the exposure curve, and to pi^2 sin^2(zm) / max for full efficiency", () => {
    for (const [lat, zm] of [[-31.4, 60], [35, 45], [0, 80]] as const) {
      const e = createEfficiencyExposure(lat * DEG, zm * DEG);
      const curve = exposureSphereIntegralSr(e.relative);
      const analytic = Math.PI ** 2 * Math.sin(zm * DEG) ** 2 / sommersExposureMaximum(lat * DEG, zm * DEG);
      expectClose(curve, analytic, 1e-4 * analytic, `curve lat ${lat}`);
      for (const frame of ["equatorial", "galactic"] as const) {
        const map = declinationExposureMap(e.relative, { nside: 64, order: "ring", frame });
        expectClose(mapIntegralSr(map), curve, 2e-3 * curve, `map Nside 64 ${frame} lat ${lat}`);
      }
    }
  });
});

describe("visibility of a direction", () => {
  it("spends a_m / pi of the sidereal day inside the cut, as astronomy-engine's horizon altitudes say (1440 samples)", () => {
    const observer = new Astronomy.Observer(-31.4, -68.9, 1650);
    const start = Date.UTC(2025, 2, 1);
    const siderealDayMs = 86164.0905e3;
    for (const dec of [-80, -60, -31.4, 0, 20, 28, 40]) {
      const vis = directionVisibility(dec, -31.4, 60);
      let inside = 0;
      const n = 1440;
      for (let k = 0; k < n; k++) {
        const time = Astronomy.MakeTime(new Date(start + ((k + 0.5) * siderealDayMs) / n));
        // RA/Dec of date at 6 h; no refraction
        const hor = Astronomy.Horizon(time, observer, 6, dec, undefined);
        if (90 - hor.altitude < 60) inside++;
      }
      expectClose(vis.fractionOfDay, inside / n, 2 / n, `dec ${dec}`);
      expectClose(vis.minZenithDeg, Math.abs(dec + 31.4), 1e-12, `min zenith dec ${dec}`);
    }
  });
});
