/**
 * Exposure integrated over a spherical cap (a top-hat window) for an exposure that depends
 * on declination only, omega(dec):
 *
 *   W(dec_c, psi) = integral over the cap of omega dOmega
 *                 = integral_{dec_c - psi}^{dec_c + psi} omega(dec) 2 dRA(dec) cos(dec) d dec,
 *
 * where dRA(dec) is the half-width in right ascension of the cap at declination dec
 * (spherical law of cosines: cos psi = sin dec sin dec_c + cos dec cos dec_c cos dRA, so
 * cos dRA = (cos psi - sin dec sin dec_c) / (cos dec cos dec_c), clamped to [-1, 1]).
 *
 * Quadrature: the declination range is split at every point where the integrand is not
 * smooth: the cap's ends, the declination beyond which a cap over a pole covers whole
 * circles, and the caller's exposure breakpoints (for Sommers 2001 the band edges
 * dec = lat +- theta_max, where omega rises like a square root). On each piece
 * [a, b] the substitution dec = (a + b) / 2 - (b - a) / 2 cos t, t in [0, pi], turns the
 * square-root end behaviour into a smooth function of t, and adaptive Gauss-Legendre
 * (16 points, bisection until two levels agree to the relative tolerance) integrates it.
 * Default relative tolerance 1e-9, comfortably inside the 1e-5 requirement.
 *
 * Everything here is in radians; omega is any non-negative function of declination
 * (equatorial frame of the caller's choice: ICRS, or equator of date for a precessed model).
 */

/** An exposure that depends on declination only: radians in [-pi/2, pi/2] -> relative exposure >= 0. */
export type DeclinationExposure = (decRad: number) => number;

/** Options for the cap integrals. */
export interface CapQuadratureOptions {
  /** Declinations (radians) where omega has a kink or a square-root onset, e.g. band edges. */
  breakpointsDecRad?: ReadonlyArray<number>;
  /** Relative tolerance of the adaptive quadrature (default 1e-9). */
  relTol?: number;
}

const GL_ORDER = 16;
/** Gauss-Legendre nodes and weights on [-1, 1] (Newton iteration on P_n; Abramowitz & Stegun 25.4.29). */
const GL = gaussLegendre(GL_ORDER);

function gaussLegendre(n: number): { x: Float64Array; w: Float64Array } {
  const x = new Float64Array(n), w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let t = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1, p1 = t;
      for (let k = 2; k <= n; k++) { const p2 = ((2 * k - 1) * t * p1 - (k - 1) * p0) / k; p0 = p1; p1 = p2; }
      dp = (n * (t * p1 - p0)) / (t * t - 1);
      const dt = p1 / dp;
      t -= dt;
      if (Math.abs(dt) < 1e-16) break;
    }
    x[i] = t;
    w[i] = 2 / ((1 - t * t) * dp * dp);
  }
  return { x, w };
}

/** Gauss-Legendre estimate of integral_{t0}^{t1} g(t) dt. */
function glOnce(g: (t: number) => number, t0: number, t1: number): number {
  const h = (t1 - t0) / 2, m = (t0 + t1) / 2;
  let s = 0;
  for (let k = 0; k < GL_ORDER; k++) s += GL.w[k] * g(m + h * GL.x[k]);
  return s * h;
}

function adaptive(g: (t: number) => number, t0: number, t1: number, whole: number, absTol: number, depth: number): number {
  const m = (t0 + t1) / 2;
  const left = glOnce(g, t0, m), right = glOnce(g, m, t1);
  const both = left + right;
  if (depth >= 30 || Math.abs(both - whole) <= absTol) return both;
  return adaptive(g, t0, m, left, absTol / 2, depth + 1) + adaptive(g, m, t1, right, absTol / 2, depth + 1);
}

/**
 * integral_a^b f(dec) d dec with square-root-tolerant substitution and adaptive
 * Gauss-Legendre, splitting at the given interior breakpoints.
 */
function integratePieces(f: (decRad: number) => number, a: number, b: number, breaks: number[], relTol: number, scale: number): number {
  const pts = [a];
  for (const p of breaks.sort((u, v) => u - v)) if (p > a + 1e-15 && p < b - 1e-15) pts.push(p);
  pts.push(b);
  let total = 0;
  for (let k = 0; k + 1 < pts.length; k++) {
    const lo = pts[k], hi = pts[k + 1];
    const mid = (lo + hi) / 2, half = (hi - lo) / 2;
    const g = (t: number): number => f(mid - half * Math.cos(t)) * half * Math.sin(t);
    const first = glOnce(g, 0, Math.PI);
    total += adaptive(g, 0, Math.PI, first, Math.max(relTol * Math.abs(scale) * (hi - lo) / (b - a), 1e-300), 0);
  }
  return total;
}

