/**
 * Geometry of the HEALPix RING scheme computed directly from the closed formulas of
 * Gorski et al. 2005 (ApJ 622, 759, section 4 and eqs. 4-9). Used by the window scan,
 * which needs whole rings (iso-latitude circles of pixel centres) rather than single
 * pixels.
 *
 * Ring numbers i run from 1 (next to the north pole) to 4 Nside - 1 (next to the south
 * pole); the arrays below are indexed by i - 1. Pixels are numbered from 0 in RING order:
 * ring by ring from north to south, within a ring in increasing phi (= right ascension for
 * an equatorial map). z = cos(colatitude) = sin(latitude).
 */

/** Throws unless nside is a power of two in [1, 2^13] (the range the scan is built for). */
export function assertNside(nside: number): void {
  if (!Number.isInteger(nside) || nside < 1 || nside > 8192 || (nside & (nside - 1)) !== 0) {
    throw new RangeError(`nside must be a power of 2 in [1, 8192], got ${nside}`);
  }
}

/** Number of iso-latitude rings, 4 Nside - 1 (Gorski et al. 2005, section 4). */
export function ringCount(nside: number): number {
  return 4 * nside - 1;
}

/**
 * z = cos(theta) of the pixel centres of ring i (1 <= i <= 4 Nside - 1). North polar cap
 * (i < Nside): z = 1 - i^2 / (3 Nside^2); equatorial belt (Nside <= i <= 3 Nside):
 * z = 4/3 - 2 i / (3 Nside); south cap mirrored: z(i) = -z(4 Nside - i). Gorski et al. 2005
 * eqs. 4-5 and 8-9.
 */
export function ringZ(nside: number, i: number): number {
  if (i < nside) return 1 - (i * i) / (3 * nside * nside);
  if (i <= 3 * nside) return 4 / 3 - (2 * i) / (3 * nside);
  const k = 4 * nside - i;
  return -(1 - (k * k) / (3 * nside * nside));
}

/** Number of pixels in ring i: 4 i in the north cap, 4 Nside in the belt, 4 (4 Nside - i) in the south cap. */
export function ringPixelCount(nside: number, i: number): number {
  if (i < nside) return 4 * i;
  if (i <= 3 * nside) return 4 * nside;
  return 4 * (4 * nside - i);
}

/** RING index of the first pixel (smallest phi) of ring i. */
export function ringFirstPixel(nside: number, i: number): number {
  if (i < nside) return 2 * i * (i - 1);
  if (i <= 3 * nside) return 2 * nside * (nside - 1) + (i - nside) * 4 * nside;
  const k = 4 * nside - i;
  return 12 * nside * nside - 2 * k * (k + 1);
}

/**
 * phi (radians, [0, 2 pi)) of the first pixel centre of ring i; pixel j (0-based) of the
 * ring is at phi0 + j * 2 pi / ringPixelCount. Caps: phi = (pi / (2 i)) (j + 1/2);
 * belt: phi = (pi / (2 Nside)) (j + s / 2) with s = 1 when i - Nside is even (shifted ring),
 * s = 0 otherwise (Gorski et al. 2005 eqs. 5 and 9, with j counted from 0).
 */
export function ringPhi0Rad(nside: number, i: number): number {
  if (i < nside) return Math.PI / (4 * i);
  if (i <= 3 * nside) return ((i - nside) & 1) === 0 ? Math.PI / (4 * nside) : 0;
  return Math.PI / (4 * (4 * nside - i));
}

/** All rings of one Nside as typed arrays indexed by ring number i - 1. */
export interface RingTable {
  nside: number;
  nRings: number;
  /** z = sin(latitude) of the ring's pixel centres. */
  z: Float64Array;
  /** Latitude (declination for an equatorial map) of the ring, radians in (-pi/2, pi/2). */
  latRad: Float64Array;
  nPixels: Int32Array;
  firstPixel: Int32Array;
  /** phi of pixel 0 of the ring, radians. */
  phi0Rad: Float64Array;
  /** Spacing of the pixel centres along the ring, 2 pi / nPixels, radians. */
  dPhiRad: Float64Array;
}

/** Ring table for an Nside (power of 2). Gorski et al. 2005, section 4. */
export function ringTable(nside: number): RingTable {
  assertNside(nside);
  const nRings = ringCount(nside);
  const t: RingTable = {
    nside,
    nRings,
    z: new Float64Array(nRings),
    latRad: new Float64Array(nRings),
    nPixels: new Int32Array(nRings),
    firstPixel: new Int32Array(nRings),
    phi0Rad: new Float64Array(nRings),
    dPhiRad: new Float64Array(nRings),
  };
  for (let r = 0; r < nRings; r++) {
    const i = r + 1;
    const z = ringZ(nside, i);
    t.z[r] = z;
    t.latRad[r] = Math.asin(z);
    t.nPixels[r] = ringPixelCount(nside, i);
    t.firstPixel[r] = ringFirstPixel(nside, i);
    t.phi0Rad[r] = ringPhi0Rad(nside, i);
    t.dPhiRad[r] = (2 * Math.PI) / t.nPixels[r];
  }
  return t;
}

/** Pixel centres of all 12 Nside^2 pixels in RING order as unit vectors (frame of the map). */
export interface RingCentres {
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** phi of each centre, radians in [0, 2 pi). */
  phiRad: Float64Array;
  /** Ring number minus one of each pixel. */
  ring: Int32Array;
}

/** Unit vectors of the RING pixel centres (Gorski et al. 2005 eqs. 4-9). */
export function ringCentres(nside: number): RingCentres {
  const t = ringTable(nside);
  const npix = 12 * nside * nside;
  const c: RingCentres = {
    x: new Float64Array(npix),
    y: new Float64Array(npix),
    z: new Float64Array(npix),
    phiRad: new Float64Array(npix),
    ring: new Int32Array(npix),
  };
  for (let r = 0; r < t.nRings; r++) {
    const z = t.z[r];
    const rho = Math.sqrt((1 - z) * (1 + z));
    const first = t.firstPixel[r];
    for (let j = 0; j < t.nPixels[r]; j++) {
      const phi = t.phi0Rad[r] + j * t.dPhiRad[r];
      const p = first + j;
      c.x[p] = rho * Math.cos(phi);
      c.y[p] = rho * Math.sin(phi);
      c.z[p] = z;
      c.phiRad[p] = phi;
      c.ring[p] = r;
    }
  }
  return c;
}
