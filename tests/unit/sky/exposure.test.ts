import { describe, expect, it } from "vitest";
import {
  coveredDeclinationBand, createPrecessedExposure, createSommersExposure, declinationsOfDateRad, exposureCurve,
  exposureEpochs, exposureMap, orderStatistics, precessedExposureAt, skyFractionCovered, sommersExposureKm2Yr,
  sommersExposureMaximum, sommersExposureUnnormalised, sommersRelativeExposure, totalExposureKm2SrYr,
} from "@/lib/sky/exposure";
import { horizontalToEquatorial } from "@/lib/sky/coordinates";
import { pixelAreaSr, pixelCentres } from "@/lib/sky/healpix";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const DEG = Math.PI / 180;

/** 2 pi * integral of f(dec) cos(dec) ddec over [-pi/2, pi/2], composite Simpson (n even). */
function sphereIntegral(f: (d: number) => number, n = 20000): number {
  const h = Math.PI / n;
  let s = 0;
  for (let k = 0; k <= n; k++) {
    const d = -Math.PI / 2 + k * h;
    s += (k === 0 || k === n ? 1 : k % 2 ? 4 : 2) * f(d) * Math.cos(d);
  }
  return 2 * Math.PI * s * h / 3;
}

/** Independent route: time average over one sidereal day of cos(zenith) while zenith < cut (brute force in hour angle). */
function bruteForceDailyCosine(decRad: number, latRad: number, zmRad: number): number {
  const n = 200000;
  let s = 0;
  for (let k = 0; k < n; k++) {
    const h = -Math.PI + (2 * Math.PI * (k + 0.5)) / n;
    const c = Math.sin(latRad) * Math.sin(decRad) + Math.cos(latRad) * Math.cos(decRad) * Math.cos(h);
    if (c > Math.cos(zmRad)) s += c;
  }
  return s / n; // = (1/pi) (cos lat cos dec sin a_m + a_m sin lat sin dec)
}

describe("Sommers 2001 exposure formula", () => {
  it("equals pi x the daily mean of cos(zenith) above the cut, computed by brute force over hour angle (Sommers 2001 eq. 2-3)", () => {
    const r = createRandom(4);
    for (let k = 0; k < 12; k++) {
      const lat = (-80 + 160 * r.next()) * DEG, zm = (20 + 70 * r.next()) * DEG, dec = (-90 + 180 * r.next()) * DEG;
      expectClose(sommersExposureUnnormalised(dec, lat, zm), Math.PI * bruteForceDailyCosine(dec, lat, zm), 1e-4, `case ${k}`);
    }
  });

  it("gives A T cos(zenith) km^2 yr at the south celestial pole seen from lat -35.2 deg (always at zenith 54.8 deg)", () => {
    expectClose(sommersExposureKm2Yr(-Math.PI / 2, -35.2 * DEG, 60 * DEG, 3000, 10), 3000 * 10 * Math.cos(54.8 * DEG), 1e-9);
  });

  it("integrates over the sphere to A T pi sin^2(theta_max) km^2 sr yr (cosine-weighted solid angle of the acceptance)", () => {
    for (const [lat, zm] of [[-35.2, 60], [39.3, 55], [0, 80], [89, 30]]) {
      const total = sphereIntegral((d) => sommersExposureKm2Yr(d, lat * DEG, zm * DEG, 1, 1));
      expectClose(total / totalExposureKm2SrYr(zm * DEG, 1, 1), 1, 2e-6, `lat ${lat} zm ${zm}`);
    }
  });

  it("is normalised to a maximum of exactly 1 and is never negative", () => {
    for (const [lat, zm] of [[-35.2, 60], [-35.2, 80], [39.3, 55], [0, 45], [90, 45], [-90, 60]]) {
      const omega = createSommersExposure(lat * DEG, zm * DEG);
      let max = 0, min = Infinity;
      for (let d = -90; d <= 90; d += 0.01) { const w = omega(d * DEG); max = Math.max(max, w); min = Math.min(min, w); }
      expect(max).toBeLessThanOrEqual(1 + 1e-12);
      expectClose(max, 1, 1e-6, `max lat ${lat}`);
      expect(min).toBeGreaterThanOrEqual(0);
    }
    expectClose(sommersRelativeExposure(-20 * DEG, -35.2 * DEG, 60 * DEG), createSommersExposure(-35.2 * DEG, 60 * DEG)(-20 * DEG), 1e-15);
    // on the equator with a vertical pole-to-pole view, the exposure is cos(dec)-shaped: max at dec 0
    expectClose(sommersExposureMaximum(0, Math.PI / 2), sommersExposureUnnormalised(0, 0, Math.PI / 2), 1e-12);
  });

  it("covers dec < +24.8 deg (71.0% of the sky) from lat -35.2 deg with zenith < 60 deg, and dec < +44.8 (85.2%) with 80 deg (METHODS section 8)", () => {
    const b60 = coveredDeclinationBand(-35.2, 60), b80 = coveredDeclinationBand(-35.2, 80);
    expectClose(b60.decMaxDeg, 24.8, 1e-12); expect(b60.decMinDeg).toBe(-90);
    expectClose(b80.decMaxDeg, 44.8, 1e-12);
    expectClose(skyFractionCovered(-35.2, 60), 0.710, 0.0005);
    expectClose(skyFractionCovered(-35.2, 80), 0.852, 0.0005);
    const omega = createSommersExposure(-35.2 * DEG, 60 * DEG);
    expect(omega(24.79 * DEG)).toBeGreaterThan(0);
    expect(omega(24.81 * DEG)).toBe(0);
    expect(omega(90 * DEG)).toBe(0);
    expect(omega(-90 * DEG)).toBeGreaterThan(0);
    // a northern site sees the north pole: band [lat - zm, 90]
    expect(coveredDeclinationBand(39.3, 60)).toEqual({ decMinDeg: -20.700000000000003, decMaxDeg: 90 });
    expect(() => coveredDeclinationBand(100, 60)).toThrow(RangeError);
  });

  it("samples the curve from -90 to +90 deg inclusive with the requested step", () => {
    const c = exposureCurve(-35.2, 60, 1);
    expect(c.decDeg.length).toBe(181);
    expect(c.decDeg[0]).toBe(-90); expect(c.decDeg[180]).toBe(90); expect(c.decDeg[90]).toBe(0);
    const c7 = exposureCurve(-35.2, 60, 7);
    expect(c7.decDeg[c7.decDeg.length - 1]).toBe(90);
    expect(c7.decDeg[c7.decDeg.length - 2]).toBe(85);
    expect(() => exposureCurve(-35.2, 60, 0)).toThrow(RangeError);
  });
});

