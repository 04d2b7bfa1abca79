/**
 * Precession-nutation: the rotation from ICRS (GCRS; directions of sources at infinity, so the
 * difference between the two is ignored) to the true equator and equinox of date.
 *
 * - Frame bias + precession: IAU 2006 Fukushima-Williams angles (Hilton et al. 2006, Celest.
 *   Mech. 94, 351; the polynomials of the IAU SOFA routine pfw06), mean obliquity IAU 2006
 *   (Capitaine et al. 2003, A&A 412, 567, eq. 39; SOFA obl06).
 * - Nutation: the ten largest luni-solar terms of IAU 2000A/B (Mathews et al. 2002; coefficients
 *   as in IERS Conventions 2003, table 5.3a, transcribed from memory), with the Delaunay
 *   arguments of Simon et al. 1994. The neglected terms sum to well under 0.1 arcsec, far
 *   inside the 5 arcsec this module promises (checked against astronomy-engine in the tests).
 *
 * All matrices are Float64Array(9), row-major, and act on column vectors: v_date = M . v_icrs.
 */
import { DAYS_PER_JULIAN_CENTURY, JD_J2000, RAD_PER_ARCSEC, TWO_PI } from "./constants";

const ARCSEC_PER_TURN = 1296000;

/** Julian centuries of TT since J2000.0. */
function centuriesTt(jdTt: number): number {
  return (jdTt - JD_J2000) / DAYS_PER_JULIAN_CENTURY;
}

/** Mean obliquity of the ecliptic of date in radians, IAU 2006 (Capitaine et al. 2003, eq. 39). */
export function meanObliquityRad(jdTt: number): number {
  const t = centuriesTt(jdTt);
  return (84381.406 + (-46.836769 + (-0.0001831 + (0.00200340 + (-0.000000576 - 0.0000000434 * t) * t) * t) * t) * t) * RAD_PER_ARCSEC;
}

// Multipliers of (l, l', F, D, Omega) and coefficients in arcsec:
// dpsi = (A + A' t) sin(arg), deps = (B + B' t) cos(arg).
const NUTATION_TERMS: ReadonlyArray<readonly number[]> = [
  [0, 0, 0, 0, 1, -17.2064161, -0.0174666, 9.2052331, 0.0009086],
  [0, 0, 2, -2, 2, -1.3170906, -0.0001675, 0.5730336, -0.0003015],
  [0, 0, 2, 0, 2, -0.2276413, -0.0000234, 0.0978459, -0.0000485],
  [0, 0, 0, 0, 2, 0.2074554, 0.0000207, -0.0897492, 0.0000470],
  [0, 1, 0, 0, 0, 0.1475877, -0.0003633, 0.0073871, -0.0000184],
  [0, 1, 2, -2, 2, -0.0516821, 0.0001226, 0.0224386, -0.0000677],
  [1, 0, 0, 0, 0, 0.0711159, 0.0000073, -0.0006750, 0],
  [0, 0, 2, 0, 1, -0.0387298, -0.0000367, 0.0200728, 0.0000018],
  [1, 0, 2, 0, 2, -0.0301461, -0.0000036, 0.0129025, -0.0000063],
  [0, -1, 2, -2, 2, 0.0215829, -0.0000494, -0.0095929, 0.0000299],
];

/**
 * Nutation in longitude and obliquity, radians, at a TT Julian Date: the ten leading terms of
 * the IAU 2000 series (see the module comment). Accuracy about 0.05 arcsec in each angle.
 */
export function nutationAnglesRad(jdTt: number): { dpsiRad: number; depsRad: number } {
  const t = centuriesTt(jdTt);
  // Delaunay arguments, arcsec (Simon et al. 1994, as in IERS Conventions 2003 eq. 5.43).
  const l = ((485868.249036 + 1717915923.2178 * t + 31.8792 * t * t) % ARCSEC_PER_TURN) * RAD_PER_ARCSEC;
  const lp = ((1287104.79305 + 129596581.0481 * t - 0.5532 * t * t) % ARCSEC_PER_TURN) * RAD_PER_ARCSEC;
  const f = ((335779.526232 + 1739527262.8478 * t - 12.7512 * t * t) % ARCSEC_PER_TURN) * RAD_PER_ARCSEC;
  const d = ((1072260.70369 + 1602961601.2090 * t - 6.3706 * t * t) % ARCSEC_PER_TURN) * RAD_PER_ARCSEC;
  const om = ((450160.398036 - 6962890.5431 * t + 7.4722 * t * t) % ARCSEC_PER_TURN) * RAD_PER_ARCSEC;
  let dpsi = 0, deps = 0;
  for (const c of NUTATION_TERMS) {
    const arg = (c[0] * l + c[1] * lp + c[2] * f + c[3] * d + c[4] * om) % TWO_PI;
    dpsi += (c[5] + c[6] * t) * Math.sin(arg);
    deps += (c[7] + c[8] * t) * Math.cos(arg);
  }
  return { dpsiRad: dpsi * RAD_PER_ARCSEC, depsRad: deps * RAD_PER_ARCSEC };
}

