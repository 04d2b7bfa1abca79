import { describe, expect, it } from "vitest";
import { erfc, oneSidedSigmaFromP, runTrials, trialSkyFineNside } from "@/lib/sky/trials";
import { exposureEpochs } from "@/lib/sky/exposure";
import { declinationWindowFractions, scanGeometry, searchBestWindow, type SearchSpec } from "@/lib/sky/scan";
import { createDeclinationSampler, drawIsotropicSky, tabulateZDensity } from "@/lib/sky/isotropic";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const D = Math.PI / 180;
const omega = (d: number) => Math.max(0, Math.cos(d + 0.6)); // a smooth southern exposure
const sampler = createDeclinationSampler(omega);
const NSIDE = 8;
const spec: SearchSpec = {
  nside: NSIDE, radiiDeg: [10, 20],
  fractions: [declinationWindowFractions(NSIDE, 10 * D, omega), declinationWindowFractions(NSIDE, 20 * D, omega)],
  thresholdsEeV: [0, 10],
};
function observedSky(n: number, seed: number) {
  const sky = drawIsotropicSky(n, sampler, createRandom(seed));
  const rnd = createRandom(seed + 1);
  const energyEeV = Float64Array.from({ length: n }, () => 1 / (1 - rnd.next()) ** 1.5); // power law above 1 EeV
  return { ...sky, energyEeV };
}