describe("exposure maps", () => {
  it("sums (times the pixel area) to the integral of the curve over the sphere, in equatorial and galactic frames", () => {
    const omega = createSommersExposure(-35.2 * DEG, 60 * DEG);
    const integral = sphereIntegral(omega);
    for (const order of ["ring", "nested"] as const) for (const frame of ["equatorial", "galactic"] as const) {
      const m = exposureMap({ nside: 64, order, frame, latDeg: -35.2, zenithMaxDeg: 60 });
      let s = 0; for (let p = 0; p < m.data.length; p++) s += m.data[p];
      expectClose(s * pixelAreaSr(64) / integral, 1, 2e-4, `${order} ${frame}`);
    }
  });

  it("puts the galactic-frame exposure of each pixel equal to the equatorial exposure at the same direction", () => {
    const m = exposureMap({ nside: 8, order: "ring", frame: "galactic", latDeg: -35.2, zenithMaxDeg: 60 });
    const omega = createSommersExposure(-35.2 * DEG, 60 * DEG);
    // galactic pixel 0 centre (l, b) -> ICRS dec computed independently via the spherical formula with the NGP
    const c = pixelCentres(8, "ring");
    for (const p of [0, 100, 300, 767]) {
      const l = c.raDeg[p] * DEG, b = c.decDeg[p] * DEG;
      const decNgp = 27.12825 * DEG, lNcp = 122.93192 * DEG;
      const sinDec = Math.sin(b) * Math.sin(decNgp) + Math.cos(b) * Math.cos(decNgp) * Math.cos(lNcp - l); // standard spherical-trig form
      expectClose(m.data[p], omega(Math.asin(sinDec)), 1e-9, `pixel ${p}`);
    }
  });
});

