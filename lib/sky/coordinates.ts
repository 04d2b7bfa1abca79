/**
 * Frame transforms for arrival directions (METHODS section 2).
 *
 * Horizontal (zenith, azimuth at a site and instant) <-> ICRS equatorial, without refraction:
 *   v_icrs = N(t)^T . R3(-theta) . H(lat) . v_local,
 * where v_local is the east-north-up arrival direction, H(lat) the site's horizon-to-meridian
 * rotation (geodetic latitude; the site height does not change a direction at infinity), theta
 * the local apparent sidereal angle = ERA(UT1 ~ UTC) + (GMST - ERA) + equation of the
 * equinoxes + east longitude, and N(t) = precessionNutationMatrix (ICRS -> true of date).
 * The slowly varying parts (N and GMST - ERA + EE) are evaluated once per UTC day at noon in a
 * cache local to each call (error < 0.1 arcsec); the Earth rotation angle is exact per event.
 * Polar motion is ignored (< 0.5 arcsec). Agreement with astronomy-engine is tested (< 30").
 *
 * Galactic: the Hipparcos definition (ESA SP-1200, 1997, vol. 1 sec. 1.5.3): north galactic pole
 * at ICRS RA 192.85948 deg, Dec +27.12825 deg, galactic longitude of the north celestial pole
 * 122.93192 deg. Supergalactic: pole at l = 47.37 deg, b = +6.32 deg, zero point at
 * l = 137.37 deg, b = 0 (de Vaucouleurs et al. 1991, RC3).
 */
import { DEG_PER_RAD, MS_PER_DAY, RAD_PER_DEG, TWO_PI } from "./constants";
import { equationOfEquinoxesRad, precessionNutationMatrix } from "./precession";
import { earthRotationAngleRadFromUnixMs, gmstMinusEraRad, jdTtFromUnixMs } from "./time";
import { lonLatDegToVector, multiply3, transpose3, type UnitVectors } from "./vectors";

/** An array site: geodetic latitude (deg, north +), east longitude (deg), height (m, unused for directions). */
export interface Site {
  latitudeDeg: number;
  longitudeDeg: number;
  heightM: number;
}

/** Azimuth conventions (METHODS section 1): 0 = North, 90 = East; or 0 = East, 90 = North. */
export type AzimuthConvention = "north-clockwise" | "east-counterclockwise";

/** Local arrival directions at instants: zenith in [0, 90] deg, azimuth deg, time Unix ms UTC. */
export interface HorizontalInput {
  zenithDeg: ArrayLike<number>;
  azimuthDeg: ArrayLike<number>;
  unixMs: ArrayLike<number>;
}

/** ICRS directions: RA in [0, 360) deg, Dec in [-90, 90] deg, and unit vectors. */
export interface EquatorialOutput extends UnitVectors {
  raDeg: Float64Array;
  decDeg: Float64Array;
}

/** Converts an azimuth in degrees from east-counterclockwise to north-clockwise: (90 - az) mod 360, in [0, 360). */
export function azimuthEastCcwToNorthCwDeg(azEcDeg: number): number {
  let a = (90 - azEcDeg) % 360;
  if (a < 0) a += 360;
  return a >= 360 ? 0 : a;
}

function validateSite(site: Site): void {
  if (!(site.latitudeDeg >= -90 && site.latitudeDeg <= 90)) throw new RangeError(`site latitude out of [-90, 90] deg: ${site.latitudeDeg}`);
  if (!Number.isFinite(site.longitudeDeg)) throw new RangeError(`site longitude not finite: ${site.longitudeDeg}`);
}

/**
 * Per-day frame data cache, local to one conversion call: for each UTC day, the true-of-date
 * -> ICRS matrix and the sidereal offset (GMST - ERA + EE + longitude) at noon.
 */
class DayFrames {
  private readonly slots = new Map<number, number>();
  private store = new Float64Array(10 * 8);
  private count = 0;
  constructor(private readonly longitudeRad: number) {}

