import { createRandom } from "@/lib/sky/random";

/** Length of the sidereal day in SI seconds (IERS Conventions 2010, mean sidereal day 86164.0905 s). */
export const SIDEREAL_DAY_S = 86164.0905;

/**
 * Blinding of a dataset's right ascensions. While a dataset is blinded, every view and export
 * shows RA + offset (mod 360) with galactic coordinates recomputed from the shifted direction,
 * and arrival times shifted by the same fraction of a sidereal day, so that the local
 * coordinates and the shown times still convert to the shown (shifted) RA: nobody can undo the
 * shift by converting the exported local coordinates. The offset comes from a secret seed kept
 * in the database and never shown.
 */
export function blindOffsetDeg(seed: number): number {
  return createRandom(seed).next() * 360;
}

/** The time shift (ms) that moves local sidereal time by the blinding offset. */
export function blindTimeShiftMs(offsetDeg: number): number {
  return (offsetDeg / 360) * SIDEREAL_DAY_S * 1000;
}