/**
 * Half-width in right ascension (radians, [0, pi]) of a cap of radius radiusRad centred at
 * declination centreDecRad, on the circle of declination decRad (0 where the circle misses
 * the cap, pi where it lies wholly inside). Spherical law of cosines.
 */
export function capHalfWidthRaRad(decRad: number, centreDecRad: number, radiusRad: number): number {
  const cd = Math.cos(decRad) * Math.cos(centreDecRad);
  const num = Math.cos(radiusRad) - Math.sin(decRad) * Math.sin(centreDecRad);
  if (cd <= 0) return num <= 0 ? Math.PI : 0;
  const t = num / cd;
  return t >= 1 ? 0 : t <= -1 ? Math.PI : Math.acos(t);
}

/**
 * Integral of omega over a spherical cap, in (units of omega) x steradian. Centre
 * declination in [-pi/2, pi/2], radius in (0, pi], radians. For omega = 1 it is the cap
 * area 2 pi (1 - cos psi). See the module comment for the method.
 */
export function capExposureIntegral(omega: DeclinationExposure, centreDecRad: number, radiusRad: number, options: CapQuadratureOptions = {}): number {
  const relTol = options.relTol ?? 1e-9;
  const halfPi = Math.PI / 2;
  if (!(radiusRad > 0)) return 0;
  const lo = Math.max(-halfPi, centreDecRad - radiusRad);
  const hi = Math.min(halfPi, centreDecRad + radiusRad);
  const breaks: number[] = [];
  for (const b of options.breakpointsDecRad ?? []) breaks.push(b);
  // Beyond these declinations a cap over a pole contains whole circles of declination.
  if (centreDecRad + radiusRad > halfPi) breaks.push(Math.PI - centreDecRad - radiusRad);
  if (centreDecRad - radiusRad < -halfPi) breaks.push(radiusRad - Math.PI - centreDecRad);
  // A rough scale for the absolute tolerance: the cap area times the largest sampled omega.
  const area = 2 * Math.PI * (1 - Math.cos(Math.min(radiusRad, Math.PI)));
  let omegaScale = 0;
  for (let k = 0; k <= 8; k++) omegaScale = Math.max(omegaScale, omega(lo + ((hi - lo) * k) / 8));
  const scale = area * (omegaScale > 0 ? omegaScale : 1);
  const f = (d: number): number => {
    const c = Math.cos(d);
    if (c <= 0) return 0;
    return omega(d) * 2 * capHalfWidthRaRad(d, centreDecRad, radiusRad) * c;
  };
  return integratePieces(f, lo, hi, breaks, relTol, scale);
}

/** Integral of omega over the whole sphere, integral omega(dec) 2 pi cos(dec) d dec, in (units of omega) x sr. */
export function totalExposureIntegral(omega: DeclinationExposure, options: CapQuadratureOptions = {}): number {
  const relTol = options.relTol ?? 1e-9;
  const f = (d: number): number => omega(d) * 2 * Math.PI * Math.cos(d);
  let omegaScale = 0;
  for (let k = 0; k <= 32; k++) omegaScale = Math.max(omegaScale, omega(-Math.PI / 2 + (Math.PI * k) / 32));
  return integratePieces(f, -Math.PI / 2, Math.PI / 2, [...(options.breakpointsDecRad ?? [])], relTol, 4 * Math.PI * (omegaScale || 1));
}

/**
 * Exposure fraction f = W(dec_c, psi) / W_total for each centre declination (radians) in
 * centreDecRad: the share of the expected events falling in the window (METHODS 5). All
 * centres of one HEALPix ring share a declination, so callers pass one value per ring.
 */
export function capExposureFractions(omega: DeclinationExposure, centreDecRad: ArrayLike<number>, radiusRad: number, options: CapQuadratureOptions = {}): Float64Array {
  const total = totalExposureIntegral(omega, options);
  const out = new Float64Array(centreDecRad.length);
  for (let k = 0; k < out.length; k++) out[k] = total > 0 ? capExposureIntegral(omega, centreDecRad[k], radiusRad, options) / total : 0;
  return out;
}