  /** Index (into `data`) of the 10 numbers of the day containing unixMs: 9 matrix (tod->icrs), 1 offset. */
  slot(day: number): number {
    const s = this.slots.get(day);
    if (s !== undefined) return s;
    const noon = (day + 0.5) * MS_PER_DAY;
    const jdTt = jdTtFromUnixMs(noon);
    const m = precessionNutationMatrix(jdTt);
    if ((this.count + 1) * 10 > this.store.length) {
      const bigger = new Float64Array(this.store.length * 2);
      bigger.set(this.store);
      this.store = bigger;
    }
    const o = this.count * 10;
    // transpose: true of date -> ICRS
    this.store[o] = m[0]; this.store[o + 1] = m[3]; this.store[o + 2] = m[6];
    this.store[o + 3] = m[1]; this.store[o + 4] = m[4]; this.store[o + 5] = m[7];
    this.store[o + 6] = m[2]; this.store[o + 7] = m[5]; this.store[o + 8] = m[8];
    this.store[o + 9] = gmstMinusEraRad(jdTt) + equationOfEquinoxesRad(jdTt) + this.longitudeRad;
    this.slots.set(day, o);
    this.count++;
    return o;
  }
  get data(): Float64Array { return this.store; }
}

/**
 * Horizontal arrival directions -> ICRS (J2000) right ascension, declination and unit vectors,
 * vectorised. Altitude = 90 deg - zenith; azimuth north-clockwise by default, or
 * east-counterclockwise per options. No refraction; UT1 taken as UTC. Frames: see the module
 * comment. Inverse: equatorialToHorizontal. Non-finite inputs give NaN outputs.
 */
export function horizontalToEquatorial(input: HorizontalInput, site: Site, options: { azimuthConvention?: AzimuthConvention } = {}): EquatorialOutput {
  validateSite(site);
  const { zenithDeg, azimuthDeg, unixMs } = input;
  const n = zenithDeg.length;
  if (azimuthDeg.length !== n || unixMs.length !== n) throw new RangeError("zenithDeg, azimuthDeg and unixMs lengths differ");
  const eastCcw = options.azimuthConvention === "east-counterclockwise";
  if (options.azimuthConvention !== undefined && !eastCcw && options.azimuthConvention !== "north-clockwise") {
    throw new RangeError(`unknown azimuth convention: ${String(options.azimuthConvention)}`);
  }
  const out: EquatorialOutput = {
    raDeg: new Float64Array(n), decDeg: new Float64Array(n),
    x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n),
  };
  const phi = site.latitudeDeg * RAD_PER_DEG;
  const sphi = Math.sin(phi), cphi = Math.cos(phi);
  const frames = new DayFrames(site.longitudeDeg * RAD_PER_DEG);
  const { raDeg, decDeg, x, y, z } = out;
  let lastDay = NaN, o = 0;
  let f = frames.data;
  for (let i = 0; i < n; i++) {
    const t = unixMs[i];
    const day = Math.floor(t / MS_PER_DAY);
    if (day !== lastDay) {
      if (!Number.isFinite(day)) { raDeg[i] = decDeg[i] = x[i] = y[i] = z[i] = NaN; continue; }
      o = frames.slot(day); f = frames.data; lastDay = day;
    }
    const zr = zenithDeg[i] * RAD_PER_DEG;
    const ar = (eastCcw ? 90 - azimuthDeg[i] : azimuthDeg[i]) * RAD_PER_DEG;
    const sz = Math.sin(zr), cz = Math.cos(zr);
    const e = sz * Math.sin(ar), nn = sz * Math.cos(ar);
    // meridian frame: x toward the site's meridian on the equator, y east, z north pole
    const xm = cphi * cz - sphi * nn;
    const zm = sphi * cz + cphi * nn;
    const th = earthRotationAngleRadFromUnixMs(t) + f[o + 9];
    const ct = Math.cos(th), st = Math.sin(th);
    const xt = ct * xm - st * e, yt = st * xm + ct * e;
    const X = f[o] * xt + f[o + 1] * yt + f[o + 2] * zm;
    const Y = f[o + 3] * xt + f[o + 4] * yt + f[o + 5] * zm;
    const Z = f[o + 6] * xt + f[o + 7] * yt + f[o + 8] * zm;
    x[i] = X; y[i] = Y; z[i] = Z;
    let ra = Math.atan2(Y, X) * DEG_PER_RAD;
    if (ra < 0) { ra += 360; if (ra >= 360) ra = 0; }
    raDeg[i] = ra + 0; // + 0 turns -0 into 0
    decDeg[i] = Math.atan2(Z, Math.sqrt(X * X + Y * Y)) * DEG_PER_RAD + 0;
  }
  return out;
}

