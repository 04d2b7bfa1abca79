import { describe, expect, it } from "vitest";
import { createRandom, deriveSeed } from "@/lib/sky/random";
import { expectClose } from "../helpers";

describe("seeded random streams", () => {
  it("gives the same sequence for the same seed and a different one for another seed", () => {
    const a = createRandom(42), b = createRandom(42), c = createRandom(43);
    const sa = Array.from({ length: 5 }, () => a.nextUint32());
    const sb = Array.from({ length: 5 }, () => b.nextUint32());
    const sc = Array.from({ length: 5 }, () => c.nextUint32());
    expect(sa).toEqual(sb);
    expect(sa).not.toEqual(sc);
  });

  it("has the mean 1/2 and variance 1/12 of a uniform deviate on [0, 1) (n = 200000)", () => {
    const r = createRandom(7);
    const n = 200_000;
    let s = 0, s2 = 0, outside = 0;
    for (let i = 0; i < n; i++) { const u = r.next(); if (!(u >= 0 && u < 1)) outside++; s += u; s2 += u * u; }
    expect(outside).toBe(0);
    const mean = s / n, variance = s2 / n - mean * mean;
    // Standard error of the mean is sqrt(1/12/n) = 6.5e-4; allow 5 of them.
    expectClose(mean, 0.5, 3.3e-3, "mean");
    expectClose(variance, 1 / 12, 1e-3, "variance");
  });

  it("draws standard normal deviates with mean 0 and variance 1 (n = 200000)", () => {
    const r = createRandom(11);
    const n = 200_000;
    let s = 0, s2 = 0;
    for (let i = 0; i < n; i++) { const g = r.nextGaussian(); s += g; s2 += g * g; }
    expectClose(s / n, 0, 0.012, "mean");
    expectClose(s2 / n, 1, 0.02, "variance");
  });

  it("draws integers in [0, n) uniformly (chi-square over 10 cells below the 0.1% point 27.9)", () => {
    const r = createRandom(3);
    const counts = new Array(10).fill(0);
    const n = 100_000;
    for (let i = 0; i < n; i++) counts[r.nextInt(10)]++;
    const chi2 = counts.reduce((acc, c) => acc + (c - n / 10) ** 2 / (n / 10), 0);
    // 99.9% point of chi-square with 9 degrees of freedom: 27.88 (standard tables).
    expect(chi2).toBeLessThan(27.88);
  });

  it("fills arrays with exactly the values of successive next() calls, and the stream continues identically", () => {
    for (const seed of [0, 1, 123456789, 2 ** 40 + 3]) {
      const one = createRandom(seed), bulk = createRandom(seed);
      const expected = Array.from({ length: 1000 }, () => one.next());
      const got = new Float64Array(600);
      bulk.fillUniform(got);
      const rest = new Float64Array(400);
      bulk.fillUniform(rest);
      expect([...got, ...rest]).toEqual(expected);
      expect(bulk.nextUint32()).toBe(one.nextUint32());
      expect(bulk.nextGaussian()).toBe(one.nextGaussian());
    }
  });

  it("derives distinct, repeatable child seeds per stream", () => {
    expect(deriveSeed(5, 0)).toBe(deriveSeed(5, 0));
    const seeds = new Set(Array.from({ length: 1000 }, (_, i) => deriveSeed(5, i)));
    expect(seeds.size).toBe(1000);
    for (const s of seeds) expect(Number.isSafeInteger(s)).toBe(true);
  });
});