describe("seeded shower simulation", () => {
  it("reproduces the Sommers declination distribution for showers with density sin(theta) cos(theta) below 60 deg (chi-square, 39 dof)", () => {
    const r = createRandom(2001);
    const n = 200_000, latDeg = -35.2, zmDeg = 60;
    const zen = new Float64Array(n), az = new Float64Array(n), t = new Float64Array(n);
    const s2 = Math.sin(zmDeg * DEG) ** 2;
    const t0 = Date.UTC(1999, 6, 1), span = 365.25 * 86400e3; // around J2000: precession < 10 arcsec
    for (let i = 0; i < n; i++) {
      zen[i] = Math.asin(Math.sqrt(r.next() * s2)) / DEG; // sin^2(theta) uniform <=> density sin cos
      az[i] = 360 * r.next();
      t[i] = t0 + span * r.next();
    }
    const eq = horizontalToEquatorial({ zenithDeg: zen, azimuthDeg: az, unixMs: t }, { latitudeDeg: latDeg, longitudeDeg: -69.3, heightM: 1400 });
    // 40 bins equal in sin(dec) over the covered band [-90, 24.8]
    const nb = 40, sMin = -1, sMax = Math.sin(24.8 * DEG);
    const counts = new Float64Array(nb);
    for (let i = 0; i < n; i++) {
      const k = Math.floor((Math.sin(eq.decDeg[i] * DEG) - sMin) / (sMax - sMin) * nb);
      counts[Math.min(nb - 1, Math.max(0, k))]++;
    }
    const omega = createSommersExposure(latDeg * DEG, zmDeg * DEG);
    const expected = new Float64Array(nb);
    let tot = 0;
    for (let k = 0; k < nb; k++) {
      const m = 200;
      for (let j = 0; j < m; j++) {
        const sd = sMin + (sMax - sMin) * (k + (j + 0.5) / m) / nb;
        expected[k] += omega(Math.asin(sd));
      }
      tot += expected[k];
    }
    let chi2 = 0;
    for (let k = 0; k < nb; k++) { const e = expected[k] / tot * n; chi2 += (counts[k] - e) ** 2 / e; }
    // chi-square 0.1% critical value for 39 dof: 72.05 (standard tables, e.g. NIST/SEMATECH e-Handbook 1.3.6.7.4; from memory)
    expect(chi2).toBeLessThan(72.05);
    // and the fit is not trivially perfect (0.1% lower critical value ~ 17.9)
    expect(chi2).toBeGreaterThan(17.9);
  });
});

