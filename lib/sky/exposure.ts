/**
 * Directional exposure of a ground array fully efficient up to a zenith angle theta_max, with
 * uniform coverage in sidereal time (Sommers 2001, Astropart. Phys. 14, 271, eq. 2-3):
 *
 *   omega(dec) ~ cos(lat) cos(dec) sin(a_m) + a_m sin(lat) sin(dec),
 *   xi = (cos(theta_max) - sin(lat) sin(dec)) / (cos(lat) cos(dec)),
 *   a_m = 0 if xi > 1, pi if xi < -1, arccos(xi) otherwise.
 *
 * The formula holds in the equator of date. Two models are offered (METHODS section 4):
 * "sommers" applies it to ICRS declinations; "sommers-precessed" averages the exposure of
 * date over representative epochs of the data (exposureEpochs), carried into ICRS.
 * Angles are radians unless the name says Deg; declination in [-pi/2, pi/2].
 */
import { DEG_PER_RAD, HALF_PI, RAD_PER_DEG } from "./constants";
import { icrsToGalacticMatrix } from "./coordinates";
import { pixelCentres, type HealpixMap, type HealpixOrder } from "./healpix";
import { declinationOfDateWithMatrixRad, precessionNutationMatrix } from "./precession";
import { jdTtFromUnixMs } from "./time";

/** A declination-only exposure: relative exposure (>= 0) as a function of declination in radians. */
export type DeclinationExposure = (decRad: number) => number;

/** Exposure models by name, as the CLI and the scan accept them. */
export type ExposureModel = "sommers" | "sommers-precessed";

/**
 * Unnormalised Sommers exposure cos(lat) cos(dec) sin(a_m) + a_m sin(lat) sin(dec), >= 0
 * (Sommers 2001, eq. 3). Multiply by (area x live time) / pi for km^2 yr (see
 * sommersExposureKm2Yr). decRad, latRad in [-pi/2, pi/2], zenithMaxRad in (0, pi/2].
 */
export function sommersExposureUnnormalised(decRad: number, latRad: number, zenithMaxRad: number): number {
  const sl = Math.sin(latRad), cl = Math.cos(latRad);
  const sd = Math.sin(decRad), cd = Math.cos(decRad);
  const num = Math.cos(zenithMaxRad) - sl * sd;
  const den = cl * cd;
  let am: number;
  if (den === 0) am = num > 0 ? 0 : num < 0 ? Math.PI : 0;
  else {
    const xi = num / den;
    am = xi > 1 ? 0 : xi < -1 ? Math.PI : Math.acos(xi);
  }
  const w = den * Math.sin(am) + am * sl * sd;
  return w > 0 ? w : 0;
}

/**
 * Maximum over declination of the unnormalised Sommers exposure (grid of 0.05 deg, then
 * golden-section refinement to ~1e-12 rad). Used to normalise to a maximum of 1.
 */
export function sommersExposureMaximum(latRad: number, zenithMaxRad: number): number {
  const nGrid = 3601;
  let best = -1, bestI = 0;
  for (let i = 0; i < nGrid; i++) {
    const d = -HALF_PI + (Math.PI * i) / (nGrid - 1);
    const w = sommersExposureUnnormalised(d, latRad, zenithMaxRad);
    if (w > best) { best = w; bestI = i; }
  }
  const step = Math.PI / (nGrid - 1);
  let a = Math.max(-HALF_PI, -HALF_PI + (bestI - 1) * step), b = Math.min(HALF_PI, -HALF_PI + (bestI + 1) * step);
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a), d = a + g * (b - a);
  let fc = sommersExposureUnnormalised(c, latRad, zenithMaxRad), fd = sommersExposureUnnormalised(d, latRad, zenithMaxRad);
  for (let it = 0; it < 80 && b - a > 1e-13; it++) {
    if (fc > fd) { b = d; d = c; fd = fc; c = b - g * (b - a); fc = sommersExposureUnnormalised(c, latRad, zenithMaxRad); }
    else { a = c; c = d; fc = fd; d = a + g * (b - a); fd = sommersExposureUnnormalised(d, latRad, zenithMaxRad); }
  }
  return Math.max(best, fc, fd);
}

/**
 * Returns the Sommers relative exposure omega(decRad) (maximum 1, zero outside the covered
 * band) for a site latitude and zenith cut in radians (Sommers 2001, eq. 3). The maximum is
 * computed once here; call this factory once and the returned function in loops.
 */
export function createSommersExposure(latRad: number, zenithMaxRad: number): DeclinationExposure {
  validateSite(latRad, zenithMaxRad);
  const inv = 1 / sommersExposureMaximum(latRad, zenithMaxRad);
  return (decRad: number) => sommersExposureUnnormalised(decRad, latRad, zenithMaxRad) * inv;
}

