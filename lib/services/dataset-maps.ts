import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { HttpError, notFound } from "@/lib/http";
import { blindOffsetDeg } from "@/lib/datasets/blinding";
import { nestedToRingTable, nside2npix, vectorsToPixels } from "@/lib/sky/healpix";
import { lonLatDegToVectors } from "@/lib/sky/vectors";
import { EVENT_INDEX_NSIDE } from "./ingest";

export interface CountMap {
  nside: number;
  /** Counts per pixel in RING order, ICRS frame. */
  values: Float32Array;
  blinded: boolean;
  version: number;
}

/**
 * Event counts per HEALPix pixel (RING order, ICRS) at a coarse Nside. Unblinded datasets are
 * binned in PostgreSQL from the stored fine NESTED index (nested >> 2k, METHODS section 3);
 * blinded ones from the shifted directions, so the map shows the same blinded sky as the exports.
 */
export async function datasetCountMap(datasetId: number, nside: number, version?: number): Promise<CountMap> {
  const d = await getDb().models.Dataset.findByPk(datasetId, { attributes: ["id", "version", "blinded", "blindSeed", "unblindedAt"] });
  if (!d) throw notFound("dataset");
  const upTo = version ?? d.version;
  if (upTo < 1 || upTo > d.version) throw new HttpError(422, "validation_failed", `Version ${upTo} does not exist.`, [{ path: "version", message: "No such version." }]);
  const values = new Float32Array(nside2npix(nside));
  const blinded = d.blinded && !d.unblindedAt;
  if (!blinded) {
    const shift = 2 * Math.log2(EVENT_INDEX_NSIDE / nside);
    const rows = await getDb().sequelize.query<{ p: number; n: string }>(
      `SELECT ipix_nest_1024 >> ${shift} AS p, count(*) AS n FROM events WHERE dataset_id = :datasetId AND version <= :upTo GROUP BY 1`,
      { replacements: { datasetId, upTo }, type: QueryTypes.SELECT },
    );
    const toRing = nestedToRingTable(nside);
    for (const r of rows) values[toRing[r.p]!] = Number(r.n);
  } else {
    const rows = await getDb().sequelize.query<{ ra_deg: number; dec_deg: number }>(
      "SELECT ra_deg, dec_deg FROM events WHERE dataset_id = :datasetId AND version <= :upTo",
      { replacements: { datasetId, upTo }, type: QueryTypes.SELECT },
    );
    const offset = blindOffsetDeg(Number(d.blindSeed));
    const ra = Float64Array.from(rows, (r) => (r.ra_deg + offset) % 360);
    const dec = Float64Array.from(rows, (r) => r.dec_deg);
    const pix = vectorsToPixels(nside, "ring", lonLatDegToVectors(ra, dec));
    for (let i = 0; i < pix.length; i++) values[pix[i]!]! += 1;
  }
  return { nside, values, blinded, version: upTo };
}