/**
 * Local apparent sidereal angle in radians, [0, 2 pi), at each instant (Unix ms UTC, UT1 ~ UTC)
 * for an east longitude in degrees: ERA + (GMST - ERA) + equation of the equinoxes + longitude
 * (the same angle horizontalToEquatorial uses; per-day cache as there). Vectorised.
 */
export function localApparentSiderealAngleRad(unixMs: ArrayLike<number>, longitudeDeg: number): Float64Array {
  if (!Number.isFinite(longitudeDeg)) throw new RangeError(`longitude not finite: ${longitudeDeg}`);
  const n = unixMs.length;
  const out = new Float64Array(n);
  const frames = new DayFrames(longitudeDeg * RAD_PER_DEG);
  let lastDay = NaN, o = 0;
  for (let i = 0; i < n; i++) {
    const t = unixMs[i];
    const day = Math.floor(t / MS_PER_DAY);
    if (day !== lastDay) {
      if (!Number.isFinite(day)) { out[i] = NaN; continue; }
      o = frames.slot(day); lastDay = day;
    }
    let a = (earthRotationAngleRadFromUnixMs(t) + frames.data[o + 9]) % TWO_PI;
    if (a < 0) a += TWO_PI;
    out[i] = a;
  }
  return out;
}

/**
 * Rotation true equator and equinox of date -> ICRS (row-major, the transpose of
 * precessionNutationMatrix) at a UTC instant in Unix ms.
 */
export function trueOfDateToIcrsMatrixAt(unixMs: number): Float64Array {
  return transpose3(precessionNutationMatrix(jdTtFromUnixMs(unixMs)));
}

/** ICRS directions at instants, for equatorialToHorizontal: RA, Dec in degrees, time Unix ms UTC. */
export interface EquatorialInput {
  raDeg: ArrayLike<number>;
  decDeg: ArrayLike<number>;
  unixMs: ArrayLike<number>;
}

/**
 * ICRS right ascension / declination at instants -> local zenith (deg, [0, 180]) and azimuth
 * (deg, [0, 360), north-clockwise unless options say east-counterclockwise) at the site: the
 * exact inverse of horizontalToEquatorial (same per-day frames). Used by simulations.
 */
