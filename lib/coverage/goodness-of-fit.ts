/**
 * Goodness-of-fit tests of observed event distributions against an analytic expectation, for
 * the dataset page's "observed against expected" section. Pearson's chi-square (bins merged
 * until each expects at least 5 events, common practice after Cochran 1954) with the p-value
 * from jstat's chi-square distribution, and the one-sample Kolmogorov-Smirnov statistic with
 * the asymptotic Kolmogorov distribution (Stephens 1970 small-sample correction, as in
 * Numerical Recipes, Press et al. 2007, sec. 14.3.3). Pure; no framework.
 */
import { jStat } from "jstat";

export interface ChiSquareResult {
  chiSquare: number;
  /** Degrees of freedom: merged bins - 1 - fitted parameters. */
  dof: number;
  /** P(chi2 >= observed) under the expectation. */
  pValue: number;
  /** Bins after merging. */
  bins: number;
}

/**
 * Pearson's chi-square of observed counts against expected counts (same total assumed; the
 * expectation is rescaled to the observed total). Adjacent bins are merged, left to right,
 * until each expects at least minExpected; a remainder joins the last merged bin. Bins
 * expecting nothing but holding events make the test fail outright (p = 0).
 */
export function chiSquareTest(observed: ArrayLike<number>, expected: ArrayLike<number>, options: { minExpected?: number; fittedParameters?: number } = {}): ChiSquareResult {
  const minExpected = options.minExpected ?? 5;
  if (observed.length !== expected.length || observed.length === 0) throw new RangeError("observed and expected need the same, non-zero length");
  let nObs = 0, nExp = 0;
  for (let i = 0; i < observed.length; i++) { nObs += observed[i]; nExp += expected[i]; }
  if (!(nExp > 0)) throw new RangeError("the expectation is empty");
  const scale = nObs / nExp;
  const o: number[] = [], e: number[] = [];
  let ao = 0, ae = 0, outside = 0;
  for (let i = 0; i < observed.length; i++) {
    const ei = expected[i] * scale;
    if (ei <= 0) { outside += observed[i]; continue; }
    ao += observed[i]; ae += ei;
    if (ae >= minExpected) { o.push(ao); e.push(ae); ao = 0; ae = 0; }
  }
  if (ae > 0) {
    if (o.length > 0) { o[o.length - 1] += ao; e[e.length - 1] += ae; } else { o.push(ao); e.push(ae); }
  }
  const dof = o.length - 1 - (options.fittedParameters ?? 0);
  if (outside > 0) return { chiSquare: Infinity, dof: Math.max(dof, 1), pValue: 0, bins: o.length };
  let chi = 0;
  for (let k = 0; k < o.length; k++) chi += ((o[k] - e[k]) ** 2) / e[k];
  if (dof < 1) return { chiSquare: chi, dof, pValue: 1, bins: o.length };
  return { chiSquare: chi, dof, pValue: 1 - jStat.chisquare.cdf(chi, dof), bins: o.length };
}

/**
 * Kolmogorov's limiting distribution Q_KS(lambda) = 2 sum_{j>=1} (-1)^{j-1} exp(-2 j^2 lambda^2),
 * the probability that sqrt(n) D exceeds lambda (Kolmogorov 1933; Numerical Recipes eq. 14.3.7).
 */
export function kolmogorovQ(lambda: number): number {
  if (lambda < 0.2) return 1; // the series converges slowly there and Q is 1 to 1e-9
  let sum = 0, sign = 1;
  for (let j = 1; j <= 100; j++) {
    const term = sign * Math.exp(-2 * j * j * lambda * lambda);
    sum += term;
    if (Math.abs(term) < 1e-16) break;
    sign = -sign;
  }
  return Math.max(0, Math.min(1, 2 * sum));
}

export interface KsResult {
  /** D = sup |F_n(x) - F(x)|. */
  d: number;
  n: number;
  pValue: number;
}

/**
 * One-sample Kolmogorov-Smirnov test of samples against a continuous CDF. p-value from
 * Q_KS((sqrt(n) + 0.12 + 0.11 / sqrt(n)) D) (Stephens 1970). The samples are sorted in a copy.
 */
