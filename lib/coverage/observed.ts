/**
 * Observed against expected, from histograms: the statistical part of the dataset page's
 * section, shared by the service (histograms counted in PostgreSQL) and the tests (histograms
 * counted from simulated events). Pure.
 */
import { configurationExposure } from "./model";
import { chiSquareTest, coverageVerdict, declinationCdf, expectedCountsFromCdf, kolmogorovQ, type ChiSquareResult, type CoverageVerdict } from "./goodness-of-fit";

/** Declination bins of the fine histogram: 1800 of 0.1 deg from -90 to +90. */
export const FINE_DEC_BINS = 1800;
/** Bins of right ascension (15 deg), local sidereal hour and UTC hour. */
export const HOUR_BINS = 24;

export interface CoverageHistograms {
  /** Counts in FINE_DEC_BINS declination bins of 0.1 deg, from -90. */
  decFine: ArrayLike<number>;
  /** Counts in 24 right-ascension bins of 15 deg, from 0. */
  ra: ArrayLike<number>;
  /** Counts per hour of local sidereal time (24). */
  sidereal: ArrayLike<number>;
  /** Counts per UTC hour (24). */
  solar: ArrayLike<number>;
}

export interface ObservedComparison {
  n: number;
  declination: { edgesDeg: number[]; counts: number[]; expected: number[]; chiSquare: ChiSquareResult; ks: { d: number; pValue: number; binDeg: number } };
  rightAscension: { edgesDeg: number[]; counts: number[]; expected: number[]; chiSquare: ChiSquareResult };
  sidereal: { counts: number[]; expected: number[]; chiSquare: ChiSquareResult };
  solar: { counts: number[]; expected: number[]; chiSquare: ChiSquareResult };
  verdict: CoverageVerdict;
}

const edges = (lo: number, hi: number, n: number) => Array.from({ length: n + 1 }, (_, i) => lo + ((hi - lo) * i) / n);

/**
 * Compares the histograms with the analytic (Sommers 2001) expectation for a latitude and a
 * zenith cut: declination by chi-square on 5 deg bins and by Kolmogorov-Smirnov with D taken at
 * the 0.1 deg bin edges (slightly conservative); right ascension, sidereal and solar hours
 * against flat (uniform sidereal coverage). Returns null when there are no events.
 */
export function compareWithAnalyticExposure(h: CoverageHistograms, latitudeDeg: number, zenithMaxDeg: number): ObservedComparison | null {
  if (h.decFine.length !== FINE_DEC_BINS) throw new RangeError(`the declination histogram has ${FINE_DEC_BINS} bins`);
  let n = 0;
  for (let k = 0; k < h.decFine.length; k++) n += h.decFine[k];
  if (n === 0) return null;
  const exposure = configurationExposure({ latitudeDeg, zenithMaxDeg, efficiency: { kind: "full", aboveEnergyEeV: null } });
  const cdf = declinationCdf(exposure.relative);
  const decEdges = edges(-90, 90, 36);
  const per = FINE_DEC_BINS / 36;
  const decCounts = decEdges.slice(0, -1).map((_, i) => {
    let s = 0;
    for (let k = i * per; k < (i + 1) * per; k++) s += h.decFine[k];
    return s;
  });
  const decExpected = expectedCountsFromCdf(cdf, decEdges, n);
  let cum = 0, dMax = 0;
  for (let k = 0; k < FINE_DEC_BINS; k++) {
    cum += h.decFine[k];
    dMax = Math.max(dMax, Math.abs(cum / n - cdf(-90 + ((k + 1) * 180) / FINE_DEC_BINS)));
  }
  const en = Math.sqrt(n);
  const ks = { d: dMax, pValue: kolmogorovQ((en + 0.12 + 0.11 / en) * dMax), binDeg: 180 / FINE_DEC_BINS };
  const flat = (counts: ArrayLike<number>) => {
    let t = 0;
    for (let k = 0; k < counts.length; k++) t += counts[k];
    return new Array<number>(counts.length).fill(t / counts.length);
  };
  const ra = Array.from(h.ra), sid = Array.from(h.sidereal), sol = Array.from(h.solar);
  const declination = { edgesDeg: decEdges, counts: decCounts, expected: decExpected, chiSquare: chiSquareTest(decCounts, decExpected), ks };
  const rightAscension = { edgesDeg: edges(0, 360, HOUR_BINS), counts: ra, expected: flat(ra), chiSquare: chiSquareTest(ra, flat(ra)) };
  const sidereal = { counts: sid, expected: flat(sid), chiSquare: chiSquareTest(sid, flat(sid)) };
  const solar = { counts: sol, expected: flat(sol), chiSquare: chiSquareTest(sol, flat(sol)) };
  const verdict = coverageVerdict({
    declination: Math.min(declination.chiSquare.pValue, ks.pValue),
    rightAscension: rightAscension.chiSquare.pValue,
    sidereal: sidereal.chiSquare.pValue,
    solar: solar.chiSquare.pValue,
  });
  return { n, declination, rightAscension, sidereal, solar, verdict };
}
