/**
 * Numerical and astronomical constants shared by lib/sky, with their units in their names.
 * Pure module: no I/O, no state.
 */

/** Radians per degree, pi / 180 (exact definition of the degree). */
export const RAD_PER_DEG = Math.PI / 180;
/** Degrees per radian, 180 / pi. */
export const DEG_PER_RAD = 180 / Math.PI;
/** A full turn in radians, 2 pi. */
export const TWO_PI = 2 * Math.PI;
/** A quarter turn in radians, pi / 2. */
export const HALF_PI = Math.PI / 2;
/** Arcseconds per radian, 648000 / pi. */
export const ARCSEC_PER_RAD = 648000 / Math.PI;
/** Radians per arcsecond, pi / 648000. */
export const RAD_PER_ARCSEC = Math.PI / 648000;

/** Milliseconds per second. */
export const MS_PER_S = 1000;
/** Seconds per (86400 SI second) day. */
export const S_PER_DAY = 86400;
/** Milliseconds per day (86400 s). */
export const MS_PER_DAY = 86_400_000;
/** Days per Julian century (IAU definition). */
export const DAYS_PER_JULIAN_CENTURY = 36525;

/** Julian Date of the Unix epoch 1970-01-01T00:00:00 UTC. */
export const JD_UNIX_EPOCH = 2440587.5;
/** Julian Date of the standard epoch J2000.0 (2000-01-01T12:00:00 TT). */
export const JD_J2000 = 2451545.0;
/** Modified Julian Date offset: MJD = JD - 2400000.5. */
export const JD_MJD_OFFSET = 2400000.5;
/**
 * Unix milliseconds of 2000-01-01T12:00:00 UTC, i.e. JD 2451545.0 read on a UT scale
 * (used for Earth-rotation formulas written in JD_UT1 - 2451545.0).
 */
export const UNIX_MS_AT_JD_J2000 = 946_728_000_000;
/** TT - TAI in seconds, exact by definition (IAU 1991 resolution A4). */
export const TT_MINUS_TAI_S = 32.184;
/** Unix seconds of the GPS epoch 1980-01-06T00:00:00 UTC. */
export const GPS_EPOCH_UNIX_S = 315_964_800;
/** TAI - GPS in seconds, constant by construction of GPS time (TAI - UTC was 19 s at the GPS epoch). */
export const TAI_MINUS_GPS_S = 19;

/** arcsin clamped to [-1, 1] input so that rounding (|x| = 1 + 1e-16) gives +-pi/2, not NaN. Radians. */
export function asinClamped(x: number): number {
  return x >= 1 ? HALF_PI : x <= -1 ? -HALF_PI : Math.asin(x);
}

/** arccos clamped to [-1, 1] input so that rounding gives 0 or pi, not NaN. Radians in [0, pi]. */
export function acosClamped(x: number): number {
  return x >= 1 ? 0 : x <= -1 ? Math.PI : Math.acos(x);
}

/** Reduces an angle in radians to [0, 2 pi). */
export function wrapRad(angleRad: number): number {
  const r = angleRad % TWO_PI;
  return r < 0 ? (r + TWO_PI < TWO_PI ? r + TWO_PI : 0) : r + 0;
}

/** Reduces an angle in degrees to [0, 360). */
export function wrapDeg(angleDeg: number): number {
  const r = angleDeg % 360;
  return r < 0 ? (r + 360 < 360 ? r + 360 : 0) : r + 0;
}
