import { describe, expect, it } from "vitest";
import { jStat } from "jstat";
import { chiSquareTest, coverageVerdict, declinationCdf, kolmogorovQ, ksTest } from "@/lib/coverage/goodness-of-fit";
import { compareWithAnalyticExposure, FINE_DEC_BINS } from "@/lib/coverage/observed";
import { configurationExposure } from "@/lib/coverage/model";
import { horizontalToEquatorial } from "@/lib/sky/coordinates";
import { earthRotationAngleRadFromUnixMs } from "@/lib/sky/time";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

describe("Pearson's chi-square", () => {
  it("gives chi2 = 13.4 on 5 degrees of freedom for a die thrown 60 times (5, 8, 9, 8, 10, 20), computed by hand", () => {
    // (25 + 4 + 1 + 4 + 0 + 100) / 10 = 13.4; the 5% and 1% critical values for 5 dof are 11.070
    // and 15.086 (standard chi-square tables, e.g. NIST/SEMATECH e-Handbook 1.3.6.7.4; from memory), so 0.01 < p < 0.05.
    const r = chiSquareTest([5, 8, 9, 8, 10, 20], [10, 10, 10, 10, 10, 10]);
    expectClose(r.chiSquare, 13.4, 1e-12, "chi-square");
    expect(r.dof).toBe(5);
    expect(r.pValue).toBeGreaterThan(0.01);
    expect(r.pValue).toBeLessThan(0.05);
  });

  it("matches the NIST table: chi2 = 11.070 on 5 dof has p = 0.05 and 18.307 on 10 dof has p = 0.05", () => {
    // Upper critical values of standard chi-square tables (NIST/SEMATECH e-Handbook 1.3.6.7.4; from memory).
    expectClose(1 - jStat.chisquare.cdf(11.070, 5), 0.05, 2e-4, "5 dof");
    expectClose(1 - jStat.chisquare.cdf(18.307, 10), 0.05, 2e-4, "10 dof");
  });

  it("merges bins until each expects at least 5 events and fails outright on events where nothing is expected", () => {
    const r = chiSquareTest([1, 2, 3, 4, 10, 10], [2, 2, 2, 2, 10, 10]);
    // expected rescaled to the observed total 30: 2.14 x 4, 10.71 x 2; merged left to right into
    // (2.14 + 2.14 + 2.14) | (2.14 + 10.71) | 10.71
    expect(r.bins).toBe(3);
    expect(r.dof).toBe(2);
    expect(chiSquareTest([0, 3, 10], [0, 5, 10]).pValue).toBeGreaterThan(0);
    expect(chiSquareTest([2, 3, 10], [0, 5, 10]).pValue).toBe(0);
  });
});

describe("Kolmogorov-Smirnov", () => {
  it("has the classic critical values of the Kolmogorov distribution: Q(1.224) = 0.10, Q(1.358) = 0.05, Q(1.628) = 0.01", () => {
    // Smirnov 1948 / Massey 1951 tables of the limiting distribution (from memory, rounded to 3 decimals).
    expectClose(kolmogorovQ(1.224), 0.10, 1e-3, "10%");
    expectClose(kolmogorovQ(1.358), 0.05, 1e-3, "5%");
    expectClose(kolmogorovQ(1.628), 0.01, 1e-3, "1%");
  });

  it("finds D = 0.3 for the samples 0.1, 0.4, 0.7 against the uniform CDF (computed by hand)", () => {
    // max over i of (i+1)/n - x_i and x_i - i/n: 0.2333, 0.1, 0.2667, 0.0667, 0.3, 0.0333
    expectClose(ksTest([0.7, 0.1, 0.4], (x) => x).d, 0.3, 1e-12, "D");
  });

  it("the declination CDF of the analytic exposure is 0 below the band and 1 above it", () => {
    const cdf = declinationCdf(configurationExposure({ latitudeDeg: 35, zenithMaxDeg: 45, efficiency: { kind: "full", aboveEnergyEeV: null } }).relative);
    expect(cdf(-10.5)).toBe(0); // band [-10, 80]
    expectClose(cdf(-10), 0, 1e-12);
    expectClose(cdf(80), 1, 1e-12);
    expect(cdf(30)).toBeGreaterThan(0.3);
  });
});