export function ksTest(samples: ArrayLike<number>, cdf: (x: number) => number): KsResult {
  const n = samples.length;
  if (n === 0) throw new RangeError("the KS test needs at least one sample");
  const x = Float64Array.from(samples).sort();
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(x[i]);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  const en = Math.sqrt(n);
  return { d, n, pValue: kolmogorovQ((en + 0.12 + 0.11 / en) * d) };
}

/**
 * CDF in declination (degrees) of arrival directions of an isotropic flux seen with a relative
 * exposure omega(dec): integral_{-90}^{dec} omega cos / integral over all, tabulated every
 * stepDeg (trapezoid rule) and linearly interpolated.
 */
export function declinationCdf(omega: (decRad: number) => number, stepDeg = 0.05): (decDeg: number) => number {
  const m = Math.round(180 / stepDeg);
  const h = 180 / m;
  const r = Math.PI / 180;
  const c = new Float64Array(m + 1);
  let prev = omega(-Math.PI / 2) * Math.cos(-Math.PI / 2);
  for (let k = 1; k <= m; k++) {
    const d = (-90 + k * h) * r;
    const f = omega(d) * Math.cos(d);
    c[k] = c[k - 1] + 0.5 * (prev + f) * h;
    prev = f;
  }
  const total = c[m];
  if (!(total > 0)) throw new RangeError("the exposure is zero everywhere");
  for (let k = 0; k <= m; k++) c[k] /= total;
  return (decDeg: number) => {
    const u = (decDeg + 90) / h;
    if (u <= 0) return 0;
    if (u >= m) return 1;
    const i = Math.floor(u);
    return c[i] + (c[i + 1] - c[i]) * (u - i);
  };
}

/** Expected counts per declination bin (edges in degrees) for n events, from declinationCdf. */
export function expectedCountsFromCdf(cdf: (decDeg: number) => number, edgesDeg: ArrayLike<number>, n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i + 1 < edgesDeg.length; i++) out.push(n * (cdf(edgesDeg[i + 1]) - cdf(edgesDeg[i])));
  return out;
}

/** Significance level below which a test says the expectation does not describe the data. */
export const GOF_ALPHA = 0.01;

export interface CoverageVerdict {
  adequate: boolean;
  /** One or two plain sentences. */
  text: string;
  reasons: string[];
}

/**
 * Plain-words verdict from the p-values. The tests compare the data with an ISOTROPIC sky seen
 * through the analytic exposure, so a failure has two possible causes: the exposure assumptions
 * (uniform coverage in sidereal time, full efficiency up to the cut) or a sky that is not
 * isotropic (a dipole shows in right ascension and sidereal time, its north-south part and
 * clusters in declination). `adequate` needs declination and sidereal-time rate to pass at
 * GOF_ALPHA; right ascension and solar time add reasons and notes.
 */
export function coverageVerdict(p: { declination: number; rightAscension?: number | null; sidereal: number; solar?: number | null }): CoverageVerdict {
  const reasons: string[] = [];
  if (p.declination < GOF_ALPHA) reasons.push("the declination distribution differs from the expected one");
  if (p.sidereal < GOF_ALPHA) reasons.push("the event rate is not flat in sidereal time");
  if (p.rightAscension != null && p.rightAscension < GOF_ALPHA) reasons.push("right ascensions are not uniform");
  const solarNote = p.solar != null && p.solar < GOF_ALPHA
    ? " The rate varies with solar time, so the uptime was not uniform (daily dead time, weather, maintenance); over whole years that averages out in sidereal time, which the sidereal-time test checks."
    : "";
  if (p.declination >= GOF_ALPHA && p.sidereal >= GOF_ALPHA) {
    const ra = reasons.length ? ` Only ${reasons.join(" and ")}, which points at the sky rather than the exposure (a dipole in right ascension).` : "";
    return { adequate: true, reasons, text: `The analytic exposure is adequate for these data: declinations and the sidereal-time rate agree with an isotropic sky seen through it (p ≥ ${GOF_ALPHA}).${ra}${solarNote}` };
  }
  return {
    adequate: false,
    reasons,
    text: `The data do not match an isotropic sky seen through the analytic exposure: ${reasons.join("; ")}. Either the exposure's assumptions fail (uneven uptime in sidereal time, efficiency below full inside the cut) or the sky is anisotropic. Use a data-driven exposure (time scrambling) and compare: it follows the real uptime, but it also absorbs any declination structure of the sky.${solarNote}`,
  };
}