/**
 * Sommers relative exposure (maximum 1) at one declination; computes the normaliser on every
 * call (about 4000 evaluations): use createSommersExposure in loops.
 */
export function sommersRelativeExposure(decRad: number, latRad: number, zenithMaxRad: number): number {
  return createSommersExposure(latRad, zenithMaxRad)(decRad);
}

/**
 * Absolute directional exposure in km^2 yr at a declination: (A T / pi) times the unnormalised
 * Sommers form, for an array of area areaKm2 (horizontal) and live time liveTimeYr with
 * uniform sidereal coverage. Its integral over the sphere is A T pi sin^2(theta_max) km^2 sr yr
 * (totalExposureKm2SrYr).
 */
export function sommersExposureKm2Yr(decRad: number, latRad: number, zenithMaxRad: number, areaKm2: number, liveTimeYr: number): number {
  return (areaKm2 * liveTimeYr / Math.PI) * sommersExposureUnnormalised(decRad, latRad, zenithMaxRad);
}

/** Integrated exposure in km^2 sr yr of a flat array: A T pi sin^2(theta_max) (the cos-weighted solid angle). */
export function totalExposureKm2SrYr(zenithMaxRad: number, areaKm2: number, liveTimeYr: number): number {
  const s = Math.sin(zenithMaxRad);
  return areaKm2 * liveTimeYr * Math.PI * s * s;
}

function validateSite(latRad: number, zenithMaxRad: number): void {
  if (!(latRad >= -HALF_PI && latRad <= HALF_PI)) throw new RangeError(`latitude out of [-90, 90] deg: ${latRad * DEG_PER_RAD}`);
  if (!(zenithMaxRad > 0 && zenithMaxRad <= HALF_PI)) throw new RangeError(`zenith cut out of (0, 90] deg: ${zenithMaxRad * DEG_PER_RAD}`);
}

/** Relative exposure curve sampled in declination. */
export interface ExposureCurve {
  /** Declinations in degrees, ascending from -90 to 90 inclusive. */
  decDeg: Float64Array;
  /** Relative exposure, maximum 1 over the sphere. */
  exposure: Float64Array;
}

/**
 * Sommers relative exposure sampled from dec = -90 to +90 deg inclusive every decStepDeg
 * (a last point at +90 is added when the step does not divide 180). Degrees in and out.
 */
export function exposureCurve(latDeg: number, zenithMaxDeg: number, decStepDeg = 1): ExposureCurve {
  if (!(decStepDeg > 0 && decStepDeg <= 180)) throw new RangeError(`declination step out of (0, 180] deg: ${decStepDeg}`);
  const omega = createSommersExposure(latDeg * RAD_PER_DEG, zenithMaxDeg * RAD_PER_DEG);
  const nSteps = Math.floor(180 / decStepDeg + 1e-9);
  const exact = Math.abs(nSteps * decStepDeg - 180) < 1e-9;
  const n = nSteps + 1 + (exact ? 0 : 1);
  const decDeg = new Float64Array(n), exposure = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const d = k === n - 1 ? 90 : Math.round((-90 + k * decStepDeg) * 1e9) / 1e9;
    decDeg[k] = d;
    exposure[k] = omega(d * RAD_PER_DEG);
  }
  return { decDeg, exposure };
}

/**
 * Declination band with non-zero exposure, degrees: a declination is seen iff
 * |dec - lat| < zenith_max, so [lat - zenith_max, lat + zenith_max] clipped to [-90, 90]
 * (open at unclipped ends). Sommers 2001 geometry.
 */
export function coveredDeclinationBand(latDeg: number, zenithMaxDeg: number): { decMinDeg: number; decMaxDeg: number } {
  validateSite(latDeg * RAD_PER_DEG, zenithMaxDeg * RAD_PER_DEG);
  return { decMinDeg: Math.max(-90, latDeg - zenithMaxDeg), decMaxDeg: Math.min(90, latDeg + zenithMaxDeg) };
}

/** Fraction of the sphere, [0, 1], in the covered band: (sin dec_max - sin dec_min) / 2. */
export function skyFractionCovered(latDeg: number, zenithMaxDeg: number): number {
  const { decMinDeg, decMaxDeg } = coveredDeclinationBand(latDeg, zenithMaxDeg);
  return (Math.sin(decMaxDeg * RAD_PER_DEG) - Math.sin(decMinDeg * RAD_PER_DEG)) / 2;
}