export function equatorialToHorizontal(input: EquatorialInput, site: Site, options: { azimuthConvention?: AzimuthConvention } = {}): { zenithDeg: Float64Array; azimuthDeg: Float64Array } {
  validateSite(site);
  const { raDeg, decDeg, unixMs } = input;
  const n = raDeg.length;
  if (decDeg.length !== n || unixMs.length !== n) throw new RangeError("raDeg, decDeg and unixMs lengths differ");
  const eastCcw = options.azimuthConvention === "east-counterclockwise";
  const zenithDeg = new Float64Array(n), azimuthDeg = new Float64Array(n);
  const phi = site.latitudeDeg * RAD_PER_DEG;
  const sphi = Math.sin(phi), cphi = Math.cos(phi);
  const frames = new DayFrames(site.longitudeDeg * RAD_PER_DEG);
  let lastDay = NaN, o = 0;
  let f = frames.data;
  for (let i = 0; i < n; i++) {
    const t = unixMs[i];
    const day = Math.floor(t / MS_PER_DAY);
    if (day !== lastDay) {
      if (!Number.isFinite(day)) { zenithDeg[i] = azimuthDeg[i] = NaN; continue; }
      o = frames.slot(day); f = frames.data; lastDay = day;
    }
    const ra = raDeg[i] * RAD_PER_DEG, dec = decDeg[i] * RAD_PER_DEG;
    const cd = Math.cos(dec);
    const X = cd * Math.cos(ra), Y = cd * Math.sin(ra), Z = Math.sin(dec);
    // ICRS -> true of date: transpose of the stored (tod -> icrs) matrix
    const xt = f[o] * X + f[o + 3] * Y + f[o + 6] * Z;
    const yt = f[o + 1] * X + f[o + 4] * Y + f[o + 7] * Z;
    const zm = f[o + 2] * X + f[o + 5] * Y + f[o + 8] * Z;
    const th = earthRotationAngleRadFromUnixMs(t) + f[o + 9];
    const ct = Math.cos(th), st = Math.sin(th);
    const xm = ct * xt + st * yt, e = -st * xt + ct * yt;
    const u = cphi * xm + sphi * zm;
    const nn = -sphi * xm + cphi * zm;
    zenithDeg[i] = Math.atan2(Math.sqrt(e * e + nn * nn), u) * DEG_PER_RAD;
    let az = (e === 0 && nn === 0 ? 0 : Math.atan2(e, nn)) * DEG_PER_RAD;
    if (eastCcw) az = 90 - az;
    az %= 360;
    if (az < 0) az += 360;
    azimuthDeg[i] = az >= 360 ? 0 : az;
  }
  return { zenithDeg, azimuthDeg };
}

// ---------------------------------------------------------------------------------------------
// Galactic and supergalactic rotations

/** North galactic pole, ICRS RA in degrees (Hipparcos, ESA SP-1200, 1997). */
export const NGP_RA_DEG = 192.85948;
/** North galactic pole, ICRS Dec in degrees (Hipparcos, ESA SP-1200, 1997). */
export const NGP_DEC_DEG = 27.12825;
/** Galactic longitude of the north celestial pole in degrees (Hipparcos, ESA SP-1200, 1997). */
export const NCP_GALACTIC_LON_DEG = 122.93192;
/** Supergalactic north pole, galactic longitude in degrees (de Vaucouleurs et al. 1991, RC3). */
export const SGP_GALACTIC_L_DEG = 47.37;
/** Supergalactic north pole, galactic latitude in degrees (de Vaucouleurs et al. 1991, RC3). */
export const SGP_GALACTIC_B_DEG = 6.32;
/** Supergalactic zero point (SGL = 0, SGB = 0), galactic longitude in degrees (RC3; from memory), b = 0. */
export const SG_ORIGIN_GALACTIC_L_DEG = 137.37;

/** Rotation whose rows are the target axes given in the source frame: rows x, y, z. */
function rowsMatrix(xa: ArrayLike<number>, ya: ArrayLike<number>, za: ArrayLike<number>): Float64Array {
  return Float64Array.of(xa[0], xa[1], xa[2], ya[0], ya[1], ya[2], za[0], za[1], za[2]);
}

