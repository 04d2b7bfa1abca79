/**
 * Directional exposure of a ground array whose detection efficiency depends on the zenith
 * angle, with uniform coverage in sidereal time. Generalises Sommers (2001, Astropart. Phys.
 * 14, 271, eq. 2-3): the exposure at declination dec is the time average of
 * eps(theta) cos(theta) over the hour angles h where theta < theta_max,
 *
 *   omega_eps(dec) = integral_0^{a_m} eps(theta(h)) cos(theta(h)) dh,
 *   cos theta(h) = sin(lat) sin(dec) + cos(lat) cos(dec) cos(h),
 *
 * with a_m the hour angle at which theta reaches theta_max (exposure.ts). With eps = 1 the
 * integral is Sommers' closed form cos(lat) cos(dec) sin(a_m) + a_m sin(lat) sin(dec).
 * Absolute exposure in km^2 yr per sr: (A T / pi) omega_eps (A horizontal area, T live time).
 * Angles in radians unless the name says Deg. Pure module.
 */
import { DEG_PER_RAD, HALF_PI, RAD_PER_DEG } from "./constants";
import { icrsToGalacticMatrix } from "./coordinates";
import type { DeclinationExposure } from "./exposure";
import { sommersExposureUnnormalised } from "./exposure";
import { pixelAreaSr, pixelCentres, type HealpixMap, type HealpixOrder } from "./healpix";

/**
 * Detection efficiency in [0, 1] as a function of the zenith angle in radians, [0, pi/2].
 * Optional `breakpointsRad`: zenith angles where it has kinks or jumps (a table's rows), at
 * which the hour-angle integral is split so that each piece is smooth.
 */
export type ZenithEfficiency = ((zenithRad: number) => number) & { breakpointsRad?: readonly number[] };

/**
 * A zenith-efficiency table, linearly interpolated in zenith angle (degrees, strictly
 * ascending) and held constant beyond its first and last rows. Efficiencies in [0, 1].
 * Throws on an empty table, a non-ascending zenith column or an efficiency outside [0, 1].
 */
export function tabulatedZenithEfficiency(zenithDeg: ArrayLike<number>, efficiency: ArrayLike<number>): ZenithEfficiency {
  const n = zenithDeg.length;
  if (n === 0 || efficiency.length !== n) throw new RangeError("the efficiency table needs as many efficiencies as zenith angles, at least one");
  const z = Float64Array.from(zenithDeg, (d) => d * RAD_PER_DEG);
  const e = Float64Array.from(efficiency);
  for (let i = 0; i < n; i++) {
    if (!(zenithDeg[i] >= 0 && zenithDeg[i] <= 90)) throw new RangeError(`zenith angle out of [0, 90] deg in row ${i + 1}: ${zenithDeg[i]}`);
    if (!(e[i] >= 0 && e[i] <= 1)) throw new RangeError(`efficiency out of [0, 1] in row ${i + 1}: ${e[i]}`);
    if (i > 0 && !(z[i] > z[i - 1])) throw new RangeError(`zenith angles must ascend strictly (row ${i + 1})`);
  }
  const f: ZenithEfficiency = (theta: number) => {
    if (theta <= z[0]) return e[0];
    if (theta >= z[n - 1]) return e[n - 1];
    let lo = 0, hi = n - 1;
    while (hi - lo > 1) { const mid = (lo + hi) >> 1; if (z[mid] <= theta) lo = mid; else hi = mid; }
    const t = (theta - z[lo]) / (z[hi] - z[lo]);
    return e[lo] + (e[hi] - e[lo]) * t;
  };
  f.breakpointsRad = Array.from(z);
  return f;
}

// 16-point Gauss-Legendre nodes and weights on [-1, 1] (Abramowitz & Stegun 1964, table 25.4).
const GL_X = [0.0950125098376374, 0.2816035507792589, 0.4580167776572274, 0.6178762444026438, 0.7554044083550030, 0.8656312023878318, 0.9445750230732326, 0.9894009349916499];
const GL_W = [0.1894506104550685, 0.1826034150449236, 0.1691565193950025, 0.1495959888165767, 0.1246289712555339, 0.0951585116824928, 0.0622535239386479, 0.0271524594117541];

/**
 * Unnormalised efficiency-weighted exposure integral_0^{a_m} eps(theta(h)) cos(theta(h)) dh
 * at one declination (radians), >= 0. The hour-angle range is split where theta(h) crosses the
 * efficiency's breakpoints (theta grows with h), and each piece is integrated by composite
 * 16-point Gauss-Legendre on `panels` equal sub-panels (default 2). With eps = undefined (full
 * efficiency) it returns Sommers' closed form exactly.
 */