/** Representative epochs of a data set for the "sommers-precessed" model. */
export interface ExposureEpochs {
  /** Epochs as Unix ms (UTC), ascending. */
  unixMs: Float64Array;
  /** The same epochs as TT Julian Dates. */
  jdTt: Float64Array;
  /** Weights, summing to 1. */
  weight: Float64Array;
  /** precessionNutationMatrix of each epoch, 9 numbers each (row-major), ICRS -> true of date. */
  matrices: Float64Array;
}

/**
 * Representative epochs of the event times: the medians of `count` equal-population slices
 * of the sorted times (quantiles (k + 1/2) / count, linear interpolation), each with weight
 * 1/count, with their precession-nutation matrices. Fewer epochs when there are fewer events.
 * unixMs: event times, Unix ms UTC (not modified). Throws on an empty or non-finite list.
 */
export function exposureEpochs(unixMs: Float64Array, count = 16): ExposureEpochs {
  const n = unixMs.length;
  if (n === 0) throw new RangeError("exposureEpochs needs at least one event time");
  if (!(Number.isInteger(count) && count >= 1)) throw new RangeError(`epoch count must be a positive integer: ${count}`);
  const m = Math.min(count, n);
  const ranks: number[] = [];
  for (let k = 0; k < m; k++) {
    const i0 = Math.max(0, Math.min(n - 1, Math.floor(((k + 0.5) / m) * n - 0.5)));
    ranks.push(i0, Math.min(n - 1, i0 + 1));
  }
  const at = orderStatistics(unixMs, ranks);
  const out: ExposureEpochs = { unixMs: new Float64Array(m), jdTt: new Float64Array(m), weight: new Float64Array(m), matrices: new Float64Array(9 * m) };
  for (let k = 0; k < m; k++) {
    const pos = ((k + 0.5) / m) * n - 0.5;
    const i0 = ranks[2 * k], i1 = ranks[2 * k + 1];
    const fr = Math.max(0, Math.min(1, pos - i0));
    const t = at.get(i0)! + (at.get(i1)! - at.get(i0)!) * fr;
    out.unixMs[k] = t;
    out.jdTt[k] = jdTtFromUnixMs(t);
    out.weight[k] = 1 / m;
    out.matrices.set(precessionNutationMatrix(out.jdTt[k]), 9 * k);
  }
  return out;
}

/**
 * The values of the given ranks (0-based positions in ascending order) of a list of finite
 * numbers, as a sorted copy would hold them, without sorting the list: one pass for the
 * range, one to histogram into 4096 equal bins, one to gather the values of the bins that
 * hold a wanted rank, which alone are sorted. Exact (the same numbers a full sort gives).
 * Throws on a non-finite value.
 */
export function orderStatistics(values: Float64Array, ranks: readonly number[]): Map<number, number> {
  const n = values.length;
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v - v !== 0) throw new RangeError("event times must be finite");
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new RangeError("event times must be finite");
  const result = new Map<number, number>();
  if (lo === hi) {
    for (const r of ranks) result.set(r, lo);
    return result;
  }
  const BINS = 4096;
  const scale = BINS / (hi - lo);
  // bin of v: ((v - lo) * scale) | 0, clamped to BINS - 1 (v = hi lands on BINS)
  const bins = new Uint16Array(n);
  const counts = new Int32Array(BINS);
  for (let i = 0; i < n; i++) {
    let b = ((values[i] - lo) * scale) | 0;
    if (b > BINS - 1) b = BINS - 1;
    bins[i] = b;
    counts[b]++;
  }
  const start = new Int32Array(BINS + 1);
  for (let b = 0; b < BINS; b++) start[b + 1] = start[b] + counts[b];
  const wanted = new Map<number, number[]>();
  for (const r of ranks) {
    if (!(Number.isInteger(r) && r >= 0 && r < n)) throw new RangeError(`rank ${r} outside 0..${n - 1}`);
    let a = 0, b = BINS;
    while (b - a > 1) { const mid = (a + b) >> 1; if (start[mid] <= r) a = mid; else b = mid; }
    (wanted.get(a) ?? wanted.set(a, []).get(a)!).push(r);
  }
  // The wanted bins' values side by side in one array, bin by bin.
  const slotStart = new Int32Array(BINS).fill(-1);
  let total = 0;
  for (const b of wanted.keys()) { slotStart[b] = total; total += counts[b]; }
  const gathered = new Float64Array(total);
  const fill = new Int32Array(BINS);
  for (let i = 0; i < n; i++) {
    const b = bins[i];
    const s0 = slotStart[b];
    if (s0 >= 0) gathered[s0 + fill[b]++] = values[i];
  }
  for (const [b, rs] of wanted) {
    const g = gathered.subarray(slotStart[b], slotStart[b] + counts[b]).sort();
    for (const r of rs) result.set(r, g[r - start[b]]);
  }
  return result;
}