function buildIcrsToGalactic(): Float64Array {
  const zg = lonLatDegToVector(NGP_RA_DEG, NGP_DEC_DEG);
  // projection of the celestial pole (0, 0, 1) on the galactic plane, toward l = l_NCP
  const px0 = -zg[2] * zg[0], py0 = -zg[2] * zg[1], pz0 = 1 - zg[2] * zg[2];
  const pn = Math.hypot(px0, py0, pz0);
  const p = [px0 / pn, py0 / pn, pz0 / pn];
  const q = [zg[1] * p[2] - zg[2] * p[1], zg[2] * p[0] - zg[0] * p[2], zg[0] * p[1] - zg[1] * p[0]]; // zg x p
  const c = Math.cos(NCP_GALACTIC_LON_DEG * RAD_PER_DEG), s = Math.sin(NCP_GALACTIC_LON_DEG * RAD_PER_DEG);
  const xg = [c * p[0] - s * q[0], c * p[1] - s * q[1], c * p[2] - s * q[2]];
  const yg = [s * p[0] + c * q[0], s * p[1] + c * q[1], s * p[2] + c * q[2]];
  return rowsMatrix(xg, yg, zg);
}

function buildGalacticToSupergalactic(): Float64Array {
  const zs = lonLatDegToVector(SGP_GALACTIC_L_DEG, SGP_GALACTIC_B_DEG);
  const xs = lonLatDegToVector(SG_ORIGIN_GALACTIC_L_DEG, 0);
  const ys = [zs[1] * xs[2] - zs[2] * xs[1], zs[2] * xs[0] - zs[0] * xs[2], zs[0] * xs[1] - zs[1] * xs[0]]; // zs x xs
  return rowsMatrix(xs, ys, zs);
}

const ICRS_TO_GAL = buildIcrsToGalactic();
const GAL_TO_SG = buildGalacticToSupergalactic();
const ICRS_TO_SG = multiply3(GAL_TO_SG, ICRS_TO_GAL);

/** Rotation matrix ICRS -> galactic (row-major copy; v_gal = M . v_icrs). Inverse: its transpose. */
export function icrsToGalacticMatrix(): Float64Array { return Float64Array.from(ICRS_TO_GAL); }
/** Rotation matrix galactic -> supergalactic (row-major copy). Inverse: its transpose. */
export function galacticToSupergalacticMatrix(): Float64Array { return Float64Array.from(GAL_TO_SG); }
/** Rotation matrix ICRS -> supergalactic (row-major copy). Inverse: its transpose. */
export function icrsToSupergalacticMatrix(): Float64Array { return Float64Array.from(ICRS_TO_SG); }

function rotateLonLat(m: ArrayLike<number>, lonDeg: ArrayLike<number>, latDeg: ArrayLike<number>): { lonDeg: Float64Array; latDeg: Float64Array } {
  const n = lonDeg.length;
  if (latDeg.length !== n) throw new RangeError("longitude and latitude lengths differ");
  const lo = new Float64Array(n), la = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const l = lonDeg[i] * RAD_PER_DEG, b = latDeg[i] * RAD_PER_DEG;
    const cb = Math.cos(b);
    const X = cb * Math.cos(l), Y = cb * Math.sin(l), Z = Math.sin(b);
    const u = m[0] * X + m[1] * Y + m[2] * Z, v = m[3] * X + m[4] * Y + m[5] * Z, w = m[6] * X + m[7] * Y + m[8] * Z;
    let lon = u === 0 && v === 0 ? 0 : Math.atan2(v, u) * DEG_PER_RAD;
    if (lon < 0) { lon += 360; if (lon >= 360) lon = 0; }
    lo[i] = lon + 0;
    la[i] = Math.atan2(w, Math.sqrt(u * u + v * v)) * DEG_PER_RAD + 0;
  }
  return { lonDeg: lo, latDeg: la };
}

/**
 * Rotates unit vectors by a row-major matrix and writes lon [0, 360) / lat [-90, 90] degrees of
 * the results (no vectors kept). Used for bulk ICRS -> galactic output.
 */