export function efficiencyExposureUnnormalised(decRad: number, latRad: number, zenithMaxRad: number, efficiency?: ZenithEfficiency, panels = 2): number {
  if (!efficiency) return sommersExposureUnnormalised(decRad, latRad, zenithMaxRad);
  const sl = Math.sin(latRad), cl = Math.cos(latRad), sd = Math.sin(decRad), cd = Math.cos(decRad);
  const a = sl * sd, b = cl * cd;
  // hour angle at which the zenith angle reaches theta (0 if never that small, pi if always)
  const hourAngleAt = (theta: number) => {
    const c = Math.cos(theta);
    if (b <= 1e-15) return a > c ? Math.PI : 0;
    const xi = (c - a) / b;
    return xi > 1 ? 0 : xi < -1 ? Math.PI : Math.acos(xi);
  };
  const am = hourAngleAt(zenithMaxRad);
  if (am <= 0) return 0;
  const cuts = [0, am];
  for (const z of efficiency.breakpointsRad ?? []) {
    if (z > 0 && z < zenithMaxRad) { const h = hourAngleAt(z); if (h > 0 && h < am) cuts.push(h); }
  }
  cuts.sort((x, y) => x - y);
  let sum = 0;
  for (let s = 0; s + 1 < cuts.length; s++) {
    const h0 = cuts[s], h1 = cuts[s + 1];
    if (!(h1 > h0)) continue;
    const width = (h1 - h0) / panels;
    for (let p = 0; p < panels; p++) {
      const mid = h0 + (p + 0.5) * width, half = width / 2;
      for (let k = 0; k < 8; k++) {
        for (const sign of [-1, 1]) {
          const h = mid + sign * half * GL_X[k];
          const c = Math.min(1, Math.max(-1, a + b * Math.cos(h)));
          if (c <= 0) continue;
          sum += GL_W[k] * half * efficiency(Math.acos(c)) * c;
        }
      }
    }
  }
  return sum;
}

/** A declination exposure tabulated finely enough to be evaluated fast in loops. */
export interface TabulatedExposure {
  /** Relative exposure (maximum 1 over the sphere) at a declination in radians; linear interpolation in the table. */
  relative: DeclinationExposure;
  /** The unnormalised maximum (same unit as efficiencyExposureUnnormalised). */
  maximum: number;
  /** Declination step of the table, degrees. */
  stepDeg: number;
  /** Relative exposure at -90, -90 + step, ..., +90 deg. */
  table: Float64Array;
}

/**
 * Tabulates the efficiency-weighted exposure on a declination grid of stepDeg (default 0.05 deg)
 * and returns it relative (maximum 1, the maximum taken over the grid). Throws on a latitude
 * outside [-90, 90] deg, a cut outside (0, 90] deg, or an exposure that vanishes everywhere.
 */
export function createEfficiencyExposure(latRad: number, zenithMaxRad: number, efficiency?: ZenithEfficiency, stepDeg = 0.05): TabulatedExposure {
  if (!(latRad >= -HALF_PI && latRad <= HALF_PI)) throw new RangeError(`latitude out of [-90, 90] deg: ${latRad * DEG_PER_RAD}`);
  if (!(zenithMaxRad > 0 && zenithMaxRad <= HALF_PI)) throw new RangeError(`zenith cut out of (0, 90] deg: ${zenithMaxRad * DEG_PER_RAD}`);
  const n = Math.round(180 / stepDeg);
  const step = 180 / n;
  const table = new Float64Array(n + 1);
  let max = 0;
  for (let k = 0; k <= n; k++) {
    const w = efficiencyExposureUnnormalised((-90 + k * step) * RAD_PER_DEG, latRad, zenithMaxRad, efficiency);
    table[k] = w;
    if (w > max) max = w;
  }
  if (!(max > 0)) throw new RangeError("the exposure is zero everywhere (efficiency zero inside the zenith cut?)");
  for (let k = 0; k <= n; k++) table[k] /= max;
  const stepRad = step * RAD_PER_DEG;
  const relative = (decRad: number) => {
    const u = (decRad + HALF_PI) / stepRad;
    if (!(u > 0)) return table[0];
    if (u >= n) return table[n];
    const i = Math.floor(u), t = u - i;
    return table[i] + (table[i + 1] - table[i]) * t;
  };
  return { relative, maximum: max, stepDeg: step, table };
}

/**
 * Integral of a relative exposure over the sphere, sr: 2 pi integral omega(dec) cos(dec) d dec,
 * composite Simpson on `intervals` (even) declination steps. For the map-sum check and for
 * converting relative to absolute exposure.
 */
export function exposureSphereIntegralSr(omega: DeclinationExposure, intervals = 7200): number {
  const m = intervals % 2 === 0 ? intervals : intervals + 1;
  const h = Math.PI / m;
  let s = 0;
  for (let k = 0; k <= m; k++) {
    const d = -HALF_PI + k * h;
    const f = omega(d) * Math.cos(d);
    s += (k === 0 || k === m ? 1 : k % 2 === 1 ? 4 : 2) * f;
  }
  return 2 * Math.PI * (s * h) / 3;
}

