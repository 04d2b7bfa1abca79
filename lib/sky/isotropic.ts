/**
 * Seeded isotropic skies seen through an exposure: the null hypothesis of the window scan
 * and of the large-scale analyses.
 *
 * For a declination-only exposure omega(dec) the arrival directions of an isotropic flux
 * have density proportional to omega(dec) dOmega = omega(dec) d(RA) d(sin dec): right
 * ascension uniform in [0, 2 pi) and z = sin(dec) drawn from the density omega(asin z) on
 * [-1, 1]. The z density is tabulated on a uniform grid (default 8192 intervals), its
 * cumulative integral by the trapezoid rule, and z is drawn by inverting the piecewise
 * quadratic CDF of the piecewise-linear density (exact for the tabulated density).
 * Directions come out as ICRS unit vectors in typed arrays.
 */
import type { Random } from "./random";

/** A reusable inverse-CDF sampler of z = sin(dec) for one declination-only exposure. */
export interface DeclinationSampler {
  /** Draws z = sin(dec) in [-1, 1] from the exposure-weighted isotropic density. */
  sampleZ(random: Random): number;
  /** Fraction of the sphere where omega > 0 (as tabulated), in [0, 1]. */
  coveredFraction: number;
}

/**
 * Builds the sampler for omega(decRad) >= 0 (radians; any normalisation). Throws if omega
 * vanishes everywhere. gridIntervals sets the table resolution in z (default 8192, i.e.
 * dz = 2.4e-4).
 */
export function createDeclinationSampler(omega: (decRad: number) => number, gridIntervals = 8192): DeclinationSampler {
  return createSamplerFromZDensity(tabulateZDensity(omega, gridIntervals));
}

/**
 * The exposure tabulated on a uniform grid of z = sin(dec): value k is omega(asin(-1 + 2k/m)),
 * k = 0..m (negative or non-finite values set to 0). A plain array, so it can be sent to a
 * worker thread and turned back into a sampler there.
 */
export function tabulateZDensity(omega: (decRad: number) => number, gridIntervals = 8192): Float64Array {
  const m = gridIntervals;
  const dens = new Float64Array(m + 1);
  for (let k = 0; k <= m; k++) {
    const z = Math.min(1, -1 + (2 * k) / m);
    const w = omega(Math.asin(z));
    dens[k] = w > 0 && Number.isFinite(w) ? w : 0;
  }
  return dens;
}

/** Sampler from a z-density table made by tabulateZDensity (length m + 1, m >= 1). */
export function createSamplerFromZDensity(dens: Float64Array): DeclinationSampler {
  const m = dens.length - 1;
  if (!(m >= 1)) throw new RangeError("z-density table needs at least 2 values");
  const dz = 2 / m;
  const cdf = new Float64Array(m + 1);
  let covered = 0;
  for (let k = 0; k < m; k++) {
    cdf[k + 1] = cdf[k] + 0.5 * (dens[k] + dens[k + 1]) * dz;
    if (dens[k] > 0 || dens[k + 1] > 0) covered++;
  }
  const total = cdf[m];
  if (!(total > 0)) throw new RangeError("exposure is zero everywhere");
  for (let k = 0; k <= m; k++) cdf[k] /= total;
  return {
    coveredFraction: covered / m,
    sampleZ(random: Random): number {
      const u = random.next();
      let lo = 0, hi = m; // find k with cdf[k] <= u < cdf[k + 1]
      while (hi - lo > 1) { const mid = (lo + hi) >> 1; if (cdf[mid] <= u) lo = mid; else hi = mid; }
      // Within the interval the density is linear, f(s) = a + (b - a) s, s in [0, 1]:
      // solve a s + (b - a) s^2 / 2 = target for s.
      const a = dens[lo], b = dens[lo + 1];
      const target = ((u - cdf[lo]) * total) / dz;
      let s: number;
      const slope = b - a;
      if (Math.abs(slope) < 1e-12 * (a + b)) s = a > 0 ? target / a : 0.5;
      else s = (-a + Math.sqrt(Math.max(0, a * a + 2 * slope * target))) / slope;
      if (!(s >= 0)) s = 0; else if (s > 1) s = 1;
      const z = -1 + (lo + s) * dz;
      return z > 1 ? 1 : z;
    },
  };
}

/** Directions as unit vectors (frame of the exposure: ICRS for Siderea). */
export interface SkyDirections {
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
}

/**
 * Draws n isotropic arrival directions through the exposure of the sampler, with the given
 * seeded stream (createRandom(seed) from random.ts). Writes into `out` when given (its
 * arrays must hold n values), so trial loops allocate nothing per sky.
 */
export function drawIsotropicSky(n: number, sampler: DeclinationSampler, random: Random, out?: SkyDirections): SkyDirections {
  const o = out ?? { x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    const z = sampler.sampleZ(random);
    const ra = 2 * Math.PI * random.next();
    const rho = Math.sqrt(Math.max(0, (1 - z) * (1 + z)));
    o.x[i] = rho * Math.cos(ra);
    o.y[i] = rho * Math.sin(ra);
    o.z[i] = z;
  }
  return o;
}

/**
 * Draws n directions from a reference set (e.g. time-scrambled copies of the data, which
 * carry the data-driven exposure) by picking reference directions uniformly at random
 * with replacement. A reference set much larger than n (e.g. 10 or more scramblings) keeps
 * repeated picks rare.
 */
export function drawFromReference(n: number, reference: SkyDirections, random: Random, out?: SkyDirections): SkyDirections {
  const m = reference.x.length;
  if (m === 0) throw new RangeError("empty reference set");
  const o = out ?? { x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    const k = random.nextInt(m);
    o.x[i] = reference.x[k];
    o.y[i] = reference.y[k];
    o.z[i] = reference.z[k];
  }
  return o;
}

/** One epoch of a precessed exposure: weight and the row-major rotation ICRS -> equator of date. */
export interface SkyEpoch {
  weight: number;
  icrsToDate: ArrayLike<number>;
}

/**
 * Isotropic directions seen through an exposure defined in the equator of date and
 * averaged over epochs: each event picks an epoch with probability proportional to its
 * weight, is drawn in that epoch's equatorial frame, and is rotated to ICRS with the
 * transposed matrix. Its ICRS density is sum_k w_k omega(dec of date_k), the exposure
 * of the 'sommers-precessed' model.
 */
export function drawIsotropicSkyPrecessed(n: number, sampler: DeclinationSampler, epochs: ReadonlyArray<SkyEpoch>, random: Random, out?: SkyDirections): SkyDirections {
  if (epochs.length === 0) throw new RangeError("at least one epoch is needed");
  const o = out ?? { x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) };
  const cum = new Float64Array(epochs.length);
  let acc = 0;
  epochs.forEach((e, k) => { acc += e.weight; cum[k] = acc; });
  for (let i = 0; i < n; i++) {
    const u = random.next() * acc;
    let k = 0;
    while (k < cum.length - 1 && cum[k] <= u) k++;
    const m = epochs[k].icrsToDate;
    const z = sampler.sampleZ(random);
    const ra = 2 * Math.PI * random.next();
    const rho = Math.sqrt(Math.max(0, (1 - z) * (1 + z)));
    const vx = rho * Math.cos(ra), vy = rho * Math.sin(ra);
    o.x[i] = m[0] * vx + m[3] * vy + m[6] * z;
    o.y[i] = m[1] * vx + m[4] * vy + m[7] * z;
    o.z[i] = m[2] * vx + m[5] * vy + m[8] * z;
  }
  return o;
}
