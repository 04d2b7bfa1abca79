import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { getDb } from "@/lib/db";

/** Histograms of a dataset, computed in PostgreSQL after each version is stored. */
export interface DatasetSummary {
  eventCount: number;
  zenith: { edgesDeg: number[]; counts: number[] };
  azimuth: { edgesDeg: number[]; counts: number[] };
  declination: { edgesDeg: number[]; counts: number[] };
  /** Events per hour of local sidereal time, taken as Earth rotation angle + east longitude. */
  siderealHour: { counts: number[] };
  /** Events per hour of UTC solar time, to see uptime gaps. */
  solarHour: { counts: number[] };
  /** log10(E/EeV) bins; events without energy are counted apart. */
  energy: { log10EdgesEeV: number[]; counts: number[]; unknown: number };
  zenithMaxObservedDeg: number;
}

function edges(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n + 1 }, (_, i) => lo + ((hi - lo) * i) / n);
}

async function histogram(datasetId: number, expr: string, lo: number, hi: number, n: number, t?: Transaction, where = "true"): Promise<number[]> {
  const rows = await getDb().sequelize.query<{ bucket: number; n: string }>(
    `SELECT least(greatest(width_bucket(${expr}, ${lo}, ${hi}, ${n}), 1), ${n}) AS bucket, count(*) AS n
       FROM events WHERE dataset_id = :datasetId AND ${where} GROUP BY 1`,
    { replacements: { datasetId }, type: QueryTypes.SELECT, transaction: t },
  );
  const counts = new Array<number>(n).fill(0);
  for (const r of rows) counts[r.bucket - 1] += Number(r.n);
  return counts;
}

/** Floored modulo in SQL for double precision (PostgreSQL's mod() takes integers and numerics only). */
const fmod = (expr: string, m: number) => `((${expr}) - ${m} * floor((${expr}) / ${m}))`;

// Earth rotation angle in degrees (IAU 2000, Capitaine et al. 2000) from unix_ms, with UT1 ~ UTC.
const ERA_DEG = "(360.0 * (0.7790572732640 + 1.00273781191135448 * (unix_ms / 86400000.0 + 2440587.5 - 2451545.0)))";

export async function computeDatasetSummary(datasetId: number, t?: Transaction): Promise<DatasetSummary> {
  const { sequelize } = getDb();
  const [site] = await sequelize.query<{ longitude_deg: number }>(
    "SELECT s.longitude_deg FROM datasets d JOIN sites s ON s.id = d.site_id WHERE d.id = :datasetId",
    { replacements: { datasetId }, type: QueryTypes.SELECT, transaction: t },
  );
  const lon = Number(site?.longitude_deg ?? 0);
  const [stats] = await sequelize.query<{ n: string; zmax: number | null; emin: number | null; emax: number | null; unknown: string }>(
    `SELECT count(*) AS n, max(zenith_deg) AS zmax, min(energy_eev) FILTER (WHERE energy_eev > 0) AS emin,
            max(energy_eev) AS emax, count(*) FILTER (WHERE energy_eev IS NULL OR energy_eev <= 0) AS unknown
       FROM events WHERE dataset_id = :datasetId`,
    { replacements: { datasetId }, type: QueryTypes.SELECT, transaction: t },
  );
  const lo = stats?.emin ? Math.floor(Math.log10(stats.emin) * 10) / 10 : -1;
  const hi = stats?.emax ? Math.max(lo + 0.1, Math.ceil(Math.log10(stats.emax) * 10 + 1e-9) / 10) : 0;
  const nE = Math.max(1, Math.round((hi - lo) / 0.1));
  // One query at a time: they share the transaction's connection.
  const zenith = await histogram(datasetId, "zenith_deg", 0, 90, 45, t);
  const azimuth = await histogram(datasetId, "azimuth_deg", 0, 360, 36, t);
  const declination = await histogram(datasetId, "dec_deg", -90, 90, 36, t);
  const sidereal = await histogram(datasetId, `${fmod(`${ERA_DEG} + ${lon}`, 360)} / 15.0`, 0, 24, 24, t);
  const solar = await histogram(datasetId, fmod("unix_ms / 3600000.0", 24), 0, 24, 24, t);
  const energy = await histogram(datasetId, "log10(energy_eev)", lo, hi, nE, t, "energy_eev > 0");
  return {
    eventCount: Number(stats?.n ?? 0),
    zenith: { edgesDeg: edges(0, 90, 45), counts: zenith },
    azimuth: { edgesDeg: edges(0, 360, 36), counts: azimuth },
    declination: { edgesDeg: edges(-90, 90, 36), counts: declination },
    siderealHour: { counts: sidereal },
    solarHour: { counts: solar },
    energy: { log10EdgesEeV: edges(lo, hi, nE).map((x) => Math.round(x * 1000) / 1000), counts: energy, unknown: Number(stats?.unknown ?? 0) },
    zenithMaxObservedDeg: Number(stats?.zmax ?? 0),
  };
}