// Simulated showers: isotropic arrivals at a site (zenith density sin(theta) cos(theta) below the cut,
// uniform azimuth), at times drawn from an uptime model, converted with the sky core (checked against
// astronomy-engine in coordinates.test.ts). Seeded, so each case gives the same numbers every run.
const SITE = { latitudeDeg: -31.4, longitudeDeg: -68.9, heightM: 1650 };
const ZM = 60;
function simulate(n: number, seed: number, up: (unixMs: number) => boolean) {
  const rnd = createRandom(seed);
  const t0 = Date.UTC(2000, 0, 1), span = 366 * 86_400_000;
  const unixMs = new Float64Array(n), zenithDeg = new Float64Array(n), azimuthDeg = new Float64Array(n);
  const s2 = Math.sin((ZM * Math.PI) / 180) ** 2;
  for (let i = 0; i < n; i++) {
    let t: number;
    do t = t0 + rnd.next() * span; while (!up(t));
    unixMs[i] = t;
    zenithDeg[i] = (Math.asin(Math.sqrt(rnd.next() * s2)) * 180) / Math.PI;
    azimuthDeg[i] = rnd.next() * 360;
  }
  const eq = horizontalToEquatorial({ zenithDeg, azimuthDeg, unixMs }, SITE);
  const decFine = new Float64Array(FINE_DEC_BINS), ra = new Float64Array(24), sidereal = new Float64Array(24), solar = new Float64Array(24);
  for (let i = 0; i < n; i++) {
    decFine[Math.min(FINE_DEC_BINS - 1, Math.floor(((eq.decDeg[i] + 90) / 180) * FINE_DEC_BINS))]++;
    ra[Math.min(23, Math.floor(eq.raDeg[i] / 15))]++;
    const lstDeg = (((earthRotationAngleRadFromUnixMs(unixMs[i]) * 180) / Math.PI + SITE.longitudeDeg) % 360 + 360) % 360;
    sidereal[Math.min(23, Math.floor(lstDeg / 15))]++;
    solar[Math.floor(((unixMs[i] / 3_600_000) % 24 + 24) % 24)]++;
  }
  return { decFine, ra, sidereal, solar };
}

describe("observed against expected on simulated skies", () => {
  const always = () => true;
  // Seasonal night-only running: no data 00-08 UTC from January to March.
  const gap = (t: number) => !(new Date(t).getUTCMonth() < 3 && new Date(t).getUTCHours() < 8);

  it("passes an isotropic sky seen with full uptime: every p-value >= 0.01, verdict adequate", () => {
    const r = compareWithAnalyticExposure(simulate(20000, 11, always), SITE.latitudeDeg, ZM)!;
    expect(r.n).toBe(20000);
    for (const p of [r.declination.chiSquare.pValue, r.declination.ks.pValue, r.rightAscension.chiSquare.pValue, r.sidereal.chiSquare.pValue, r.solar.chiSquare.pValue]) expect(p).toBeGreaterThanOrEqual(0.01);
    expect(r.verdict.adequate).toBe(true);
    expect(r.verdict.text).toMatch(/adequate/);
  });

  it("fails a sky with an uptime gap in sidereal time and advises a data-driven exposure", () => {
    const r = compareWithAnalyticExposure(simulate(20000, 12, gap), SITE.latitudeDeg, ZM)!;
    expect(r.sidereal.chiSquare.pValue).toBeLessThan(1e-6);
    expect(r.solar.chiSquare.pValue).toBeLessThan(1e-6);
    expect(r.verdict.adequate).toBe(false);
    expect(r.verdict.text).toMatch(/data-driven exposure \(time scrambling\)/);
  });

  it("fails when the expectation is taken for a wrong latitude (-25° instead of -31.4°)", () => {
    const r = compareWithAnalyticExposure(simulate(20000, 13, always), -25, ZM)!;
    expect(r.declination.ks.pValue).toBeLessThan(1e-6);
    expect(r.declination.chiSquare.pValue).toBeLessThan(1e-6);
    expect(r.verdict.adequate).toBe(false);
    expect(r.verdict.reasons.join(" ")).toMatch(/declination/);
  });

  it("words the verdict from the p-values alone", () => {
    expect(coverageVerdict({ declination: 0.5, sidereal: 0.2, solar: 0.001 }).text).toMatch(/adequate.*solar time/);
    expect(coverageVerdict({ declination: 0.001, sidereal: 0.2 }).adequate).toBe(false);
  });
});
