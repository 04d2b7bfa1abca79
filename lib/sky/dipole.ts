/**
 * Three-dimensional dipole from the first harmonic in right ascension and the north-south
 * asymmetry in local azimuth (Aublin & Parizot 2005, A&A 441, 407), for an array at one
 * latitude with uniform coverage in sidereal time.
 *
 * For a flux proportional to 1 + d . u:
 *  - the RA harmonic (rayleigh.ts) measures the equatorial component:
 *      d_perp = r_RA / <cos dec>,  RA of the dipole = RA phase;
 *  - averaged over sidereal time only d_z survives in local coordinates; the first
 *    harmonic in azimuth of the northward component, b = (2/N) sum cos(az_i) (azimuth
 *    north-clockwise, so cos az is the north component), gives
 *      d_z = b / (cos(lat) <sin theta> - b sin(lat) <cos theta>);
 *  - d = sqrt(d_perp^2 + d_z^2), dec of the dipole = atan(d_z / d_perp).
 *
 * Uncertainties by linear propagation of sigma_a = sigma_b = sqrt(2 / N) (Linsley 1975):
 * sigma(d_perp) = sqrt(2/N) / <cos dec>, sigma(d_z) = sqrt(2/N) / (cos(lat) <sin theta>),
 * sigma(RA) = sigma(d_perp) / d_perp (rad), and sigma(d), sigma(dec) from the two
 * components. Valid when the amplitude is well above its error; for a non-significant
 * amplitude the direction is not constrained, which these errors show by becoming large.
 */
import { rayleighAnalysis, type RayleighResult } from "./rayleigh";

/** Inputs: per-event equatorial and local coordinates (same length), site latitude. */
export interface DipoleInput {
  raRad: ArrayLike<number>;
  decRad: ArrayLike<number>;
  zenithDeg: ArrayLike<number>;
  /** North-clockwise local azimuth of arrival, degrees. */
  azimuthDeg: ArrayLike<number>;
  latitudeDeg: number;
  /** Optional weights for the RA harmonic (sidereal coverage). */
  weights?: ArrayLike<number>;
}

/** Reconstructed dipole. Angles in degrees. */
export interface DipoleResult {
  rayleigh: RayleighResult;
  /** Azimuthal north-south harmonic b = (2/N) sum cos(az). */
  azimuthHarmonic: number;
  dPerp: number;
  dZ: number;
  sigmaDPerp: number;
  sigmaDZ: number;
  amplitude: number;
  sigmaAmplitude: number;
  /** RA of the dipole, degrees in [0, 360). */
  raDeg: number;
  sigmaRaDeg: number;
  /** Declination of the dipole, degrees in [-90, 90]. */
  decDeg: number;
  sigmaDecDeg: number;
  meanCosDec: number;
  meanSinTheta: number;
  meanCosTheta: number;
}

/** Dipole reconstruction of Aublin & Parizot 2005 (see the module comment). */
export function reconstructDipole(input: DipoleInput): DipoleResult {
  const n = input.raRad.length;
  if (n === 0) throw new RangeError("no events");
  if (input.decRad.length !== n || input.zenithDeg.length !== n || input.azimuthDeg.length !== n) throw new RangeError("input arrays differ in length");
  const D = Math.PI / 180;
  const ray = rayleighAnalysis(input.raRad, input.weights);
  let sCosDec = 0, sSinT = 0, sCosT = 0, sCosAz = 0;
  for (let i = 0; i < n; i++) {
    sCosDec += Math.cos(input.decRad[i]);
    const th = input.zenithDeg[i] * D;
    sSinT += Math.sin(th);
    sCosT += Math.cos(th);
    sCosAz += Math.cos(input.azimuthDeg[i] * D);
  }
  const mCosDec = sCosDec / n, mSinT = sSinT / n, mCosT = sCosT / n;
  const b = (2 / n) * sCosAz;
  const lat = input.latitudeDeg * D;
  const dPerp = ray.amplitude / mCosDec;
  const dZ = b / (Math.cos(lat) * mSinT - b * Math.sin(lat) * mCosT);
  const sigma = Math.sqrt(2 / n);
  const sPerp = ray.sigma / mCosDec;
  const sZ = sigma / (Math.cos(lat) * mSinT);
  const d = Math.hypot(dPerp, dZ);
  const sD = d > 0 ? Math.sqrt((dPerp * sPerp) ** 2 + (dZ * sZ) ** 2) / d : Math.hypot(sPerp, sZ);
  const sDec = d > 0 ? Math.sqrt((dPerp * sZ) ** 2 + (dZ * sPerp) ** 2) / (d * d) : Math.PI;
  const sRa = dPerp > 0 ? Math.min(Math.PI, sPerp / dPerp) : Math.PI;
  return {
    rayleigh: ray, azimuthHarmonic: b, dPerp, dZ, sigmaDPerp: sPerp, sigmaDZ: sZ,
    amplitude: d, sigmaAmplitude: sD, raDeg: ray.phaseDeg, sigmaRaDeg: sRa / D,
    decDeg: Math.atan2(dZ, dPerp) / D, sigmaDecDeg: sDec / D,
    meanCosDec: mCosDec, meanSinTheta: mSinT, meanCosTheta: mCosT,
  };
}
