import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { forbidden, notFound } from "@/lib/http";
import { can } from "@/lib/auth/roles";
import { blindOffsetDeg, blindTimeShiftMs } from "@/lib/datasets/blinding";
import { compareWithAnalyticExposure, FINE_DEC_BINS, HOUR_BINS, type ObservedComparison } from "@/lib/coverage/observed";
import type { PublicUser } from "./users";

/** Observed against expected for one dataset (the dataset page's section). */
export interface ObservedAgainstExpected extends ObservedComparison {
  datasetId: number;
  blinded: boolean;
  latitudeDeg: number;
  zenithMaxDeg: number;
}

const fmod = (expr: string, m: number) => `((${expr}) - ${m} * floor((${expr}) / ${m}))`;
// Earth rotation angle in degrees (IAU 2000, Capitaine et al. 2000) from unix_ms, UT1 ~ UTC.
const eraDeg = (unixMs: string) => `(360.0 * (0.7790572732640 + 1.00273781191135448 * ((${unixMs}) / 86400000.0 + 2440587.5 - 2451545.0)))`;

async function histogram(datasetId: number, expr: string, lo: number, hi: number, n: number, zenithMaxDeg: number): Promise<number[]> {
  const rows = await getDb().sequelize.query<{ bucket: number; n: string }>(
    `SELECT least(greatest(width_bucket(${expr}, ${lo}, ${hi}, ${n}), 1), ${n}) AS bucket, count(*) AS n
       FROM events WHERE dataset_id = :datasetId AND zenith_deg <= :zenithMaxDeg GROUP BY 1`,
    { replacements: { datasetId, zenithMaxDeg }, type: QueryTypes.SELECT },
  );
  const counts = new Array<number>(n).fill(0);
  for (const r of rows) counts[r.bucket - 1] += Number(r.n);
  return counts;
}

/**
 * Compares a dataset's events inside its site's zenith cut with the analytic (Sommers)
 * expectation for the site's latitude and cut: declination (chi-square on 5 deg bins, and a
 * Kolmogorov-Smirnov test on 0.1 deg bins, D evaluated at bin edges, so slightly conservative),
 * right ascension against uniform (valid for uniform sidereal coverage), and the rate against
 * local sidereal time and UTC hour against flat. Blinded datasets are compared as shown
 * (right ascensions and times shifted by the blinding offset). Needs datasets:read.
 */
export async function observedAgainstExpected(user: PublicUser, datasetId: number): Promise<ObservedAgainstExpected | null> {
  if (!can(user.role, "datasets:read")) throw forbidden("the event data");
  const { models } = getDb();
  const d = await models.Dataset.findByPk(datasetId, { include: [{ model: models.Site, as: "site" }] });
  if (!d) throw notFound("dataset");
  const site = (d as typeof d & { site: InstanceType<typeof models.Site> }).site;
  const blinded = d.blinded && !d.unblindedAt;
  const offsetDeg = blinded ? blindOffsetDeg(Number(d.blindSeed)) : 0;
  const shiftMs = blinded ? blindTimeShiftMs(offsetDeg) : 0;
  const zenithMaxDeg = Math.min(90, site.zenithMaxDeg);
  const latitudeDeg = site.latitudeDeg;
  const lon = site.longitudeDeg;

  const decFine = await histogram(datasetId, "dec_deg", -90, 90, FINE_DEC_BINS, zenithMaxDeg);
  const shifted = `(unix_ms + ${shiftMs})`;
  const ra = await histogram(datasetId, fmod(`ra_deg + ${offsetDeg}`, 360), 0, 360, HOUR_BINS, zenithMaxDeg);
  const sidereal = await histogram(datasetId, `${fmod(`${eraDeg(shifted)} + ${lon}`, 360)} / 15.0`, 0, 24, HOUR_BINS, zenithMaxDeg);
  const solar = await histogram(datasetId, fmod(`${shifted} / 3600000.0`, 24), 0, 24, HOUR_BINS, zenithMaxDeg);
  const comparison = compareWithAnalyticExposure({ decFine, ra, sidereal, solar }, latitudeDeg, zenithMaxDeg);
  if (!comparison) return null;
  return { datasetId, blinded, latitudeDeg, zenithMaxDeg, ...comparison };
}
