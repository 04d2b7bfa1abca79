/**
 * HEALPix pixelisation (Gorski et al. 2005, ApJ 622, 759): Npix = 12 Nside^2 equal-area pixels,
 * RING and NESTED orderings, pixel area pi / (3 Nside^2) sr. Directions are ICRS (or any frame's)
 * unit vectors; theta is colatitude, phi longitude.
 *
 * The bulk binning (vectorsToPixels) is our own tight loop over typed arrays. It evaluates the
 * same HEALPix projection (Gorski et al. 2005 sec. 4.4, coordinates (x_s, y_s) = (t, u)) with
 * the same floating-point operations as @hscmap/healpix, so that results agree pixel for pixel
 * even on pixel boundaries (tested). Pixel centres are computed from the ring geometry
 * (Gorski et al. 2005 eqs. 4-9); corners and the inclusive disc query come from @hscmap/healpix.
 *
 * Nside must be a power of 2 in [1, 8192]: 12 x 8192^2 = 805,306,368 pixels is the largest map
 * whose indices fit an Int32Array (16384 would need 3.2e9).
 */
import * as hp from "@hscmap/healpix";
import { DEG_PER_RAD } from "./constants";
import type { UnitVectors } from "./vectors";

/** Pixel ordering scheme. */
export type HealpixOrder = "ring" | "nested";

/** A HEALPix map: the order and Nside always travel with the data (METHODS section 3). */
export interface HealpixMap {
  nside: number;
  order: HealpixOrder;
  /** One value per pixel, length 12 nside^2, indexed by pixel number in `order`. */
  data: Float32Array | Float64Array | Int32Array;
}

/** Largest Nside accepted (Int32 pixel indices). */
export const HEALPIX_NSIDE_MAX = 8192;

/** Throws a RangeError unless nside is a power of 2 in [1, 8192]. */
export function validateNside(nside: number): void {
  if (!(Number.isInteger(nside) && nside >= 1 && nside <= HEALPIX_NSIDE_MAX && (nside & (nside - 1)) === 0)) {
    throw new RangeError(`Nside must be a power of 2 in [1, ${HEALPIX_NSIDE_MAX}], got ${nside}`);
  }
}

function validateOrder(order: HealpixOrder): void {
  if (order !== "ring" && order !== "nested") throw new RangeError(`unknown HEALPix order: ${String(order)}`);
}

/** Number of pixels, 12 Nside^2 (Gorski et al. 2005). */
export function nside2npix(nside: number): number {
  validateNside(nside);
  return 12 * nside * nside;
}

/** Pixel area in steradians, pi / (3 Nside^2) = 4 pi / Npix. */
export function pixelAreaSr(nside: number): number {
  validateNside(nside);
  return Math.PI / (3 * nside * nside);
}

/** Mean pixel spacing in degrees, sqrt(pi / (3 Nside^2)) rad: 0.916 deg at Nside 64 (METHODS section 8). */
export function pixelSpacingDeg(nside: number): number {
  return Math.sqrt(pixelAreaSr(nside)) * DEG_PER_RAD;
}

/** log2(Nside). */
export function nsideToLog2(nside: number): number {
  validateNside(nside);
  return 31 - Math.clz32(nside);
}

// ---------------------------------------------------------------------------------------------
// Bit interleaving and face/x/y conversions

const SPREAD = new Int32Array(256);
for (let b = 0; b < 256; b++) {
  let v = 0;
  for (let k = 0; k < 8; k++) if (b & (1 << k)) v |= 1 << (2 * k);
  SPREAD[b] = v;
}

/** Interleaves x (even bits) and y (odd bits), x, y < 2^13. */
function interleave(x: number, y: number): number {
  return (SPREAD[x & 255] | (SPREAD[(x >> 8) & 255] << 16)) | ((SPREAD[y & 255] | (SPREAD[(y >> 8) & 255] << 16)) << 1);
}

function compactEven(k: number): number {
  let x = k & 0x55555555;
  x = (x | (x >> 1)) & 0x33333333;
  x = (x | (x >> 2)) & 0x0f0f0f0f;
  x = (x | (x >> 4)) & 0x00ff00ff;
  return (x | (x >> 8)) & 0x0000ffff;
}

/** Ring index of face f, in-face (x, y) (Gorski et al. 2005 ring numbering; same formula as @hscmap/healpix fxy2ring). */
function fxyToRing(nside: number, f: number, x: number, y: number): number {
  const fRow = f >> 2;
  const i = (fRow + 2) * nside - (x + y) - 1;
  if (i < nside) return 2 * i * (i - 1) + i * (f & 3) + nside - y - 1;
  if (i < 3 * nside) {
    const f2 = 2 * (f & 3) - (fRow & 1) + 1;
    const k = (f2 * nside + (x - y) + 8 * nside) % (8 * nside);
    return 2 * nside * (nside - 1) + (i - nside) * 4 * nside + (k >> 1);
  }
  const ii = 4 * nside - i;
  const j = 4 * ii - ii * (3 - (f & 3)) - y;
  return 12 * nside * nside - 2 * ii * (ii - 1) - (4 * ii - j + 1);
}

