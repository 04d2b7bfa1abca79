/**
 * First harmonic in right ascension (Rayleigh analysis; Linsley 1975, PRL 34, 1530),
 * METHODS section 6:
 *   a = (2/W) sum w_i cos(ra_i), b = (2/W) sum w_i sin(ra_i), W = sum w_i,
 *   amplitude r = sqrt(a^2 + b^2), phase = atan2(b, a) in [0, 360) deg,
 *   chance probability P(>= r) = exp(-N r^2 / 4), sigma_a = sigma_b = sqrt(2 / N).
 * With weights, N is the effective number of events N_eff = W^2 / sum w_i^2 (Kish's
 * effective sample size; common practice), which equals N for unit weights.
 *
 * Upper limit: when the amplitude is not significant, the 99% upper limit on the true
 * amplitude s is the classical (Neyman) limit from the Rice distribution of the measured
 * amplitude for a true amplitude s and per-component standard deviation sigma = sqrt(2/N)
 * (Linsley 1975 uses the same distribution): the s for which an amplitude <= r would be
 * measured with probability 1%. For r < 0.1418 sigma no such s > 0 exists and the limit is
 * reported as 0; the isotropic 1% amplitude sqrt(-4 ln 0.01 / N) = 4.29 / sqrt(N) (METHODS 8)
 * is reported beside it as the sensitivity.
 */

/** Result of a Rayleigh analysis. Angles in degrees. */
export interface RayleighResult {
  /** Number of events. */
  n: number;
  /** Effective number of events W^2 / sum w^2 (= n for unit weights). */
  nEffective: number;
  a: number;
  b: number;
  amplitude: number;
  /** Phase (right ascension of the maximum), degrees in [0, 360). */
  phaseDeg: number;
  /** Chance probability of an amplitude >= the measured one from isotropy, exp(-N_eff r^2 / 4). */
  p: number;
  /** Standard deviation of a and b, sqrt(2 / N_eff). */
  sigma: number;
  /** True when p < the significance threshold (default 0.01). */
  significant: boolean;
  /** 99% upper limit on the amplitude (Rice, Neyman), null when significant. */
  amplitudeUpperLimit99: number | null;
  /** Amplitude exceeded with 1% probability from isotropy, sqrt(-4 ln 0.01 / N_eff). */
  isotropicAmplitude99: number;
}

/**
 * Rayleigh first-harmonic analysis of right ascensions (radians, any range) with optional
 * non-negative weights (e.g. siderealCoverageWeights). threshold: p below which the
 * amplitude is called significant (default 0.01).
 */
export function rayleighAnalysis(raRad: ArrayLike<number>, weights?: ArrayLike<number>, threshold = 0.01): RayleighResult {
  const n = raRad.length;
  let sc = 0, ss = 0, w = 0, w2 = 0;
  if (weights) {
    if (weights.length !== n) throw new RangeError("weights must match the events");
    for (let i = 0; i < n; i++) { const wi = weights[i]; sc += wi * Math.cos(raRad[i]); ss += wi * Math.sin(raRad[i]); w += wi; w2 += wi * wi; }
  } else {
    for (let i = 0; i < n; i++) { sc += Math.cos(raRad[i]); ss += Math.sin(raRad[i]); }
    w = n; w2 = n;
  }
  return rayleighFromSums(n, sc, ss, w, w2, threshold);
}

/** Rayleigh result from the sums sum w cos, sum w sin, W and sum w^2 (for streaming or worker use). */
export function rayleighFromSums(n: number, sumCos: number, sumSin: number, sumW: number, sumW2: number, threshold = 0.01): RayleighResult {
  if (!(sumW > 0)) throw new RangeError("no events (or zero total weight)");
  const a = (2 / sumW) * sumCos, b = (2 / sumW) * sumSin;
  const nEff = (sumW * sumW) / sumW2;
  const r = Math.hypot(a, b);
  let phase = (Math.atan2(b, a) * 180) / Math.PI;
  if (phase < 0) phase += 360;
  if (phase >= 360) phase -= 360;
  const p = Math.exp((-nEff * r * r) / 4);
  const sigma = Math.sqrt(2 / nEff);
  const significant = p < threshold;
  return {
    n, nEffective: nEff, a, b, amplitude: r, phaseDeg: phase, p, sigma, significant,
    amplitudeUpperLimit99: significant ? null : riceUpperLimit(r, sigma, 0.99),
    isotropicAmplitude99: Math.sqrt((-4 * Math.log(0.01)) / nEff),
  };
}

