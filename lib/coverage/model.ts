/**
 * A coverage configuration turned into numbers: the relative exposure curve, the covered band,
 * the sky fractions, absolute figures when an area and a live time are given, and the
 * visibility of directions. Pure (runs in the browser for the live planner and on the server
 * for the API); the numerics live in lib/sky.
 */
import { RAD_PER_DEG } from "@/lib/sky/constants";
import { coveredDeclinationBand, skyFractionCovered, totalExposureKm2SrYr } from "@/lib/sky/exposure";
import {
  createEfficiencyExposure, declinationExposureMap, directionVisibility, exposureSphereIntegralSr, skyFractionAboveExposure,
  tabulatedZenithEfficiency, type TabulatedExposure, type ZenithEfficiency,
} from "@/lib/sky/efficiency-exposure";
import type { HealpixMap } from "@/lib/sky/healpix";
import type { CoverageParameters, DirectionInput, EfficiencyInput } from "@/lib/validations/coverage";

/** The efficiency function of a configuration; undefined = full efficiency up to the cut (Sommers' closed form). */
export function efficiencyFunction(e: EfficiencyInput | undefined): ZenithEfficiency | undefined {
  if (!e || e.kind === "full") return undefined;
  return tabulatedZenithEfficiency(e.zenithDeg, e.efficiency);
}

/** The tabulated relative exposure (maximum 1) of a configuration. */
export function configurationExposure(p: Pick<CoverageParameters, "latitudeDeg" | "zenithMaxDeg" | "efficiency">): TabulatedExposure {
  // A table needs a numerical integral per declination: a 0.1 deg grid keeps the live planner fast.
  const eff = efficiencyFunction(p.efficiency);
  return createEfficiencyExposure(p.latitudeDeg * RAD_PER_DEG, p.zenithMaxDeg * RAD_PER_DEG, eff, eff ? 0.1 : 0.05);
}

export interface CoverageSummary {
  band: { decMinDeg: number; decMaxDeg: number };
  /** Fraction of the sky with non-zero exposure, (sin dec_max - sin dec_min) / 2. */
  skyFraction: number;
  /** Integral of the relative exposure over the sphere, sr. */
  relativeIntegralSr: number;
  /** Declination of the exposure maximum, degrees. */
  peakDecDeg: number;
  /** With an area and a live time: total exposure (km^2 sr yr) and the peak directional exposure (km^2 yr per sr). */
  absolute: { totalKm2SrYr: number; peakKm2Yr: number } | null;
}

/** The band, fractions and absolute figures of a configuration (exposure from configurationExposure). */
export function coverageSummary(p: CoverageParameters, exposure = configurationExposure(p)): CoverageSummary {
  const band = coveredDeclinationBand(p.latitudeDeg, p.zenithMaxDeg);
  const relativeIntegralSr = exposureSphereIntegralSr(exposure.relative);
  let peak = 0;
  for (let k = 0; k < exposure.table.length; k++) if (exposure.table[k] > exposure.table[peak]) peak = k;
  let absolute: CoverageSummary["absolute"] = null;
  if (p.areaKm2 && p.liveTimeYr) {
    // Absolute exposure per sr = (A T / pi) * unnormalised form (Sommers 2001); its maximum is
    // (A T / pi) * exposure.maximum. The total follows from the relative integral.
    const peakKm2Yr = (p.areaKm2 * p.liveTimeYr / Math.PI) * exposure.maximum;
    const totalKm2SrYr = p.efficiency.kind === "full" ? totalExposureKm2SrYr(p.zenithMaxDeg * RAD_PER_DEG, p.areaKm2, p.liveTimeYr) : peakKm2Yr * relativeIntegralSr;
    absolute = { totalKm2SrYr, peakKm2Yr };
  }
  return { band, skyFraction: skyFractionCovered(p.latitudeDeg, p.zenithMaxDeg), relativeIntegralSr, peakDecDeg: -90 + peak * exposure.stepDeg, absolute };
}

/** The relative exposure sampled every stepDeg from -90 to +90 deg (a last point at +90). */
export function coverageCurve(exposure: TabulatedExposure, stepDeg = 1): { decDeg: Float64Array; exposure: Float64Array } {
  const n = Math.floor(180 / stepDeg + 1e-9);
  const exact = Math.abs(n * stepDeg - 180) < 1e-9;
  const m = n + 1 + (exact ? 0 : 1);
  const decDeg = new Float64Array(m), out = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const d = k === m - 1 ? 90 : Math.round((-90 + k * stepDeg) * 1e9) / 1e9;
    decDeg[k] = d;
    out[k] = exposure.relative(d * RAD_PER_DEG);
  }
  return { decDeg, exposure: out };
}

/** The relative exposure map of a configuration, RING, in the given frame, as Float32 values. */
export function coverageMap(exposure: TabulatedExposure, nside: number, frame: "equatorial" | "galactic"): { nside: number; values: Float32Array; map: HealpixMap } {
  const map = declinationExposureMap(exposure.relative, { nside, order: "ring", frame });
  return { nside, values: Float32Array.from(map.data), map };
}

/** Fraction of the sky where the relative exposure is at least `threshold` (0, 1]. */
export function skyFractionAbove(exposure: TabulatedExposure, threshold: number): number {
  return skyFractionAboveExposure(exposure.relative, threshold);
}

export interface DirectionRow extends DirectionInput {
  /** Relative exposure at the direction (maximum 1). */
  relativeExposure: number;
  /** Smallest zenith angle reached in a sidereal day, degrees. */
  minZenithDeg: number;
  /** Hours per sidereal day inside the zenith cut. */
  hoursPerDay: number;
  /** With an area and a live time: directional exposure, km^2 yr per sr. */
  exposureKm2Yr: number | null;
}

/** The exposure-weighted visibility of each direction (ICRS degrees) for a configuration. */
export function directionTable(p: CoverageParameters, exposure: TabulatedExposure, directions: DirectionInput[]): DirectionRow[] {
  const sidereal_h = 23.9344696; // hours per sidereal day (IERS Conventions; from memory)
  return directions.map((d) => {
    const rel = exposure.relative(d.decDeg * RAD_PER_DEG);
    const vis = directionVisibility(d.decDeg, p.latitudeDeg, p.zenithMaxDeg);
    return {
      ...d,
      relativeExposure: rel,
      minZenithDeg: vis.minZenithDeg,
      hoursPerDay: vis.fractionOfDay * sidereal_h,
      exposureKm2Yr: p.areaKm2 && p.liveTimeYr ? (p.areaKm2 * p.liveTimeYr / Math.PI) * exposure.maximum * rel : null,
    };
  });
}