/** NESTED -> RING pixel number. */
export function nestedToRing(nside: number, ipix: number): number {
  validateNside(nside);
  const f = Math.floor(ipix / (nside * nside));
  const k = ipix - f * nside * nside;
  return fxyToRing(nside, f, compactEven(k), compactEven(k >> 1));
}

/** Permutation array p with p[nestedIndex] = ringIndex, for all pixels at this Nside. */
export function nestedToRingTable(nside: number): Int32Array {
  const npix = nside2npix(nside);
  const n2 = nside * nside;
  const out = new Int32Array(npix);
  for (let ip = 0; ip < npix; ip++) {
    const f = (ip / n2) | 0;
    const k = ip - f * n2;
    out[ip] = fxyToRing(nside, f, compactEven(k), compactEven(k >> 1));
  }
  return out;
}

/** Permutation array q with q[ringIndex] = nestedIndex (inverse of nestedToRingTable). */
export function ringToNestedTable(nside: number): Int32Array {
  const n2r = nestedToRingTable(nside);
  const out = new Int32Array(n2r.length);
  for (let ip = 0; ip < n2r.length; ip++) out[n2r[ip]] = ip;
  return out;
}

/** RING -> NESTED pixel number (via @hscmap/healpix; use ringToNestedTable for many pixels). */
export function ringToNested(nside: number, ipix: number): number {
  validateNside(nside);
  return hp.ring2nest(nside, ipix);
}

// ---------------------------------------------------------------------------------------------
// Binning

const PI = Math.PI, PI2 = 2 * Math.PI, PI_2 = Math.PI / 2, PI_4 = Math.PI / 4, PI_8 = Math.PI / 8;
const U_EQUATORIAL = 3 * PI_8;

/**
 * Bins directions into HEALPix pixels: out[i] = pixel of (x[i], y[i], z[i]) (any non-zero
 * length; need not be normalised) at nside in the given order. Pixel-for-pixel identical to
 * @hscmap/healpix vec2pix_nest / vec2pix_ring. Non-finite vectors give -1.
 * Throughput ~ 10^7 directions per second per core (see bench/binning.ts).
 */
export function vectorsToPixels(nside: number, order: HealpixOrder, v: UnitVectors, out?: Int32Array): Int32Array {
  validateNside(nside);
  validateOrder(order);
  const { x, y, z } = v;
  const n = x.length;
  if (y.length !== n || z.length !== n) throw new RangeError("x, y, z lengths differ");
  const res = out ?? new Int32Array(n);
  if (res.length < n) throw new RangeError("output array too short");
  const ring = order === "ring";
  const n2 = nside * nside;
  const nm1 = nside - 1;
  for (let i = 0; i < n; i++) {
    const X = x[i], Y = y[i];
    let zz = z[i];
    const r2 = X * X + Y * Y;
    let a: number;
    if (r2 === 0) { zz = zz < 0 ? -1 : 1; a = 0; }
    else {
      a = Math.atan2(Y, X) + PI2;
      if (a >= PI2) a -= PI2;
      zz = zz / Math.sqrt(zz * zz + r2);
    }
    // HEALPix projection (t, u)
    let t: number, u: number;
    const az = zz < 0 ? -zz : zz;
    if (az <= 2 / 3) { t = a; u = U_EQUATORIAL * zz; }
    else {
      let pt = a;
      if (pt >= PI) pt -= PI;
      if (pt >= PI_2) pt -= PI_2;
      const s = 2 - Math.sqrt(3 * (1 - az));
      t = a - (s - 1) * (pt - PI_4);
      u = PI_4 * (zz < 0 ? -s : s);
    }
    // (t, u) -> face and in-face coordinates
    t /= PI_4; u /= PI_4;
    if (t < 0) t = 8 - (-t % 8); else if (t >= 8) t = t % 8;
    t += -4; u += 5;
    let pp = (u + t) / 2;
    pp = pp < 0 ? 0 : pp > 5 ? 5 : pp;
    const PP = Math.floor(pp);
    let qq = (u - t) / 2;
    qq = qq < 3 - PP ? 3 - PP : qq > 6 - PP ? 6 - PP : qq;
    const QQ = Math.floor(qq);
    const V = 5 - (PP + QQ);
    let f: number, ix: number, iy: number;
    if (V < 0) { f = 0; ix = nm1; iy = nm1; }
    else {
      f = 4 * V + (((PP - QQ + 4) >> 1) % 4);
      ix = Math.floor(nside * (pp - PP)); iy = Math.floor(nside * (qq - QQ));
      if (ix > nm1) ix = nm1; if (iy > nm1) iy = nm1;
    }
    if (!(ix >= 0 && iy >= 0)) { res[i] = -1; continue; }
    res[i] = ring ? fxyToRing(nside, f, ix, iy) : f * n2 + interleave(ix, iy);
  }
  return res;
}