/**
 * Exponentially scaled modified Bessel function e^{-x} I0(x), x >= 0, from the polynomial
 * approximations of Abramowitz & Stegun 9.8.1 and 9.8.2 (relative error < 2e-7).
 */
export function besselI0Scaled(x: number): number {
  const ax = Math.abs(x);
  if (ax < 3.75) {
    const t = (ax / 3.75) ** 2;
    const i0 = 1 + t * (3.5156229 + t * (3.0899424 + t * (1.2067492 + t * (0.2659732 + t * (0.0360768 + t * 0.0045813)))));
    return i0 * Math.exp(-ax);
  }
  const t = 3.75 / ax;
  const poly = 0.39894228 + t * (0.01328592 + t * (0.00225319 + t * (-0.00157565 + t * (0.00916281 + t * (-0.02057706 + t * (0.02635537 + t * (-0.01647633 + t * 0.00392377)))))));
  return poly / Math.sqrt(ax);
}

/**
 * CDF of the Rice distribution P(R <= r | s, sigma): the amplitude of a 2-D Gaussian vector
 * of mean length s and per-component standard deviation sigma (Rice 1944). Integrated
 * numerically (composite 8-point Gauss-Legendre on 64 panels, in units of sigma).
 */
export function riceCdf(r: number, s: number, sigma: number): number {
  if (!(r > 0)) return 0;
  const R = r / sigma, nu = s / sigma;
  if (nu === 0) return 1 - Math.exp((-R * R) / 2);
  // Integrand x exp(-(x - nu)^2 / 2) I0e(x nu); negligible beyond nu + 12 sigma.
  const upper = Math.min(R, nu + 12 + Math.sqrt(R));
  const panels = 64, h = upper / panels;
  let sum = 0;
  for (let k = 0; k < panels; k++) {
    const m = (k + 0.5) * h;
    for (let q = 0; q < 8; q++) {
      const x = m + 0.5 * h * GL8_X[q];
      sum += GL8_W[q] * x * Math.exp((-(x - nu) * (x - nu)) / 2) * besselI0Scaled(x * nu);
    }
  }
  return Math.min(1, (sum * h) / 2);
}

// 8-point Gauss-Legendre nodes and weights on [-1, 1] (Abramowitz & Stegun table 25.4).
const GL8_X = [-0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498, 0.525532409916329, 0.7966664774136267, 0.9602898564975363];
const GL8_W = [0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763];

/**
 * Classical upper limit at confidence level cl on a harmonic amplitude: the true amplitude
 * s with P(R <= r | s, sigma) = 1 - cl (Rice distribution; bisection to 1e-10 sigma).
 * Returns 0 when even s = 0 gives P(R <= r) < 1 - cl.
 */
export function riceUpperLimit(r: number, sigma: number, cl = 0.99): number {
  const target = 1 - cl;
  if (riceCdf(r, 0, sigma) <= target) return 0;
  let lo = 0, hi = r + 10 * sigma;
  while (riceCdf(r, hi, sigma) > target) hi *= 2;
  for (let it = 0; it < 100 && hi - lo > 1e-10 * sigma; it++) {
    const mid = (lo + hi) / 2;
    if (riceCdf(r, mid, sigma) > target) lo = mid; else hi = mid;
  }
  return (lo + hi) / 2;
}

/**
 * Weights correcting for non-uniform coverage in local sidereal time: w_i = <n> / n(bin of
 * event i), with the events histogrammed in nBins equal bins of local sidereal time
 * (radians, any range), so every sidereal-time bin carries the same total weight (common
 * practice in large-scale anisotropy analyses). Mean weight 1.
 */
export function siderealCoverageWeights(localSiderealTimeRad: ArrayLike<number>, nBins = 24): Float64Array {
  const n = localSiderealTimeRad.length;
  const bins = new Int32Array(n);
  const counts = new Float64Array(nBins);
  const twoPi = 2 * Math.PI;
  for (let i = 0; i < n; i++) {
    let t = localSiderealTimeRad[i] % twoPi;
    if (t < 0) t += twoPi;
    let k = Math.floor((t / twoPi) * nBins);
    if (k >= nBins) k = nBins - 1;
    bins[i] = k;
    counts[k]++;
  }
  let filled = 0;
  for (let k = 0; k < nBins; k++) if (counts[k] > 0) filled++;
  const mean = n / filled;
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) w[i] = mean / counts[bins[i]];
  return w;
}