/**
 * Tabulated cap fraction f(dec_c) with cubic interpolation, for models that need f at many
 * centre declinations (e.g. declinations of date, which differ within a ring). f is smooth
 * except where a cap edge (dec_c +- psi) meets an exposure breakpoint or a pole, so the
 * table is split at those centre declinations and each piece is sampled uniformly (step at
 * most stepDeg, default 0.1 deg, at least 4 nodes) and interpolated by the cubic through the
 * 4 nearest nodes of the same piece. The error against direct quadrature is checked in the
 * tests (below 1e-6 relative where f > 1e-4).
 */
export function capExposureFractionTable(omega: DeclinationExposure, radiusRad: number, options: CapQuadratureOptions & { stepDeg?: number } = {}): (centreDecRad: number) => number {
  const halfPi = Math.PI / 2;
  const step = ((options.stepDeg ?? 0.1) * Math.PI) / 180;
  const kinks = new Set<number>([-halfPi, halfPi, halfPi - radiusRad, radiusRad - halfPi]);
  for (const b of options.breakpointsDecRad ?? []) { kinks.add(b - radiusRad); kinks.add(b + radiusRad); }
  const edges = [...kinks].filter((k) => k >= -halfPi && k <= halfPi).sort((a, b) => a - b)
    .filter((k, i, arr) => i === 0 || k - arr[i - 1] > 1e-12);
  const segStart: number[] = [], segStep: number[] = [], segFirst: number[] = [], segCount: number[] = [];
  const nodes: number[] = [];
  for (let k = 0; k + 1 < edges.length; k++) {
    const a = edges[k], b = edges[k + 1];
    const m = Math.max(4, Math.ceil((b - a) / step) + 1);
    segStart.push(a); segStep.push((b - a) / (m - 1)); segFirst.push(nodes.length); segCount.push(m);
    for (let j = 0; j < m; j++) nodes.push(j === m - 1 ? b : a + (j * (b - a)) / (m - 1));
  }
  const f = capExposureFractions(omega, nodes, radiusRad, options);
  const nSeg = segStart.length;
  const starts = Float64Array.from(segStart), steps = Float64Array.from(segStep);
  const firsts = Int32Array.from(segFirst), counts = Int32Array.from(segCount);
  return (d: number): number => {
    let lo = 0, hi = nSeg - 1; // last segment whose start is < d (binary search)
    while (lo < hi) { const mid = (lo + hi + 1) >> 1; if (d > starts[mid]) lo = mid; else hi = mid - 1; }
    const s = lo;
    const h = steps[s], m = counts[s], o = firsts[s];
    const u = (d - starts[s]) / h;
    let j = Math.floor(u) - 1; // nodes j .. j+3 around u
    if (j < 0) j = 0; else if (j > m - 4) j = m - 4;
    const t = u - j; // position in node units relative to node j, nominally in [1, 2]
    const f0 = f[o + j], f1 = f[o + j + 1], f2 = f[o + j + 2], f3 = f[o + j + 3];
    // Cubic Lagrange through (0, f0), (1, f1), (2, f2), (3, f3) at t.
    return (-f0 * (t - 1) * (t - 2) * (t - 3)) / 6 + (f1 * t * (t - 2) * (t - 3)) / 2 - (f2 * t * (t - 1) * (t - 3)) / 2 + (f3 * t * (t - 1) * (t - 2)) / 6;
  };
}

/**
 * Declinations (radians, within [-pi/2, pi/2]) where the Sommers 2001 exposure of a site at
 * latitude latRad with zenith cut zenithMaxRad is not smooth: the band edges xi = +1,
 * dec = lat +- theta_max (onset of visibility), and the circumpolar edges xi = -1,
 * lat + dec = +-(pi - theta_max) (beyond which the whole circle of declination is seen).
 * Pass them as breakpointsDecRad to the cap quadrature.
 */
export function sommersBreakpointsDecRad(latRad: number, zenithMaxRad: number): number[] {
  const c = [latRad - zenithMaxRad, latRad + zenithMaxRad, Math.PI - zenithMaxRad - latRad, -(Math.PI - zenithMaxRad) - latRad];
  return c.filter((d) => d > -Math.PI / 2 && d < Math.PI / 2);
}