/** Fukushima-Williams precession angles (gamma_bar, phi_bar, psi_bar) in radians, IAU 2006 (SOFA pfw06). */
function fukushimaWilliamsRad(t: number): { gamb: number; phib: number; psib: number } {
  const gamb = (-0.052928 + (10.556378 + (0.4932044 + (-0.00031238 + (-0.000002788 + 0.0000000260 * t) * t) * t) * t) * t);
  const phib = (84381.412819 + (-46.811016 + (0.0511268 + (0.00053289 + (-0.000000440 - 0.0000000176 * t) * t) * t) * t) * t);
  const psib = (-0.041775 + (5038.481484 + (1.5584175 + (-0.00018522 + (-0.000026452 - 0.0000000148 * t) * t) * t) * t) * t);
  return { gamb: gamb * RAD_PER_ARCSEC, phib: phib * RAD_PER_ARCSEC, psib: psib * RAD_PER_ARCSEC };
}

/** R = Rx(-eps) Rz(-psi) Rx(phi) Rz(gam) with frame-rotation matrices (SOFA fw2m convention). */
function fw2m(gam: number, phi: number, psi: number, eps: number): Float64Array {
  let r = rotZ(gam, IDENTITY);
  r = rotX(phi, r);
  r = rotZ(-psi, r);
  return rotX(-eps, r);
}

const IDENTITY = Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1);

/** Rz(a) . r where Rz(a) = [[c, s, 0], [-s, c, 0], [0, 0, 1]] (rotation of the frame by a). */
function rotZ(a: number, r: Float64Array): Float64Array {
  const c = Math.cos(a), s = Math.sin(a);
  const o = new Float64Array(9);
  for (let j = 0; j < 3; j++) {
    o[j] = c * r[j] + s * r[3 + j];
    o[3 + j] = -s * r[j] + c * r[3 + j];
    o[6 + j] = r[6 + j];
  }
  return o;
}

/** Rx(a) . r where Rx(a) = [[1, 0, 0], [0, c, s], [0, -s, c]]. */
function rotX(a: number, r: Float64Array): Float64Array {
  const c = Math.cos(a), s = Math.sin(a);
  const o = new Float64Array(9);
  for (let j = 0; j < 3; j++) {
    o[j] = r[j];
    o[3 + j] = c * r[3 + j] + s * r[6 + j];
    o[6 + j] = -s * r[3 + j] + c * r[6 + j];
  }
  return o;
}

/**
 * Frame bias and IAU 2006 precession, ICRS -> mean equator and equinox of date, at a TT
 * Julian Date. Row-major Float64Array(9). Inverse: its transpose.
 */
export function biasPrecessionMatrix(jdTt: number): Float64Array {
  const t = centuriesTt(jdTt);
  const { gamb, phib, psib } = fukushimaWilliamsRad(t);
  return fw2m(gamb, phib, psib, meanObliquityRad(jdTt));
}

/**
 * Frame bias + IAU 2006 precession + truncated IAU 2000 nutation: ICRS (GCRS) -> true equator
 * and equinox of date, at a TT Julian Date. Row-major Float64Array(9); v_date = M . v_icrs.
 * Accuracy better than 0.1 arcsec against the full model (the dropped nutation terms).
 * Inverse: trueOfDateToIcrsMatrix (the transpose).
 */
export function precessionNutationMatrix(jdTt: number): Float64Array {
  const t = centuriesTt(jdTt);
  const { gamb, phib, psib } = fukushimaWilliamsRad(t);
  const { dpsiRad, depsRad } = nutationAnglesRad(jdTt);
  return fw2m(gamb, phib, psib + dpsiRad, meanObliquityRad(jdTt) + depsRad);
}

/** True equator and equinox of date -> ICRS: the transpose of precessionNutationMatrix(jdTt). */
export function trueOfDateToIcrsMatrix(jdTt: number): Float64Array {
  const m = precessionNutationMatrix(jdTt);
  return Float64Array.of(m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]);
}

/**
 * Equation of the equinoxes in radians, dpsi cos(eps_A) (the complementary terms, < 3 mas,
 * are neglected). GAST = GMST + this.
 */
export function equationOfEquinoxesRad(jdTt: number): number {
  return nutationAnglesRad(jdTt).dpsiRad * Math.cos(meanObliquityRad(jdTt));
}

/**
 * Declination of date (true equator of date) in radians, [-pi/2, pi/2], of an ICRS unit vector
 * (x, y, z) at a TT Julian Date. For many directions at one epoch, compute the matrix once and
 * use declinationOfDateWithMatrixRad.
 */
export function declinationOfDateRad(x: number, y: number, z: number, jdTt: number): number {
  return declinationOfDateWithMatrixRad(x, y, z, precessionNutationMatrix(jdTt));
}

/** Declination of date in radians of an ICRS unit vector, given the epoch's precessionNutationMatrix. */
export function declinationOfDateWithMatrixRad(x: number, y: number, z: number, m: ArrayLike<number>): number {
  const zd = m[6] * x + m[7] * y + m[8] * z;
  const xd = m[0] * x + m[1] * y + m[2] * z;
  const yd = m[3] * x + m[4] * y + m[5] * z;
  return Math.atan2(zd, Math.sqrt(xd * xd + yd * yd));
}