/** Pixel of one direction (x, y, z) (see vectorsToPixels). */
export function vectorToPixel(nside: number, order: HealpixOrder, x: number, y: number, z: number): number {
  return vectorsToPixels(nside, order, { x: Float64Array.of(x), y: Float64Array.of(y), z: Float64Array.of(z) })[0];
}

/** Counts directions per pixel: an Int32Array count map at nside/order. Non-finite directions are skipped. */
export function countMap(nside: number, order: HealpixOrder, v: UnitVectors): HealpixMap {
  const pix = vectorsToPixels(nside, order, v);
  const data = new Int32Array(nside2npix(nside));
  for (let i = 0; i < pix.length; i++) { const p = pix[i]; if (p >= 0) data[p]++; }
  return { nside, order, data };
}

/**
 * Degrades NESTED pixel indices from nsideFine to nsideCoarse (both powers of 2, coarse <= fine)
 * by the integer shift ipix >> 2k, k = log2(fine / coarse) (METHODS section 3). In place allowed.
 */
export function degradeNestedPixels(ipix: Int32Array, nsideFine: number, nsideCoarse: number, out: Int32Array = new Int32Array(ipix.length)): Int32Array {
  validateNside(nsideFine); validateNside(nsideCoarse);
  if (nsideCoarse > nsideFine) throw new RangeError("nsideCoarse must not exceed nsideFine");
  const shift = 2 * (nsideToLog2(nsideFine) - nsideToLog2(nsideCoarse));
  for (let i = 0; i < ipix.length; i++) out[i] = ipix[i] < 0 ? -1 : ipix[i] >> shift;
  return out;
}

/**
 * Degrades a map to a coarser Nside: "sum" adds the fine pixels (counts), "mean" averages them
 * (densities, exposures). Output order = input order; Float64Array data.
 */
export function degradeMap(map: HealpixMap, nsideCoarse: number, mode: "sum" | "mean"): HealpixMap {
  validateNside(nsideCoarse);
  if (nsideCoarse > map.nside) throw new RangeError("nsideCoarse must not exceed the map's Nside");
  const nested = map.order === "nested" ? map : reorderMap(map, "nested");
  const shift = 2 * (nsideToLog2(map.nside) - nsideToLog2(nsideCoarse));
  const out = new Float64Array(nside2npix(nsideCoarse));
  for (let ip = 0; ip < nested.data.length; ip++) out[ip >> shift] += nested.data[ip];
  if (mode === "mean") { const k = 1 / (1 << shift); for (let i = 0; i < out.length; i++) out[i] *= k; }
  const coarse: HealpixMap = { nside: nsideCoarse, order: "nested", data: out };
  return map.order === "ring" ? reorderMap(coarse, "ring") : coarse;
}

/** Reorders a map to RING or NESTED (a copy of the same data type; returns a copy if already in that order). */
export function reorderMap(map: HealpixMap, order: HealpixOrder): HealpixMap {
  validateOrder(order);
  validateNside(map.nside);
  const Ctor = map.data.constructor as { new(n: number): Float32Array | Float64Array | Int32Array };
  const out = new Ctor(map.data.length);
  if (map.order === order) { out.set(map.data); return { nside: map.nside, order, data: out }; }
  const n2r = nestedToRingTable(map.nside);
  if (order === "ring") for (let ip = 0; ip < n2r.length; ip++) out[n2r[ip]] = map.data[ip];
  else for (let ip = 0; ip < n2r.length; ip++) out[ip] = map.data[n2r[ip]];
  return { nside: map.nside, order, data: out };
}

// ---------------------------------------------------------------------------------------------
// Geometry

/** Pixel centres as unit vectors and as lon/lat (ra/dec) in degrees, lon in [0, 360). */
export interface PixelCentres extends UnitVectors {
  raDeg: Float64Array;
  decDeg: Float64Array;
}

/**
 * Centres of all pixels at nside in the given order, from the ring geometry (Gorski et al. 2005
 * eqs. 4-9): ring i = 1..4 Nside - 1; north cap i < Nside: z = 1 - i^2 / (3 Nside^2), 4i pixels at
 * phi = pi (j - 1/2) / (2i); belt: z = 4/3 - 2i / (3 Nside), 4 Nside pixels at phi = pi (j - s/2) /
 * (2 Nside), s = (i - Nside + 1) mod 2; south cap mirrors the north.
 */
