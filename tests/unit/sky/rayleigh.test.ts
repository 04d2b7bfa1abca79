import { describe, expect, it } from "vitest";
import { besselI0Scaled, rayleighAnalysis, riceCdf, riceUpperLimit, siderealCoverageWeights } from "@/lib/sky/rayleigh";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const D = Math.PI / 180;

describe("Rayleigh first harmonic in right ascension", () => {
  it("gives a = 2<cos ra>, b = 2<sin ra>, the phase in [0, 360) deg and P = exp(-N r^2 / 4) (Linsley 1975)", () => {
    // Hand-computable case: 4 events at RA 0, 0, 90, 180 deg: sum cos = 1, sum sin = 1.
    const res = rayleighAnalysis([0, 0, 90 * D, 180 * D]);
    expectClose(res.a, 0.5, 1e-15, "a");
    expectClose(res.b, 0.5, 1e-15, "b");
    expectClose(res.amplitude, Math.SQRT1_2, 1e-15, "r");
    expectClose(res.phaseDeg, 45, 1e-12, "phase");
    expectClose(res.p, Math.exp((-4 * 0.5) / 4), 1e-15, "p");
    expectClose(res.sigma, Math.sqrt(2 / 4), 1e-15, "sigma");
  });

  it("wraps the phase to [0, 360): events near RA 350 deg give a phase near 350, not -10", () => {
    const res = rayleighAnalysis([349 * D, 351 * D, -10 * D, 710 * D]);
    expectClose(res.phaseDeg, 350, 1e-9, "phase");
    expect(res.phaseDeg).toBeGreaterThanOrEqual(0);
  });

  it("has the isotropic 1% amplitude 4.29 / sqrt(N) (METHODS 8) and uniform p-values on isotropic skies (KS at 1%)", () => {
    const n = 500, skies = 400, rnd = createRandom(77);
    const ps: number[] = [];
    const ra = new Float64Array(n);
    for (let s = 0; s < skies; s++) {
      for (let i = 0; i < n; i++) ra[i] = 2 * Math.PI * rnd.next();
      ps.push(rayleighAnalysis(ra).p);
    }
    expectClose(rayleighAnalysis(ra).isotropicAmplitude99 * Math.sqrt(n), 4.29, 0.005, "4.29/sqrt(N)");
    ps.sort((a, b) => a - b);
    let dmax = 0;
    ps.forEach((p, k) => { dmax = Math.max(dmax, Math.abs(p - k / skies), Math.abs(p - (k + 1) / skies)); });
    // One-sample Kolmogorov-Smirnov critical value at 1%: 1.628 / sqrt(n) (asymptotic; Massey 1951, JASA 46, 68).
    expect(dmax).toBeLessThan(1.628 / Math.sqrt(skies));
  });

  it("uses N_eff = W^2 / sum w^2 with weights, and equal weights change nothing", () => {
    const ra = [0.1, 1.3, 2.9, 4.4, 5.0];
    const u = rayleighAnalysis(ra), w = rayleighAnalysis(ra, [2, 2, 2, 2, 2]);
    expectClose(w.a, u.a, 1e-15, "a"); expectClose(w.p, u.p, 1e-15, "p");
    const v = rayleighAnalysis(ra, [1, 2, 1, 2, 1]);
    expectClose(v.nEffective, 49 / 11, 1e-12, "N_eff");
  });

  it("computes e^-x I0(x) within 2e-7 relative of tabulated values (Abramowitz & Stegun table 9.8)", () => {
    // I0(1) = 1.266065878, I0(2) = 2.279585302, I0(5) = 27.23987182 (A&S table 9.8; from memory).
    expectClose(besselI0Scaled(0), 1, 2e-7, "I0(0)");
    expectClose(besselI0Scaled(1) * Math.E, 1.266065878, 3e-7, "I0(1)");
    expectClose(besselI0Scaled(2) * Math.exp(2), 2.279585302, 5e-7, "I0(2)");
    expectClose(besselI0Scaled(5) * Math.exp(5) / 27.23987182, 1, 2e-7, "I0(5)");
  });

  it("has a Rice CDF equal to the Rayleigh CDF for s = 0 and to its seeded simulation for s > 0", () => {
    for (const r of [0.3, 1, 2.5]) expectClose(riceCdf(r, 0, 1), 1 - Math.exp(-r * r / 2), 1e-12, `Rayleigh r=${r}`);
    // Monte Carlo of |(s, 0) + sigma (g1, g2)| with sigma = 1, s = 2: P(R <= 2), 200000 draws (std. error 0.0011).
    const rnd = createRandom(8);
    let k = 0;
    for (let i = 0; i < 200_000; i++) if (Math.hypot(2 + rnd.nextGaussian(), rnd.nextGaussian()) <= 2) k++;
    expectClose(riceCdf(2, 2, 1), k / 200_000, 0.005, "Rice CDF");
    expectClose(riceCdf(50, 2, 1), 1, 1e-9, "normalisation");
  });

  it("sets the 99% upper limit so that P(R <= r | s_UL) = 1%, reports it only when not significant", () => {
    const ul = riceUpperLimit(0.02, 0.01);
    expectClose(riceCdf(0.02, ul, 0.01), 0.01, 1e-8, "coverage");
    expect(ul).toBeGreaterThan(0.02);
    expect(riceUpperLimit(0.001, 0.01)).toBe(0); // r < 0.1418 sigma: no positive limit
    // A strong modulation is significant: no upper limit.
    const ra = Array.from({ length: 2000 }, (_, i) => (i % 4 === 0 ? 0 : (2 * Math.PI * i) / 2000));
    const res = rayleighAnalysis(ra);
    expect(res.significant).toBe(true);
    expect(res.amplitudeUpperLimit99).toBeNull();
  });

  it("weights each local-sidereal-time bin to the same total weight", () => {
    const lst = [0.1, 0.2, 0.3, 3.3, -0.05 + 2 * Math.PI];
    const w = siderealCoverageWeights(lst, 2);
    // Bin 0 holds 3 events (0.1, 0.2, 0.3), bin 1 holds 2 (3.3, 6.23): mean over filled bins 2.5.
    expectClose(w[0], 2.5 / 3, 1e-15, "bin 0");
    expectClose(w[3], 2.5 / 2, 1e-15, "bin 1");
  });
});