describe("post-trial probability from isotropic simulated skies", () => {
  it("gives identical sky-by-sky results with 0, 1 and 2 worker threads (seeded per sky)", async () => {
    const events = observedSky(300, 1);
    const base = { events, search: spec, skyModel: { kind: "declination" as const, zDensity: tabulateZDensity(omega) }, nSkies: 10, seed: 42, batchSize: 3 };
    const r0 = await runTrials({ ...base, workers: 0 });
    const r1 = await runTrials({ ...base, workers: 1 });
    const r2 = await runTrials({ ...base, workers: 2 });
    expect(Array.from(r1.skyBest)).toEqual(Array.from(r0.skyBest));
    expect(Array.from(r2.skyBest)).toEqual(Array.from(r0.skyBest));
    expect(r2.postTrialP).toBe(r0.postTrialP);
    expect(r0.observed.significance).toBeGreaterThan(0);
  }, 30_000);

  it("gives uniform post-trial p-values for isotropic observed skies (40 skies, KS at 1%)", async () => {
    // Null distribution of the best significance from 300 simulated skies (run once), then
    // p = fraction of it reaching the best of each of 40 independent isotropic skies.
    const small: SearchSpec = { ...spec, radiiDeg: [15], fractions: [declinationWindowFractions(NSIDE, 15 * D, omega)], thresholdsEeV: [] };
    const ref = await runTrials({ events: observedSky(200, 7), search: small, skyModel: { kind: "declination", zDensity: tabulateZDensity(omega) }, nSkies: 300, seed: 9, workers: 0 });
    const g = scanGeometry(NSIDE);
    const ps: number[] = [];
    for (let k = 0; k < 40; k++) {
      const best = searchBestWindow(drawIsotropicSky(200, sampler, createRandom(5000 + k)), null, small, g).significance;
      let reach = 0;
      for (const s of ref.skyBest) if (s >= best) reach++;
      ps.push(reach / ref.skyBest.length);
    }
    ps.sort((a, b) => a - b);
    let dmax = 0;
    ps.forEach((p, k) => { dmax = Math.max(dmax, Math.abs(p - k / 40), Math.abs(p - (k + 1) / 40)); });
    // KS one-sample critical value at 1%: 1.628 / sqrt(n) (asymptotic form; Massey 1951, JASA 46, 68).
    expect(dmax).toBeLessThan(1.628 / Math.sqrt(40));
  }, 30_000);

  /** Two-sample Kolmogorov-Smirnov distance between two samples. */
  function ksDistance(a: Float64Array, b: Float64Array): number {
    const x = Float64Array.from(a).sort(), y = Float64Array.from(b).sort();
    let i = 0, j = 0, d = 0;
    while (i < x.length && j < y.length) {
      const v = Math.min(x[i], y[j]);
      while (i < x.length && x[i] === v) i++;
      while (j < y.length && y[j] === v) j++;
      d = Math.max(d, Math.abs(i / x.length - j / y.length));
    }
    return d;
  }
  // Two-sample KS critical value at alpha = 0.001: sqrt(-ln(alpha / 2) / 2) sqrt((n + m) / (n m))
  // (the asymptotic Kolmogorov distribution; e.g. NIST/SEMATECH e-Handbook 1.3.5.16).
  const ksCritical = (n: number, m: number) => Math.sqrt(-Math.log(0.0005) / 2) * Math.sqrt((n + m) / (n * m));

  it("draws quantised skies (events at fine-grid pixel centres) whose best-window distribution matches continuous skies (two-sample KS at 0.1%), radii and energy thresholds included", async () => {
    const events = observedSky(3000, 21);
    const base = { events, search: spec, skyModel: { kind: "declination" as const, zDensity: tabulateZDensity(omega) }, nSkies: 300, workers: 0 };
    const continuous = await runTrials({ ...base, seed: 5, skies: "continuous" });
    // a fine grid of Nside 64 (0.9 deg pixels) against windows of Nside 8 (7 deg apart), 10 and 20 deg
    const quantised = await runTrials({ ...base, seed: 6, skies: "quantised", fineNside: 64 });
    expect(continuous.skies).toEqual({ kind: "continuous", fineNside: null });
    expect(quantised.skies).toEqual({ kind: "quantised", fineNside: 64 });
    expect(ksDistance(continuous.skyBest, quantised.skyBest)).toBeLessThan(ksCritical(300, 300));
    // and the observed search is the same exact one either way
    expect(quantised.observed).toEqual(continuous.observed);
  }, 60_000);

  it("draws quantised skies of a precessed exposure in the equator of date that match continuous precessed skies (two-sample KS at 0.1%)", async () => {
    const events = observedSky(3000, 22);
    const times = Float64Array.from({ length: 3000 }, (_, i) => Date.UTC(2024, 0, 1) + i * 20_000_000);
    const ep = exposureEpochs(times, 4);
    const epochs = Array.from(ep.weight, (weight, k) => ({ weight, icrsToDate: ep.matrices.subarray(9 * k, 9 * k + 9) }));
    const one: SearchSpec = { ...spec, thresholdsEeV: [] };
    const skyModel = { kind: "declination" as const, zDensity: tabulateZDensity(omega), epochs };
    const continuous = await runTrials({ events, search: one, skyModel, nSkies: 300, seed: 7, workers: 0, skies: "continuous" });
    const quantised = await runTrials({ events, search: one, skyModel, nSkies: 300, seed: 8, workers: 0, skies: "quantised", fineNside: 64 });
    expect(ksDistance(continuous.skyBest, quantised.skyBest)).toBeLessThan(ksCritical(300, 300));
  }, 60_000);

  it("picks the fine grid of quantised skies: 4 x the window Nside, at least 256, 8 spacings across the smallest radius, at most 1024", () => {
    expect(trialSkyFineNside(64, [20])).toBe(256);
    expect(trialSkyFineNside(128, [20])).toBe(512);
    expect(trialSkyFineNside(64, [1, 20])).toBe(512); // 58.6 / 512 = 0.114 deg <= 1/8
    expect(trialSkyFineNside(256, [0.1])).toBe(1024);
  });

  it("reports p = 0 as an upper bound 1/nSkies and a lower bound on the sigma, never infinity", async () => {
    const events = observedSky(300, 3);
    // Inject 40 events within 3 deg of (RA 30, dec -40): a huge local excess.
    const rnd = createRandom(4);
    for (let i = 0; i < 40; i++) {
      const ra = (30 + 3 * (rnd.next() - 0.5)) * D, dec = (-40 + 3 * (rnd.next() - 0.5)) * D;
      events.x[i] = Math.cos(dec) * Math.cos(ra); events.y[i] = Math.cos(dec) * Math.sin(ra); events.z[i] = Math.sin(dec);
    }
    const res = await runTrials({ events, search: spec, skyModel: { kind: "declination", zDensity: tabulateZDensity(omega) }, nSkies: 20, seed: 1, workers: 0 });
    expect(res.nReached).toBe(0);
    expect(res.postTrialP).toBe(0);
    expect(res.postTrialPUpperBound).toBe(1 / 20);
    expect(res.postTrialSigma).toBeNull();
    expectClose(res.postTrialSigmaLowerBound!, 1.644854, 1e-5, "sigma for p = 0.05");
  });

  it("reports progress and stops with an AbortError when cancelled", async () => {
    const events = observedSky(300, 1);
    const ctrl = new AbortController();
    const seen: number[] = [];
    const run = runTrials({
      events, search: spec, skyModel: { kind: "declination", zDensity: tabulateZDensity(omega) }, nSkies: 500, seed: 1, workers: 1, batchSize: 2,
      signal: ctrl.signal, onProgress: (done) => { seen.push(done); if (done >= 4) ctrl.abort(); },
    });
    await expect(run).rejects.toMatchObject({ name: "AbortError" });
    expect(seen[0]).toBeGreaterThan(0);
    expect(seen[seen.length - 1]).toBeLessThan(500);
  }, 30_000);

  it("converts p to one-sided Gaussian sigma: 1.3499e-3 -> 3, 2.8665e-7 -> 5 (standard normal tail)", () => {
    // Standard normal upper-tail values (Abramowitz & Stegun table 26.1; from memory).
    expectClose(oneSidedSigmaFromP(1.349898e-3), 3, 1e-5, "3 sigma");
    expectClose(oneSidedSigmaFromP(2.866516e-7), 5, 1e-5, "5 sigma");
    expectClose(oneSidedSigmaFromP(0.5), 0, 1e-6, "0 sigma");
    expectClose(erfc(1), 0.157299207, 2e-8, "erfc(1)");
    expect(() => oneSidedSigmaFromP(0)).toThrow(RangeError);
  });
});