export function vectorsToRotatedLonLatDeg(m: ArrayLike<number>, v: UnitVectors, out?: { lonDeg: Float64Array; latDeg: Float64Array }): { lonDeg: Float64Array; latDeg: Float64Array } {
  const n = v.x.length;
  const res = out ?? { lonDeg: new Float64Array(n), latDeg: new Float64Array(n) };
  const { x, y, z } = v;
  const m0 = m[0], m1 = m[1], m2 = m[2], m3 = m[3], m4 = m[4], m5 = m[5], m6 = m[6], m7 = m[7], m8 = m[8];
  for (let i = 0; i < n; i++) {
    const X = x[i], Y = y[i], Z = z[i];
    const u = m0 * X + m1 * Y + m2 * Z, w = m3 * X + m4 * Y + m5 * Z, s = m6 * X + m7 * Y + m8 * Z;
    let lon = Math.atan2(w, u) * DEG_PER_RAD;
    if (lon < 0) { lon += 360; if (lon >= 360) lon = 0; }
    res.lonDeg[i] = lon + 0;
    res.latDeg[i] = Math.atan2(s, Math.sqrt(u * u + w * w)) * DEG_PER_RAD + 0;
  }
  return res;
}

/** ICRS (ra, dec) deg -> galactic (l in [0, 360), b in [-90, 90]) deg, Hipparcos definition. Inverse: galacticToEquatorial. */
export function equatorialToGalactic(raDeg: ArrayLike<number>, decDeg: ArrayLike<number>): { lDeg: Float64Array; bDeg: Float64Array } {
  const r = rotateLonLat(ICRS_TO_GAL, raDeg, decDeg);
  return { lDeg: r.lonDeg, bDeg: r.latDeg };
}

/** Galactic (l, b) deg -> ICRS (ra in [0, 360), dec) deg. Inverse of equatorialToGalactic. */
export function galacticToEquatorial(lDeg: ArrayLike<number>, bDeg: ArrayLike<number>): { raDeg: Float64Array; decDeg: Float64Array } {
  const r = rotateLonLat(transpose3(ICRS_TO_GAL), lDeg, bDeg);
  return { raDeg: r.lonDeg, decDeg: r.latDeg };
}

/** Galactic (l, b) deg -> supergalactic (SGL in [0, 360), SGB) deg, RC3 definition. Inverse: supergalacticToGalactic. */
export function galacticToSupergalactic(lDeg: ArrayLike<number>, bDeg: ArrayLike<number>): { sglDeg: Float64Array; sgbDeg: Float64Array } {
  const r = rotateLonLat(GAL_TO_SG, lDeg, bDeg);
  return { sglDeg: r.lonDeg, sgbDeg: r.latDeg };
}

/** Supergalactic (SGL, SGB) deg -> galactic (l in [0, 360), b) deg. Inverse of galacticToSupergalactic. */
export function supergalacticToGalactic(sglDeg: ArrayLike<number>, sgbDeg: ArrayLike<number>): { lDeg: Float64Array; bDeg: Float64Array } {
  const r = rotateLonLat(transpose3(GAL_TO_SG), sglDeg, sgbDeg);
  return { lDeg: r.lonDeg, bDeg: r.latDeg };
}

/** ICRS (ra, dec) deg -> supergalactic (SGL, SGB) deg. Inverse: supergalacticToEquatorial. */
export function equatorialToSupergalactic(raDeg: ArrayLike<number>, decDeg: ArrayLike<number>): { sglDeg: Float64Array; sgbDeg: Float64Array } {
  const r = rotateLonLat(ICRS_TO_SG, raDeg, decDeg);
  return { sglDeg: r.lonDeg, sgbDeg: r.latDeg };
}

/** Supergalactic (SGL, SGB) deg -> ICRS (ra, dec) deg. Inverse of equatorialToSupergalactic. */
export function supergalacticToEquatorial(sglDeg: ArrayLike<number>, sgbDeg: ArrayLike<number>): { raDeg: Float64Array; decDeg: Float64Array } {
  const r = rotateLonLat(transpose3(ICRS_TO_SG), sglDeg, sgbDeg);
  return { raDeg: r.lonDeg, decDeg: r.latDeg };
}