describe("precessed exposure (sommers-precessed)", () => {
  it("picks epoch quantiles of the event times with equal weights", () => {
    const times = new Float64Array(1000);
    for (let i = 0; i < 1000; i++) times[i] = Date.UTC(2020, 0, 1) + (999 - i) * 1000;
    const e = exposureEpochs(times, 4);
    expect(e.unixMs.length).toBe(4);
    expectClose(e.unixMs[0], Date.UTC(2020, 0, 1) + 124.5 * 1000, 1e-6);
    expectClose(e.unixMs[3], Date.UTC(2020, 0, 1) + 874.5 * 1000, 1e-6);
    expect(Array.from(e.weight)).toEqual([0.25, 0.25, 0.25, 0.25]);
    expect(exposureEpochs(Float64Array.of(5), 16).unixMs.length).toBe(1);
    expect(() => exposureEpochs(new Float64Array(0))).toThrow(RangeError);
  });

  it("finds order statistics equal to those of a full sort (invariant), with ties, clustered values and a constant list", () => {
    const rng = createRandom(7);
    const cases: Float64Array[] = [];
    const clustered = new Float64Array(20_000);
    for (let i = 0; i < clustered.length; i++) clustered[i] = i % 3 === 0 ? 1e12 + rng.next() : i % 3 === 1 ? 1e12 + 1e9 * rng.next() : 1e12 + Math.floor(rng.next() * 5);
    cases.push(clustered, Float64Array.from({ length: 777 }, () => Math.round(rng.next() * 10)), new Float64Array(50).fill(-3), Float64Array.of(2, 1));
    for (const values of cases) {
      const sorted = Float64Array.from(values).sort();
      const ranks = [0, values.length - 1, Math.floor(values.length / 2), Math.floor(values.length / 7), Math.min(values.length - 1, 3)];
      const got = orderStatistics(values, ranks);
      for (const r of ranks) expect(got.get(r)).toBe(sorted[r]);
    }
    expect(() => orderStatistics(Float64Array.of(1, NaN), [0])).toThrow(RangeError);
    expect(() => orderStatistics(Float64Array.of(1, 2), [2])).toThrow(RangeError);
  });

  it("differs from 'sommers' by the precession since J2000 for a million events over 2023-2025 (max declination shift = 20.04 arcsec/yr x 24 yr, IAU 2006 rate from memory)", () => {
    const r = createRandom(99);
    const times = new Float64Array(1_000_000);
    const t0 = Date.UTC(2023, 0, 1), span = Date.UTC(2025, 0, 1) - t0;
    for (let i = 0; i < times.length; i++) times[i] = t0 + span * r.next();
    const epochs = exposureEpochs(times, 16);
    const lat = -35.2 * DEG, zm = 60 * DEG;
    const plain = createSommersExposure(lat, zm);
    const precessed = createPrecessedExposure(epochs, lat, zm);
    const c = pixelCentres(64, "ring");
    let maxShiftArcsec = 0, maxRelDiffEdge = 0;
    const decs = new Float64Array(epochs.weight.length);
    for (let p = 0; p < c.x.length; p++) {
      declinationsOfDateRad(c.x[p], c.y[p], c.z[p], epochs, decs);
      let mean = 0; for (let k = 0; k < decs.length; k++) mean += epochs.weight[k] * decs[k];
      maxShiftArcsec = Math.max(maxShiftArcsec, Math.abs(mean - c.decDeg[p] * DEG) / DEG * 3600);
      const d = c.decDeg[p];
      if (d > 20 && d < 24.8) {
        const w0 = plain(d * DEG), w1 = precessed(c.x[p], c.y[p], c.z[p]);
        if (w0 > 0) maxRelDiffEdge = Math.max(maxRelDiffEdge, Math.abs(w1 - w0) / w0);
      }
    }
    console.log(`sommers vs sommers-precessed (1M events 2023-2025): max dec shift ${(maxShiftArcsec / 3600).toFixed(4)} deg, max relative exposure difference for 20 < dec < 24.8 deg: ${(100 * maxRelDiffEdge).toFixed(1)}%`);
    // 24.0 yr from J2000 to the median epoch; nutation adds up to ~9 arcsec
    expectClose(maxShiftArcsec, 24.0 * 20.04, 12);
    expect(maxRelDiffEdge).toBeGreaterThan(0.05);
    expectClose(precessedExposureAt(c.x[0], c.y[0], c.z[0], epochs, lat, zm), precessed(c.x[0], c.y[0], c.z[0]), 1e-15);
  });

  it("fits simulated 2023-2025 showers near the band edge where 'sommers' on ICRS declinations does not (chi-square, 20 dof)", () => {
    const r = createRandom(7);
    const n = 400_000, latDeg = -35.2, zmDeg = 60;
    const zen = new Float64Array(n), az = new Float64Array(n), t = new Float64Array(n);
    const s2 = Math.sin(zmDeg * DEG) ** 2;
    const t0 = Date.UTC(2023, 0, 1), span = Date.UTC(2025, 0, 1) - t0;
    for (let i = 0; i < n; i++) { zen[i] = Math.asin(Math.sqrt(r.next() * s2)) / DEG; az[i] = 360 * r.next(); t[i] = t0 + span * r.next(); }
    const eq = horizontalToEquatorial({ zenithDeg: zen, azimuthDeg: az, unixMs: t }, { latitudeDeg: latDeg, longitudeDeg: -69.3, heightM: 1400 });
    const lo = 21, hi = 25, nb = 20, w = (hi - lo) / nb;
    const counts = new Float64Array(nb);
    for (let i = 0; i < n; i++) { const d = eq.decDeg[i]; if (d >= lo && d < hi) counts[Math.floor((d - lo) / w)]++; }
    const epochs = exposureEpochs(t, 16);
    const lat = latDeg * DEG, zm = zmDeg * DEG;
    const plain = createSommersExposure(lat, zm), precessed = createPrecessedExposure(epochs, lat, zm);
    // the sphere integral of both models is the same (precession is a rotation), so both normalise by it
    const total = sphereIntegral(plain);
    let chiPlain = 0, chiPrecessed = 0;
    for (let k = 0; k < nb; k++) {
      let ePlain = 0, ePrec = 0;
      const sub = 20, nra = 90;
      for (let j = 0; j < sub; j++) {
        const d = (lo + w * (k + (j + 0.5) / sub)) * DEG;
        const cd = Math.cos(d), sd = Math.sin(d);
        ePlain += plain(d) * cd;
        let m = 0;
        for (let a = 0; a < nra; a++) { const ra = (2 * Math.PI * (a + 0.5)) / nra; m += precessed(cd * Math.cos(ra), cd * Math.sin(ra), sd); }
        ePrec += (m / nra) * cd;
      }
      const scale = n * 2 * Math.PI * (w * DEG / sub) / total;
      ePlain *= scale; ePrec *= scale;
      chiPlain += (counts[k] - ePlain) ** 2 / Math.max(ePlain, 1);
      chiPrecessed += (counts[k] - ePrec) ** 2 / Math.max(ePrec, 1);
    }
    console.log(`band-edge chi-square (20 bins 21-25 deg): sommers ${chiPlain.toFixed(1)}, sommers-precessed ${chiPrecessed.toFixed(1)}`);
    // chi-square 0.1% critical value for 20 dof: 45.31 (standard tables; from memory)
    expect(chiPrecessed).toBeLessThan(45.31);
    expect(chiPlain).toBeGreaterThan(45.31);
  });
});