/**
 * Fraction of the sphere, [0, 1], where the relative exposure is at least `threshold`
 * (threshold > 0; for threshold -> 0+ this is the covered sky fraction). Midpoint rule in
 * sin(dec) on `intervals` equal-area strips (default 20000, error ~1e-4).
 */
export function skyFractionAboveExposure(omega: DeclinationExposure, threshold: number, intervals = 20000): number {
  if (!(threshold > 0)) throw new RangeError(`the exposure threshold must be above 0: ${threshold}`);
  let count = 0;
  for (let k = 0; k < intervals; k++) {
    const z = -1 + (2 * (k + 0.5)) / intervals;
    if (omega(Math.asin(z)) >= threshold) count++;
  }
  return count / intervals;
}

/**
 * Geometry of one direction seen from a site: the smallest zenith angle it reaches in a
 * sidereal day, |dec - lat| (degrees), and the fraction of the sidereal day it spends inside
 * the zenith cut, a_m / pi (Sommers 2001's a_m). Degrees in.
 */
export function directionVisibility(decDeg: number, latDeg: number, zenithMaxDeg: number): { minZenithDeg: number; fractionOfDay: number } {
  const dec = decDeg * RAD_PER_DEG, lat = latDeg * RAD_PER_DEG;
  const num = Math.cos(zenithMaxDeg * RAD_PER_DEG) - Math.sin(lat) * Math.sin(dec);
  const den = Math.cos(lat) * Math.cos(dec);
  let am: number;
  if (Math.abs(den) < 1e-15) am = num < 0 ? Math.PI : 0;
  else {
    const xi = num / den;
    am = xi > 1 ? 0 : xi < -1 ? Math.PI : Math.acos(xi);
  }
  return { minZenithDeg: Math.abs(decDeg - latDeg), fractionOfDay: am / Math.PI };
}

/** Options of declinationExposureMap. */
export interface DeclinationExposureMapOptions {
  nside: number;
  order: HealpixOrder;
  /** Frame of the map's pixels: "equatorial" (ICRS) or "galactic". */
  frame: "equatorial" | "galactic";
}

/**
 * HEALPix map (Float64Array) of any declination-only exposure evaluated at the pixel centres,
 * in the equatorial (ICRS) or galactic frame. Its sum times pixelAreaSr(nside) approximates
 * exposureSphereIntegralSr(omega).
 */
export function declinationExposureMap(omega: DeclinationExposure, options: DeclinationExposureMapOptions): HealpixMap {
  const { nside, order, frame } = options;
  if (frame !== "equatorial" && frame !== "galactic") throw new RangeError(`unknown frame: ${String(frame)}`);
  const c = pixelCentres(nside, order);
  const n = c.x.length;
  const data = new Float64Array(n);
  const g = frame === "galactic" ? icrsToGalacticMatrix() : null;
  for (let p = 0; p < n; p++) {
    let z = c.z[p];
    // galactic pixel centre -> ICRS z component: (G^T v_gal)_z = G[2] x + G[5] y + G[8] z
    if (g) z = g[2] * c.x[p] + g[5] * c.y[p] + g[8] * c.z[p];
    data[p] = omega(Math.asin(Math.max(-1, Math.min(1, z))));
  }
  return { nside, order, data };
}

/** Sum of a map times its pixel area, sr. */
export function mapIntegralSr(map: HealpixMap): number {
  let s = 0;
  for (let p = 0; p < map.data.length; p++) s += map.data[p];
  return s * pixelAreaSr(map.nside);
}

/**
 * The "sommers-precessed" construction for any declination-only exposure omega (exposure of
 * date carried into ICRS): the weighted mean over epochs of omega at the declination of date of
 * an ICRS unit vector. `matrices` are the epochs' ICRS -> true-of-date matrices (9 numbers
 * each, row-major, as ExposureEpochs.matrices), `weight` their weights (summing to 1).
 */
export function createPrecessedDeclinationExposure(omega: DeclinationExposure, epochs: { matrices: Float64Array; weight: Float64Array }): (x: number, y: number, z: number) => number {
  const { matrices, weight } = epochs;
  const m = weight.length;
  return (x: number, y: number, z: number) => {
    let s = 0;
    for (let k = 0; k < m; k++) {
      const o = 9 * k;
      const zd = matrices[o + 6] * x + matrices[o + 7] * y + matrices[o + 8] * z;
      s += weight[k] * omega(Math.asin(Math.max(-1, Math.min(1, zd))));
    }
    return s;
  };
}

/** HEALPix map (Float64Array, ICRS pixels) of a vector exposure such as createPrecessedDeclinationExposure's. */
export function vectorExposureMap(exposure: (x: number, y: number, z: number) => number, nside: number, order: HealpixOrder): HealpixMap {
  const c = pixelCentres(nside, order);
  const data = new Float64Array(c.x.length);
  for (let p = 0; p < data.length; p++) data[p] = exposure(c.x[p], c.y[p], c.z[p]);
  return { nside, order, data };
}