export function pixelCentres(nside: number, order: HealpixOrder): PixelCentres {
  validateNside(nside); validateOrder(order);
  const npix = 12 * nside * nside;
  const x = new Float64Array(npix), y = new Float64Array(npix), z = new Float64Array(npix);
  const raDeg = new Float64Array(npix), decDeg = new Float64Array(npix);
  const ringToNest = order === "nested" ? ringToNestedTable(nside) : null;
  let p = 0;
  for (let i = 1; i < 4 * nside; i++) {
    let zi: number, sinT: number, nInRing: number, phi0: number, dphi: number;
    const ic = i < nside ? i : i > 3 * nside ? 4 * nside - i : 0;
    if (ic > 0) {
      const q = (ic * ic) / (3 * nside * nside);
      zi = i < nside ? 1 - q : q - 1;
      sinT = Math.sqrt(q * (2 - q));
      nInRing = 4 * ic; dphi = PI_2 / ic; phi0 = dphi / 2;
    } else {
      zi = 4 / 3 - (2 * i) / (3 * nside);
      sinT = Math.sqrt((1 - zi) * (1 + zi));
      nInRing = 4 * nside; dphi = PI_2 / nside;
      phi0 = ((i - nside + 1) & 1) === 1 ? dphi / 2 : 0;
    }
    const dec = Math.atan2(zi, sinT) * DEG_PER_RAD;
    for (let j = 0; j < nInRing; j++, p++) {
      const phi = phi0 + j * dphi;
      const q = ringToNest ? ringToNest[p] : p;
      x[q] = sinT * Math.cos(phi); y[q] = sinT * Math.sin(phi); z[q] = zi;
      raDeg[q] = phi * DEG_PER_RAD; decDeg[q] = dec;
    }
  }
  return { x, y, z, raDeg, decDeg };
}

/**
 * The four corners of a pixel (north, west, south, east) as unit vectors, Float64Array(12)
 * [x0, y0, z0, x1, ...] (@hscmap/healpix corners_*).
 */
export function pixelCorners(nside: number, order: HealpixOrder, ipix: number): Float64Array {
  validateNside(nside); validateOrder(order);
  const c = order === "ring" ? hp.corners_ring(nside, ipix) : hp.corners_nest(nside, ipix);
  const out = new Float64Array(12);
  for (let k = 0; k < 4; k++) { out[3 * k] = c[k][0]; out[3 * k + 1] = c[k][1]; out[3 * k + 2] = c[k][2]; }
  return out;
}

/**
 * Exact disc query: pixels whose CENTRE lies within radiusRad (angular distance <= radius) of
 * the direction (x, y, z) (normalised internally), sorted ascending. Uses @hscmap/healpix's
 * inclusive query then an exact distance filter; for radius >= pi/2 (where that query is not
 * defined) every pixel centre is tested.
 */
export function queryDiscCentres(nside: number, order: HealpixOrder, x: number, y: number, z: number, radiusRad: number): Int32Array {
  validateNside(nside); validateOrder(order);
  if (!(radiusRad >= 0)) throw new RangeError(`radius must be >= 0 rad, got ${radiusRad}`);
  const norm = Math.hypot(x, y, z);
  const ux = x / norm, uy = y / norm, uz = z / norm;
  const cosR = Math.cos(radiusRad);
  const hits: number[] = [];
  if (radiusRad >= PI_2 - 1e-9) {
    const c = pixelCentres(nside, order);
    for (let p = 0; p < c.x.length; p++) if (withinRadius(c.x[p], c.y[p], c.z[p], ux, uy, uz, radiusRad, cosR)) hits.push(p);
  } else {
    const cb = (p: number) => {
      const v = order === "ring" ? hp.pix2vec_ring(nside, p) : hp.pix2vec_nest(nside, p);
      if (withinRadius(v[0], v[1], v[2], ux, uy, uz, radiusRad, cosR)) hits.push(p);
    };
    if (order === "ring") hp.query_disc_inclusive_ring(nside, [ux, uy, uz], radiusRad, cb);
    else hp.query_disc_inclusive_nest(nside, [ux, uy, uz], radiusRad, cb);
  }
  const out = Int32Array.from(hits);
  out.sort();
  return out;
}

function withinRadius(px: number, py: number, pz: number, ux: number, uy: number, uz: number, r: number, cosR: number): boolean {
  const d = px * ux + py * uy + pz * uz;
  if (Math.abs(d - cosR) > 1e-9) return d >= cosR;
  const cx = py * uz - pz * uy, cy = pz * ux - px * uz, cz = px * uy - py * ux;
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), d) <= r;
}
