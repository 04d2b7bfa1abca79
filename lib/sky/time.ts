/**
 * Time scales for arrival times: parsing (ISO 8601 UTC, Unix seconds, GPS seconds) into
 * Unix milliseconds (POSIX, UTC, leap seconds not counted), Julian Dates, TT, and the Earth's
 * rotation (IAU 2000 Earth rotation angle, IAU 2006 Greenwich mean sidereal time).
 *
 * Leap seconds: a table of TAI - UTC steps (IERS Bulletin C; transcribed from memory, last
 * step 2017-01-01 to 37 s). POSIX time has no representation for an inserted leap second
 * 23:59:60; Siderea maps any instant inside it (ISO "...T23:59:60.xxx" on a day that has one,
 * or a GPS time that falls inside it) to the first instant of the next day, 00:00:00.000.
 * A ":60" second on a day without a leap second is invalid (NaN).
 */
import {
  DAYS_PER_JULIAN_CENTURY, GPS_EPOCH_UNIX_S, JD_J2000, JD_UNIX_EPOCH, MS_PER_DAY, RAD_PER_ARCSEC,
  TAI_MINUS_GPS_S, TT_MINUS_TAI_S, TWO_PI, UNIX_MS_AT_JD_J2000,
} from "./constants";

/** One step of TAI - UTC: from `unixS` (UTC midnight, Unix seconds) on, TAI - UTC = `taiMinusUtcS`. */
export interface LeapSecondStep {
  readonly date: string;
  readonly unixS: number;
  readonly taiMinusUtcS: number;
}

const LEAP_DATES: ReadonlyArray<readonly [string, number]> = [
  ["1972-01-01", 10], ["1972-07-01", 11], ["1973-01-01", 12], ["1974-01-01", 13], ["1975-01-01", 14],
  ["1976-01-01", 15], ["1977-01-01", 16], ["1978-01-01", 17], ["1979-01-01", 18], ["1980-01-01", 19],
  ["1981-07-01", 20], ["1982-07-01", 21], ["1983-07-01", 22], ["1985-07-01", 23], ["1988-01-01", 24],
  ["1990-01-01", 25], ["1991-01-01", 26], ["1992-07-01", 27], ["1993-07-01", 28], ["1994-07-01", 29],
  ["1996-01-01", 30], ["1997-07-01", 31], ["1999-01-01", 32], ["2006-01-01", 33], ["2009-01-01", 34],
  ["2012-07-01", 35], ["2015-07-01", 36], ["2017-01-01", 37],
];

/**
 * TAI - UTC steps since 1972 (IERS Bulletin C, from memory). Before 1972-01-01 UTC used
 * "rubber" seconds; Siderea does not model them and uses 10 s there.
 */
export const LEAP_SECOND_TABLE: ReadonlyArray<LeapSecondStep> = LEAP_DATES.map(([date, taiMinusUtcS]) => ({
  date, taiMinusUtcS, unixS: Date.UTC(+date.slice(0, 4), +date.slice(5, 7) - 1, 1) / 1000,
}));

const LEAP_UNIX_S = Float64Array.from(LEAP_SECOND_TABLE, (s) => s.unixS);
const LEAP_TAI_S = Float64Array.from(LEAP_SECOND_TABLE, (s) => s.taiMinusUtcS);

/** TAI - UTC in seconds at a UTC instant given in Unix milliseconds (10 s before 1972). */
export function taiMinusUtcS(unixMs: number): number {
  const s = unixMs / 1000;
  for (let k = LEAP_UNIX_S.length - 1; k >= 0; k--) if (s >= LEAP_UNIX_S[k]) return LEAP_TAI_S[k];
  return LEAP_TAI_S[0];
}

/** GPS - UTC in seconds at a UTC instant (Unix ms): TAI - UTC - 19 s; 18 s since 2017-01-01. */
export function gpsMinusUtcS(unixMs: number): number {
  return taiMinusUtcS(unixMs) - TAI_MINUS_GPS_S;
}

/** TT - UTC in seconds at a UTC instant (Unix ms): TAI - UTC + 32.184 s. */
export function ttMinusUtcS(unixMs: number): number {
  return taiMinusUtcS(unixMs) + TT_MINUS_TAI_S;
}

/**
 * GPS seconds (SI seconds elapsed since 1980-01-06T00:00:00 UTC, leap seconds counted)
 * -> Unix milliseconds (UTC). An instant inside an inserted leap second maps to the next
 * UTC midnight (see the module comment). Valid from 1972 on.
 */
