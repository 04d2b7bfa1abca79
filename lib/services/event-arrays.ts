import "server-only";
import { QueryTypes } from "sequelize";
import { getDb, withRawClient } from "@/lib/db";
import { copyOutRows } from "./copy-out";
import { notFound } from "@/lib/http";
import { CanonicalHasher } from "@/lib/datasets/canonical";
import { blindOffsetDeg, blindTimeShiftMs } from "@/lib/datasets/blinding";
import { copyUnescape } from "@/lib/datasets/copy-text";
import type { AnalysisEvents, AnalysisSite } from "@/lib/analyses/compute";

export interface LoadedDatasetEvents {
  events: AnalysisEvents;
  site: AnalysisSite;
  /** SHA-256 of the canonical table of the version, recomputed from the stored rows. */
  contentHash: string;
  blinded: boolean;
}

/**
 * Reads the events of a dataset version into typed arrays with COPY, recomputing the
 * version's canonical hash on the way (so a run proves which data it used). While the dataset
 * is blinded the arrays carry the blinded sky: RA shifted by the secret offset and times by
 * the same fraction of a sidereal day (lib/datasets/blinding.ts).
 */
export async function loadDatasetEvents(datasetId: number, version: number): Promise<LoadedDatasetEvents> {
  const { sequelize } = getDb();
  const [d] = await sequelize.query<{ blinded: boolean; blind_seed: string | null; unblinded_at: Date | null; latitude_deg: number; longitude_deg: number; height_m: number; n: string }>(
    `SELECT d.blinded, d.blind_seed, d.unblinded_at, s.latitude_deg, s.longitude_deg, s.height_m,
            (SELECT event_count FROM dataset_versions v WHERE v.dataset_id = d.id AND v.version = :version) AS n
       FROM datasets d JOIN sites s ON s.id = d.site_id WHERE d.id = :datasetId`,
    { replacements: { datasetId, version }, type: QueryTypes.SELECT },
  );
  if (!d || d.n === null) throw notFound("dataset version");
  const n = Number(d.n);
  const events: AnalysisEvents = {
    n,
    unixMs: new Float64Array(n), zenithDeg: new Float64Array(n), azimuthDeg: new Float64Array(n),
    energyEeV: new Float64Array(n), raDeg: new Float64Array(n), decDeg: new Float64Array(n),
  };
  const hasher = new CanonicalHasher();
  let i = 0;
  await withRawClient(async (client) => {
    const query = `SELECT event_id, unix_ms, zenith_deg, azimuth_deg, energy_eev, ra_deg, dec_deg FROM events
                    WHERE dataset_id = ${Number(datasetId)} AND version <= ${Number(version)} ORDER BY seq`;
    for await (const rows of copyOutRows(client, query)) {
      for (const f of rows) {
        if (i >= n) throw new Error(`dataset ${datasetId} version ${version} has more events than its ${n}`);
        const t = Number(f[1]), z = Number(f[2]), a = Number(f[3]), e = f[4] === "\\N" ? NaN : Number(f[4]);
        hasher.add(copyUnescape(f[0]!), t, z, a, e);
        events.unixMs[i] = t; events.zenithDeg[i] = z; events.azimuthDeg[i] = a; events.energyEeV[i] = e;
        events.raDeg[i] = Number(f[5]); events.decDeg[i] = Number(f[6]);
        i++;
      }
    }
  });
  if (i !== n) throw new Error(`dataset ${datasetId} version ${version}: read ${i} events, expected ${n}`);
  const blinded = d.blinded && !d.unblinded_at;
  if (blinded) {
    const offset = blindOffsetDeg(Number(d.blind_seed));
    const shift = blindTimeShiftMs(offset);
    for (let k = 0; k < n; k++) {
      events.raDeg[k] = (events.raDeg[k]! + offset) % 360;
      events.unixMs[k] = events.unixMs[k]! + shift;
    }
  }
  return { events, site: { latitudeDeg: d.latitude_deg, longitudeDeg: d.longitude_deg, heightM: d.height_m }, contentHash: hasher.digest(), blinded };
}
