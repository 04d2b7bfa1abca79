/**
 * East-west differential method for the first harmonic in right ascension (Bonino et al.
 * 2011, ApJ 738, 67). Events arriving from the eastern half of the sky (local azimuth in
 * (0, 180) deg, north-clockwise) and from the western half (180, 360) deg are counted
 * against each other as a function of local sidereal time t:
 *
 *   a_EW = (2/N) sum_i cos(t_i + zeta_i),  b_EW = (2/N) sum_i sin(t_i + zeta_i),
 *   zeta_i = 0 for eastern, pi for western events,
 *
 * so direction-independent rate drifts (weather, uptime) cancel to first order.
 * r_EW = sqrt(a_EW^2 + b_EW^2), phase_EW = atan2(b_EW, a_EW), P(>= r_EW) = exp(-N r_EW^2 / 4).
 *
 * Conversion to the right-ascension harmonic: for an intensity 1 + r cos(ra - phi) the
 * east-west difference is a derivative in RA, which gives phi = phase_EW + pi/2 and
 * r = r_EW / <sin |H|>, H the hour angle of the events; with sin|H| ~ sin(theta)|sin(az)|/cos(dec)
 * and uniform azimuths this is the paper's r = pi <cos dec> / (2 <sin theta>) r_EW,
 * which is what we report (Bonino et al. 2011, section 2). Events exactly on the meridian
 * (azimuth 0 or 180 deg) belong to neither half and are skipped.
 */

/** East-west harmonic and its right-ascension equivalent. Angles in degrees. */
export interface EastWestResult {
  /** Events used (east + west). */
  n: number;
  nEast: number;
  nWest: number;
  aEW: number;
  bEW: number;
  amplitudeEW: number;
  /** Phase of the east-west harmonic, degrees in [0, 360). */
  phaseEWDeg: number;
  /** exp(-N r_EW^2 / 4). */
  p: number;
  /** Standard deviation of a_EW and b_EW, sqrt(2 / N). */
  sigmaEW: number;
  /** RA-harmonic amplitude r = pi <cos dec> / (2 <sin theta>) r_EW; null without zenith/declination input. */
  amplitudeRA: number | null;
  /** Its standard deviation (same factor times sigma_EW); null without zenith/declination input. */
  sigmaRA: number | null;
  /** RA-harmonic phase phase_EW + 90 deg, in [0, 360). */
  phaseRADeg: number;
  /** The conversion factor pi <cos dec> / (2 <sin theta>); null without zenith/declination input. */
  conversionFactor: number | null;
}

/**
 * East-west analysis. azimuthDeg: north-clockwise local azimuth of arrival (degrees);
 * localSiderealTimeRad: local (apparent or mean) sidereal time of each event, radians.
 * Optional zenithDeg and decRad (same length) give the conversion to the RA amplitude.
 */
export function eastWestAnalysis(
  azimuthDeg: ArrayLike<number>,
  localSiderealTimeRad: ArrayLike<number>,
  conversion?: { zenithDeg: ArrayLike<number>; decRad: ArrayLike<number> },
): EastWestResult {
  const n = azimuthDeg.length;
  if (localSiderealTimeRad.length !== n) throw new RangeError("azimuth and sidereal time arrays differ in length");
  let sc = 0, ss = 0, nE = 0, nW = 0, sumCosDec = 0, sumSinTheta = 0;
  const D = Math.PI / 180;
  for (let i = 0; i < n; i++) {
    let az = azimuthDeg[i] % 360;
    if (az < 0) az += 360;
    let sign: number;
    if (az > 0 && az < 180) { sign = 1; nE++; } else if (az > 180) { sign = -1; nW++; } else continue;
    const t = localSiderealTimeRad[i];
    sc += sign * Math.cos(t);
    ss += sign * Math.sin(t);
    if (conversion) { sumCosDec += Math.cos(conversion.decRad[i]); sumSinTheta += Math.sin(conversion.zenithDeg[i] * D); }
  }
  const used = nE + nW;
  if (used === 0) throw new RangeError("no event east or west of the meridian");
  const a = (2 / used) * sc, b = (2 / used) * ss;
  const r = Math.hypot(a, b);
  let phase = Math.atan2(b, a) / D;
  if (phase < 0) phase += 360;
  let phaseRA = phase + 90;
  if (phaseRA >= 360) phaseRA -= 360;
  const sigma = Math.sqrt(2 / used);
  const factor = conversion && sumSinTheta > 0 ? (Math.PI * sumCosDec) / (2 * sumSinTheta) : null;
  return {
    n: used, nEast: nE, nWest: nW, aEW: a, bEW: b, amplitudeEW: r, phaseEWDeg: phase,
    p: Math.exp((-used * r * r) / 4), sigmaEW: sigma,
    amplitudeRA: factor === null ? null : factor * r,
    sigmaRA: factor === null ? null : factor * sigma,
    phaseRADeg: phaseRA, conversionFactor: factor,
  };
}