export function unixMsFromGpsSeconds(gpsS: number): number {
  if (!Number.isFinite(gpsS)) return NaN;
  for (let k = LEAP_UNIX_S.length - 1; k >= 0; k--) {
    const offS = LEAP_TAI_S[k] - TAI_MINUS_GPS_S;
    const gpsAtStepS = LEAP_UNIX_S[k] - GPS_EPOCH_UNIX_S + offS;
    if (gpsS >= gpsAtStepS) return (gpsS + GPS_EPOCH_UNIX_S - offS) * 1000;
    if (k > 0) {
      const inserted = LEAP_TAI_S[k] - LEAP_TAI_S[k - 1];
      if (gpsS >= gpsAtStepS - inserted) return LEAP_UNIX_S[k] * 1000;
    }
  }
  return (gpsS + GPS_EPOCH_UNIX_S - (LEAP_TAI_S[0] - TAI_MINUS_GPS_S)) * 1000;
}

/** Unix milliseconds (UTC) -> GPS seconds. Inverse of unixMsFromGpsSeconds outside leap seconds. */
export function gpsSecondsFromUnixMs(unixMs: number): number {
  return unixMs / 1000 - GPS_EPOCH_UNIX_S + gpsMinusUtcS(unixMs);
}

/** True when an inserted leap second ends at the Unix second `unixS` (a UTC midnight). */
function leapSecondEndsAt(unixS: number): boolean {
  for (let k = 1; k < LEAP_UNIX_S.length; k++) if (LEAP_UNIX_S[k] === unixS) return LEAP_TAI_S[k] > LEAP_TAI_S[k - 1];
  return false;
}

const DIGIT0 = 48;

function digits(s: string, i: number, n: number): number {
  let v = 0;
  for (let k = 0; k < n; k++) {
    const d = s.charCodeAt(i + k) - DIGIT0;
    if (d < 0 || d > 9) return -1;
    v = v * 10 + d;
  }
  return v;
}

