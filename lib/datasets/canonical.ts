import { createHash, type Hash } from "node:crypto";

/**
 * The canonical event table, whose SHA-256 identifies a dataset version (METHODS section 7).
 * One line per event, in storage order, fields separated by commas, each number written in
 * JavaScript's shortest round-trip form (String(x)), which PostgreSQL's double precision
 * reproduces exactly on the way back:
 *
 *   id,unixMs,zenithDeg,azimuthDeg(north-clockwise),energyEeV(empty when unknown)\n
 *
 * The header line `id,unix_ms,zenith_deg,azimuth_nc_deg,energy_eev\n` comes first.
 */
export const CANONICAL_HEADER = "id,unix_ms,zenith_deg,azimuth_nc_deg,energy_eev\n";

export function canonicalLine(id: string, unixMs: number, zenithDeg: number, azimuthDeg: number, energyEeV: number): string {
  return `${id},${String(unixMs)},${String(zenithDeg)},${String(azimuthDeg)},${Number.isNaN(energyEeV) ? "" : String(energyEeV)}\n`;
}

/** Incremental hasher of a canonical table; feed rows in storage order. */
export class CanonicalHasher {
  private readonly hash: Hash = createHash("sha256").update(CANONICAL_HEADER);
  private buffer = "";
  count = 0;

  add(id: string, unixMs: number, zenithDeg: number, azimuthDeg: number, energyEeV: number): void {
    this.buffer += canonicalLine(id, unixMs, zenithDeg, azimuthDeg, energyEeV);
    this.count++;
    if (this.buffer.length > 1 << 16) {
      this.hash.update(this.buffer);
      this.buffer = "";
    }
  }

  digest(): string {
    this.hash.update(this.buffer);
    this.buffer = "";
    return this.hash.digest("hex");
  }
}
