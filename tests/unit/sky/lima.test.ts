import { describe, expect, it } from "vitest";
import { liMaEq5, liMaEq9, liMaSignificance, liMaSignificanceFromFraction } from "@/lib/sky/lima";
import { expectClose } from "../helpers";

describe("Li & Ma significance", () => {
  // Check values: METHODS.md section 8, from Li & Ma 1983 (ApJ 272, 317) eqs. 5, 9, 17.
  it("gives S = 3.685032 sigma by eq. 17 for N_on = 10, N_off = 20, alpha = 0.1", () => {
    expectClose(liMaSignificance(10, 20, 0.1), 3.685032, 5e-7, "eq. 17");
  });
  it("gives 4.6188 sigma by eq. 9 and 2.504897 sigma by eq. 5 for the same counts", () => {
    expectClose(liMaEq9(10, 20, 0.1), 4.6188, 5e-5, "eq. 9");
    expectClose(liMaEq5(10, 20, 0.1), 2.504897, 5e-7, "eq. 5");
  });

  it("is negative for a deficit and zero when N_on equals alpha N_off exactly", () => {
    expect(liMaSignificance(1, 20, 0.1)).toBeLessThan(0);
    expect(liMaSignificance(2, 20, 0.1)).toBe(0);
    expect(liMaSignificance(3, 20, 0.1)).toBeGreaterThan(0);
  });

  it("keeps only the off term when N_on = 0: S = -sqrt(2 N_off ln(1 + alpha)) (zero-count term vanishes)", () => {
    // With N_on = 0 eq. 17 reduces analytically to sqrt(2 N_off ln(1 + alpha)).
    expectClose(liMaSignificance(0, 50, 0.2), -Math.sqrt(2 * 50 * Math.log(1.2)), 1e-12, "N_on = 0");
    // With N_off = 0: S = sqrt(2 N_on ln((1 + alpha) / alpha)).
    expectClose(liMaSignificance(7, 0, 0.5), Math.sqrt(2 * 7 * Math.log(3)), 1e-12, "N_off = 0");
    expect(liMaSignificance(0, 0, 0.3)).toBe(0);
  });

  it("is symmetric under exchanging on and off with alpha -> 1/alpha (sign flips)", () => {
    // Swapping the roles of the regions is the same likelihood ratio (Li & Ma eq. 17 is
    // symmetric in (N_on, alpha) <-> (N_off, 1/alpha)); the excess becomes a deficit.
    for (const [on, off, a] of [[10, 20, 0.1], [123, 456, 0.3], [5, 5, 1.7]] as const) {
      expectClose(liMaSignificance(off, on, 1 / a), -liMaSignificance(on, off, a), 1e-10, `swap ${on},${off}`);
    }
  });

  it("tends to the eq. 9 Gaussian form as the counts grow at a fixed excess in sigma", () => {
    // Invariant: for large counts eq. 17 / eq. 9 -> 1 (Li & Ma 1983, discussion of eq. 17).
    let lastGap = Infinity;
    for (const nOff of [1e2, 1e4, 1e6, 1e8]) {
      const alpha = 0.05;
      const nExp = alpha * nOff;
      const nOn = nExp + 3 * Math.sqrt(alpha * (nExp + nOff)); // about +3 sigma
      const gap = Math.abs(liMaSignificance(nOn, nOff, alpha) / liMaEq9(nOn, nOff, alpha) - 1);
      expect(gap).toBeLessThan(lastGap);
      lastGap = gap;
    }
    expect(lastGap).toBeLessThan(1e-3);
  });

  it("computes alpha = f / (1 - f) and N_off = N - N_on from an exposure fraction", () => {
    // f = 1/11 gives alpha = 0.1; N = 30, N_on = 10 is the METHODS section 8 case again.
    expectClose(liMaSignificanceFromFraction(10, 30, 1 / 11), 3.685032, 5e-7, "from fraction");
    expect(liMaSignificanceFromFraction(0, 100, 0)).toBe(0);
    expect(Number.isNaN(liMaSignificance(-1, 3, 0.1))).toBe(true);
  });
});