/** Days from 1970-01-01 of a proleptic Gregorian date (Hinnant's days_from_civil). */
function daysFromCivil(y: number, m: number, d: number): number {
  y -= m <= 2 ? 1 : 0;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

const DAYS_IN_MONTH = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/**
 * Parses an ISO 8601 UTC timestamp in s[start, end) to Unix milliseconds; NaN when invalid.
 * Accepted: YYYY-MM-DD, then optionally "T" or " " and HH:MM[:SS[.fraction]], then optionally
 * "Z" or a +HH[:MM] / -HH[:MM] offset. Without a zone the time is read as UTC. Surrounding
 * blanks are ignored. Fractions below 1 ms are kept (the result is fractional). A second of 60
 * is accepted only where a leap second was inserted, and maps to the next midnight.
 */
export function parseIsoUtcRange(s: string, start: number, end: number): number {
  if (end - start === 24) {
    const fast = parseIsoCanonicalMs(s, start);
    if (fast === fast) return fast;
  }
  while (start < end && s.charCodeAt(start) <= 32) start++;
  while (end > start && s.charCodeAt(end - 1) <= 32) end--;
  if (end - start < 10) return NaN;
  const y = digits(s, start, 4), mo = digits(s, start + 5, 2), d = digits(s, start + 8, 2);
  if (y < 0 || mo < 1 || mo > 12 || d < 1 || s.charCodeAt(start + 4) !== 45 || s.charCodeAt(start + 7) !== 45) return NaN;
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  if (d > DAYS_IN_MONTH[mo - 1] || (mo === 2 && d === 29 && !leap)) return NaN;
  let i = start + 10;
  let h = 0, mi = 0, sec = 0, fracMs = 0;
  if (i < end) {
    const sep = s.charCodeAt(i);
    if (sep !== 84 && sep !== 116 && sep !== 32) return NaN; // T, t, space
    i++;
    if (end - i < 5) return NaN;
    h = digits(s, i, 2); mi = digits(s, i + 3, 2);
    if (h < 0 || h > 23 || mi < 0 || mi > 59 || s.charCodeAt(i + 2) !== 58) return NaN;
    i += 5;
    if (i < end && s.charCodeAt(i) === 58) {
      sec = digits(s, i + 1, 2);
      if (sec < 0 || sec > 60) return NaN;
      i += 3;
      if (i < end && (s.charCodeAt(i) === 46 || s.charCodeAt(i) === 44)) {
        i++;
        let scale = 100, nd = 0;
        while (i < end) {
          const c = s.charCodeAt(i) - DIGIT0;
          if (c < 0 || c > 9) break;
          fracMs += c * scale; scale /= 10; nd++; i++;
        }
        if (nd === 0) return NaN;
      }
    }
  }
  let offsetMin = 0;
  if (i < end) {
    const c = s.charCodeAt(i);
    if ((c === 90 || c === 122) && i + 1 === end) { i++; } // Z
    else if (c === 43 || c === 45) {
      const oh = digits(s, i + 1, 2);
      if (oh < 0 || oh > 23) return NaN;
      let om = 0;
      let j = i + 3;
      if (j < end) {
        if (s.charCodeAt(j) === 58) j++;
        om = digits(s, j, 2);
        if (om < 0 || om > 59 || j + 2 !== end) return NaN;
      } else if (j !== end) return NaN;
      offsetMin = (c === 45 ? -1 : 1) * (oh * 60 + om);
      i = end;
    } else return NaN;
  }
  if (i !== end) return NaN;
  const minuteUnixS = daysFromCivil(y, mo, d) * 86400 + h * 3600 + mi * 60 - offsetMin * 60;
  if (sec === 60) {
    return leapSecondEndsAt(minuteUnixS + 60) ? (minuteUnixS + 60) * 1000 : NaN;
  }
  return (minuteUnixS + sec) * 1000 + fracMs;
}

/**
 * Fast path for the canonical form YYYY-MM-DDTHH:MM:SS.sssZ (24 characters) at s[i]; NaN when the
 * text is not exactly that form or has a second of 60 (then the general parser decides).
 */
function parseIsoCanonicalMs(s: string, i: number): number {
  if (s.charCodeAt(i + 4) !== 45 || s.charCodeAt(i + 7) !== 45 || s.charCodeAt(i + 10) !== 84 || s.charCodeAt(i + 13) !== 58 ||
    s.charCodeAt(i + 16) !== 58 || s.charCodeAt(i + 19) !== 46 || s.charCodeAt(i + 23) !== 90) return NaN;
  const d0 = s.charCodeAt(i) - 48, d1 = s.charCodeAt(i + 1) - 48, d2 = s.charCodeAt(i + 2) - 48, d3 = s.charCodeAt(i + 3) - 48;
  const m0 = s.charCodeAt(i + 5) - 48, m1 = s.charCodeAt(i + 6) - 48, a0 = s.charCodeAt(i + 8) - 48, a1 = s.charCodeAt(i + 9) - 48;
  const h0 = s.charCodeAt(i + 11) - 48, h1 = s.charCodeAt(i + 12) - 48, n0 = s.charCodeAt(i + 14) - 48, n1 = s.charCodeAt(i + 15) - 48;
  const s0 = s.charCodeAt(i + 17) - 48, s1 = s.charCodeAt(i + 18) - 48;
  const f0 = s.charCodeAt(i + 20) - 48, f1 = s.charCodeAt(i + 21) - 48, f2 = s.charCodeAt(i + 22) - 48;
  if (((d0 | d1 | d2 | d3 | m0 | m1 | a0 | a1 | h0 | h1 | n0 | n1 | s0 | s1 | f0 | f1 | f2) >>> 0) > 9) {
    // some value was not a digit (negative or > 9 with high bits); recheck one by one
    for (const v of [d0, d1, d2, d3, m0, m1, a0, a1, h0, h1, n0, n1, s0, s1, f0, f1, f2]) if (v < 0 || v > 9) return NaN;
  }
  const y = d0 * 1000 + d1 * 100 + d2 * 10 + d3, mo = m0 * 10 + m1, d = a0 * 10 + a1;
  const h = h0 * 10 + h1, mi = n0 * 10 + n1, sec = s0 * 10 + s1;
  if (mo < 1 || mo > 12 || d < 1 || h > 23 || mi > 59 || sec > 59) return NaN;
  if (d > DAYS_IN_MONTH[mo - 1]) return NaN;
  if (mo === 2 && d === 29 && !((y % 4 === 0 && y % 100 !== 0) || y % 400 === 0)) return NaN;
  return (daysFromCivil(y, mo, d) * 86400 + h * 3600 + mi * 60 + sec) * 1000 + f0 * 100 + f1 * 10 + f2;
}

/** Parses an ISO 8601 UTC timestamp string to Unix milliseconds; NaN when invalid. See parseIsoUtcRange. */
export function parseIsoUtc(text: string): number {
  return parseIsoUtcRange(text, 0, text.length);
}

/** Formats Unix milliseconds as ISO 8601 UTC with milliseconds ("2025-03-01T12:34:56.789Z"). */
export function formatIsoUtc(unixMs: number): string {
  return new Date(Math.round(unixMs)).toISOString();
}

/** Time formats of an event table's time column (METHODS section 1). */
export type TimeFormat = "iso" | "unix" | "gps";

/**
 * Parses one time value of the given format to Unix milliseconds (UTC); NaN when invalid.
 * "unix": Unix seconds (may be fractional); "gps": GPS seconds; "iso": ISO 8601.
 */
export function parseTimeToUnixMs(text: string, format: TimeFormat): number {
  if (format === "iso") return parseIsoUtc(text);
  const t = text.trim();
  if (t === "") return NaN;
  const v = Number(t);
  if (!Number.isFinite(v)) return NaN;
  return format === "unix" ? v * 1000 : unixMsFromGpsSeconds(v);
}

/** Julian Date on the UTC scale of a Unix-ms instant (JD 2440587.5 at the Unix epoch). */
export function jdUtcFromUnixMs(unixMs: number): number {
  return JD_UNIX_EPOCH + unixMs / MS_PER_DAY;
}

/** Unix milliseconds of a Julian Date read on the UTC scale. */
export function unixMsFromJdUtc(jdUtc: number): number {
  return (jdUtc - JD_UNIX_EPOCH) * MS_PER_DAY;
}

/** Julian Date on the TT scale (TT = UTC + (TAI - UTC) + 32.184 s) of a Unix-ms UTC instant. */
export function jdTtFromUnixMs(unixMs: number): number {
  return JD_UNIX_EPOCH + (unixMs + ttMinusUtcS(unixMs) * 1000) / MS_PER_DAY;
}

/**
 * Earth rotation angle in radians, [0, 2 pi), IAU 2000 (Capitaine et al. 2000, A&A 355, 398):
 * ERA = 2 pi (0.7790572732640 + 1.00273781191135448 (JD_UT1 - 2451545.0)).
 * The fraction of the day is split off first, as in the IAU SOFA routine era00.
 */
export function earthRotationAngleRad(jdUt1: number): number {
  const t = jdUt1 - JD_J2000;
  const f = jdUt1 - Math.floor(jdUt1);
  return eraTurnsToRad(f + 0.7790572732640 + 0.00273781191135448 * t);
}

/**
 * Earth rotation angle in radians, [0, 2 pi), of a Unix-ms instant taken as UT1 (UT1 ~ UTC,
 * |UT1 - UTC| < 0.9 s, i.e. < 14 arcsec of rotation; METHODS section 2 accepts it). Same formula
 * as earthRotationAngleRad, with days counted from 2000-01-01T12:00 for full precision.
 */
export function earthRotationAngleRadFromUnixMs(unixMs: number): number {
  const d = (unixMs - UNIX_MS_AT_JD_J2000) / MS_PER_DAY;
  return eraTurnsToRad(d - Math.floor(d) + 0.7790572732640 + 0.00273781191135448 * d);
}

function eraTurnsToRad(turns: number): number {
  const f = turns - Math.floor(turns);
  return TWO_PI * f;
}

/**
 * Greenwich mean sidereal time in radians, [0, 2 pi), IAU 2006 (Capitaine et al. 2003, A&A
 * 412, 567, eq. 42): GMST = ERA(UT1) + 0.014506" + 4612.156534" t + 1.3915817" t^2
 * - 0.00000044" t^3 - 0.000029956" t^4 - 0.0000000368" t^5, t in Julian centuries of TT from J2000.
 */
export function greenwichMeanSiderealTimeRad(jdUt1: number, jdTt: number): number {
  return wrapTurn(earthRotationAngleRad(jdUt1) + gmstMinusEraRad(jdTt));
}

/** GMST - ERA in radians (the accumulated precession in right ascension), IAU 2006 eq. 42 polynomial. */
export function gmstMinusEraRad(jdTt: number): number {
  const t = (jdTt - JD_J2000) / DAYS_PER_JULIAN_CENTURY;
  return (0.014506 + (4612.156534 + (1.3915817 + (-0.00000044 + (-0.000029956 - 0.0000000368 * t) * t) * t) * t) * t) * RAD_PER_ARCSEC;
}

function wrapTurn(a: number): number {
  const r = a % TWO_PI;
  return r < 0 ? r + TWO_PI : r;
}