/**
 * Returns the "sommers-precessed" relative exposure of an ICRS unit vector (x, y, z): the
 * weighted mean over the epochs of the Sommers exposure at the declination of date,
 * normalised by the maximum of the Sommers form (so values are <= 1). Call once, use in loops.
 */
export function createPrecessedExposure(epochs: ExposureEpochs, latRad: number, zenithMaxRad: number): (x: number, y: number, z: number) => number {
  const omega = createSommersExposure(latRad, zenithMaxRad);
  const { matrices, weight } = epochs;
  const m = weight.length;
  return (x: number, y: number, z: number) => {
    let s = 0;
    for (let k = 0; k < m; k++) {
      const o = 9 * k;
      const xd = matrices[o] * x + matrices[o + 1] * y + matrices[o + 2] * z;
      const yd = matrices[o + 3] * x + matrices[o + 4] * y + matrices[o + 5] * z;
      const zd = matrices[o + 6] * x + matrices[o + 7] * y + matrices[o + 8] * z;
      s += weight[k] * omega(Math.atan2(zd, Math.sqrt(xd * xd + yd * yd)));
    }
    return s;
  };
}

/**
 * "sommers-precessed" relative exposure of one ICRS unit vector; builds the normaliser on each
 * call, prefer createPrecessedExposure in loops.
 */
export function precessedExposureAt(x: number, y: number, z: number, epochs: ExposureEpochs, latRad: number, zenithMaxRad: number): number {
  return createPrecessedExposure(epochs, latRad, zenithMaxRad)(x, y, z);
}

/**
 * Declinations of date (radians) of an ICRS unit vector at each epoch, written to out
 * (length = number of epochs). Helper for models that shift a window centre by precession.
 */
export function declinationsOfDateRad(x: number, y: number, z: number, epochs: ExposureEpochs, out = new Float64Array(epochs.weight.length)): Float64Array {
  for (let k = 0; k < epochs.weight.length; k++) out[k] = declinationOfDateWithMatrixRad(x, y, z, epochs.matrices.subarray(9 * k, 9 * k + 9));
  return out;
}

/** Options of exposureMap. */
export interface ExposureMapOptions {
  nside: number;
  order: HealpixOrder;
  /** Frame of the map's pixels: "equatorial" (ICRS) or "galactic". */
  frame: "equatorial" | "galactic";
  latDeg: number;
  zenithMaxDeg: number;
  /** Default "sommers". "sommers-precessed" needs `epochs`. */
  model?: ExposureModel;
  epochs?: ExposureEpochs;
}

/**
 * HEALPix map of the relative exposure (Sommers maximum = 1) evaluated at each pixel centre, in
 * the equatorial (ICRS) or galactic frame, any Nside and order. Float64Array data. Its sum times
 * the pixel area approximates the integral of the exposure over the sphere (sr).
 */
export function exposureMap(options: ExposureMapOptions): HealpixMap {
  const { nside, order, frame, latDeg, zenithMaxDeg } = options;
  const model = options.model ?? "sommers";
  if (frame !== "equatorial" && frame !== "galactic") throw new RangeError(`unknown frame: ${String(frame)}`);
  if (model !== "sommers" && model !== "sommers-precessed") throw new RangeError(`unknown exposure model: ${String(model)}`);
  if (model === "sommers-precessed" && !options.epochs) throw new RangeError("the sommers-precessed model needs epochs (exposureEpochs)");
  const latRad = latDeg * RAD_PER_DEG, zmRad = zenithMaxDeg * RAD_PER_DEG;
  const c = pixelCentres(nside, order);
  const n = c.x.length;
  const data = new Float64Array(n);
  // galactic pixel centre -> ICRS vector: v_icrs = G^T v_gal
  const g = frame === "galactic" ? icrsToGalacticMatrix() : null;
  const omega = createSommersExposure(latRad, zmRad);
  const precessed = model === "sommers-precessed" ? createPrecessedExposure(options.epochs as ExposureEpochs, latRad, zmRad) : null;
  for (let p = 0; p < n; p++) {
    let x = c.x[p], y = c.y[p], z = c.z[p];
    if (g) {
      const gx = x, gy = y, gz = z;
      x = g[0] * gx + g[3] * gy + g[6] * gz;
      y = g[1] * gx + g[4] * gy + g[7] * gz;
      z = g[2] * gx + g[5] * gy + g[8] * gz;
    }
    data[p] = precessed ? precessed(x, y, z) : omega(Math.atan2(z, Math.sqrt(x * x + y * y)));
  }
  return { nside, order, data };
}
