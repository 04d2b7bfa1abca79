/**
 * Right ascension / declination (or any longitude / latitude pair) <-> unit vectors, and
 * angular distances. Frame-agnostic: the same formulas serve ICRS (ra, dec), galactic (l, b)
 * and supergalactic coordinates; x points to longitude 0 on the equator, z to latitude +90 deg.
 * Bulk variants work on typed arrays (separate x, y, z arrays) without per-element allocation.
 */
import { DEG_PER_RAD, RAD_PER_DEG, TWO_PI, asinClamped } from "./constants";

/** Separate component arrays of unit vectors, element i is (x[i], y[i], z[i]). */
export interface UnitVectors {
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
}

/** Longitude / latitude arrays in degrees: longitude in [0, 360), latitude in [-90, 90]. */
export interface LonLatDeg {
  lonDeg: Float64Array;
  latDeg: Float64Array;
}

/**
 * Unit vector of a direction given in radians (longitude any real, latitude in [-pi/2, pi/2]).
 * Writes (x, y, z) into out[offset..offset+2] and returns out.
 */
export function lonLatRadToVector(lonRad: number, latRad: number, out: Float64Array | number[] = new Float64Array(3), offset = 0): Float64Array | number[] {
  const c = Math.cos(latRad);
  out[offset] = c * Math.cos(lonRad);
  out[offset + 1] = c * Math.sin(lonRad);
  out[offset + 2] = Math.sin(latRad);
  return out;
}

/** Unit vector of a direction given in degrees (ra or l, dec or b). See lonLatRadToVector. */
export function lonLatDegToVector(lonDeg: number, latDeg: number, out: Float64Array | number[] = new Float64Array(3), offset = 0): Float64Array | number[] {
  return lonLatRadToVector(lonDeg * RAD_PER_DEG, latDeg * RAD_PER_DEG, out, offset);
}

/** Longitude in radians, [0, 2 pi), of a (not necessarily unit) vector; 0 on the z axis. */
export function vectorLonRad(x: number, y: number): number {
  if (x === 0 && y === 0) return 0;
  const a = Math.atan2(y, x);
  return a < 0 ? (a + TWO_PI < TWO_PI ? a + TWO_PI : 0) : a + 0; // + 0 turns -0 into 0
}

/** Latitude in radians, [-pi/2, pi/2], of a vector (normalised internally, robust near the poles). */
export function vectorLatRad(x: number, y: number, z: number): number {
  return Math.atan2(z, Math.sqrt(x * x + y * y));
}

/** Vectorised lon/lat (degrees) -> unit vectors. `out` arrays may be supplied to avoid allocation. */
export function lonLatDegToVectors(lonDeg: ArrayLike<number>, latDeg: ArrayLike<number>, out?: UnitVectors): UnitVectors {
  const n = lonDeg.length;
  if (latDeg.length !== n) throw new RangeError("lonDeg and latDeg lengths differ");
  const res = out ?? { x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) };
  const { x, y, z } = res;
  for (let i = 0; i < n; i++) {
    const lon = lonDeg[i] * RAD_PER_DEG, lat = latDeg[i] * RAD_PER_DEG;
    const c = Math.cos(lat);
    x[i] = c * Math.cos(lon);
    y[i] = c * Math.sin(lon);
    z[i] = Math.sin(lat);
  }
  return res;
}

/** Vectorised unit vectors -> lon in [0, 360) deg and lat in [-90, 90] deg. */
export function vectorsToLonLatDeg(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, out?: LonLatDeg): LonLatDeg {
  const n = x.length;
  const res = out ?? { lonDeg: new Float64Array(n), latDeg: new Float64Array(n) };
  const { lonDeg, latDeg } = res;
  for (let i = 0; i < n; i++) {
    const xi = x[i], yi = y[i], zi = z[i];
    let lon = xi === 0 && yi === 0 ? 0 : Math.atan2(yi, xi) * DEG_PER_RAD;
    if (lon < 0) { lon += 360; if (lon >= 360) lon = 0; }
    lonDeg[i] = lon + 0;
    latDeg[i] = Math.atan2(zi, Math.sqrt(xi * xi + yi * yi)) * DEG_PER_RAD + 0;
  }
  return res;
}

/**
 * Angle in radians, [0, pi], between two vectors (any length): atan2(|a x b|, a . b), accurate
 * for both tiny and near-antipodal separations (unlike acos of the dot product).
 */
export function angleBetweenVectorsRad(ax: number, ay: number, az: number, bx: number, by: number, bz: number): number {
  const cx = ay * bz - az * by, cy = az * bx - ax * bz, cz = ax * by - ay * bx;
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz);
}

/** Angular distance in degrees, [0, 180], between two directions given as lon/lat in degrees (Vincenty form). */
export function angularDistanceDeg(lon1Deg: number, lat1Deg: number, lon2Deg: number, lat2Deg: number): number {
  const l1 = lon1Deg * RAD_PER_DEG, b1 = lat1Deg * RAD_PER_DEG, l2 = lon2Deg * RAD_PER_DEG, b2 = lat2Deg * RAD_PER_DEG;
  const c1 = Math.cos(b1), c2 = Math.cos(b2);
  return angleBetweenVectorsRad(c1 * Math.cos(l1), c1 * Math.sin(l1), Math.sin(b1), c2 * Math.cos(l2), c2 * Math.sin(l2), Math.sin(b2)) * DEG_PER_RAD;
}

/**
 * Applies a 3x3 row-major rotation matrix m to arrays of vectors: out = m . v (in place allowed).
 * Returns out.
 */
export function rotateVectors(m: ArrayLike<number>, v: UnitVectors, out?: UnitVectors): UnitVectors {
  const n = v.x.length;
  const res = out ?? { x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) };
  const m0 = m[0], m1 = m[1], m2 = m[2], m3 = m[3], m4 = m[4], m5 = m[5], m6 = m[6], m7 = m[7], m8 = m[8];
  const { x, y, z } = v;
  const ox = res.x, oy = res.y, oz = res.z;
  for (let i = 0; i < n; i++) {
    const a = x[i], b = y[i], c = z[i];
    ox[i] = m0 * a + m1 * b + m2 * c;
    oy[i] = m3 * a + m4 * b + m5 * c;
    oz[i] = m6 * a + m7 * b + m8 * c;
  }
  return res;
}

/** Transpose of a 3x3 row-major matrix (the inverse of a rotation). */
export function transpose3(m: ArrayLike<number>): Float64Array {
  return Float64Array.of(m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]);
}

/** Product a . b of two 3x3 row-major matrices. */
export function multiply3(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const r = new Float64Array(9);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) {
    r[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
  }
  return r;
}

/** Latitude in degrees of a unit vector's z component, robust at |z| = 1 + rounding. */
export function latDegFromUnitZ(z: number): number {
  return asinClamped(z) * DEG_PER_RAD;
}
