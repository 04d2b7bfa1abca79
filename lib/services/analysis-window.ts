import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { HttpError } from "@/lib/http";
import { blindOffsetDeg, blindTimeShiftMs } from "@/lib/datasets/blinding";
import { AnalysisSettingsSchema } from "@/lib/validations/analysis";
import { readableAnalysis } from "./analyses";
import type { PublicUser } from "./users";

/**
 * The events inside a window of an analysis (its dataset version, zenith cut, and the best
 * window's radius and energy threshold), summarised: count, energy and time ranges, and the ten
 * most energetic events. Positions and times are blinded when the analysis ran blinded.
 */
export async function windowEvents(user: PublicUser, id: number, raDeg: number, decDeg: number) {
  const a = await readableAnalysis(user, id);
  if (a.status !== "done" || !a.summary) throw new HttpError(409, "conflict", "The analysis has no result yet.");
  const settings = AnalysisSettingsSchema.parse(a.settings);
  const best = (a.summary as { best?: { radiusDeg: number; thresholdEeV: number | null } }).best;
  const radiusDeg = best?.radiusDeg ?? settings.radiiDeg[0]!;
  const threshold = best?.thresholdEeV ?? (settings.energyThresholdsEeV.length ? Math.min(...settings.energyThresholdsEeV) : null);
  const [d] = await getDb().sequelize.query<{ blinded: boolean; blind_seed: string | null; unblinded_at: Date | null }>(
    "SELECT blinded, blind_seed, unblinded_at FROM datasets WHERE id = :id",
    { replacements: { id: a.datasetId }, type: QueryTypes.SELECT },
  );
  // A blinded run saw RA + offset: look up the true sky at RA - offset, show it shifted.
  const blinded = Boolean((a.summary as { blinded?: boolean }).blinded) && Boolean(d?.blind_seed);
  const offset = blinded ? blindOffsetDeg(Number(d!.blind_seed)) : 0;
  const shiftMs = blinded ? blindTimeShiftMs(offset) : 0;
  const rows = await getDb().sequelize.query<{ event_id: string; unix_ms: number; energy_eev: number | null; ra_deg: number; dec_deg: number }>(
    `SELECT event_id, unix_ms, energy_eev, ra_deg, dec_deg FROM events
      WHERE dataset_id = :datasetId AND version <= :version AND zenith_deg <= :zmax
        AND (:threshold::double precision IS NULL OR energy_eev >= :threshold)
        AND sind(dec_deg) * sind(:dec) + cosd(dec_deg) * cosd(:dec) * cosd(ra_deg - :ra) >= cosd(:radius)`,
    {
      replacements: { datasetId: a.datasetId, version: a.datasetVersion, zmax: settings.zenithMaxDeg, threshold, dec: decDeg, ra: (((raDeg - offset) % 360) + 360) % 360, radius: radiusDeg },
      type: QueryTypes.SELECT,
    },
  );
  const energies = rows.map((r) => r.energy_eev).filter((e): e is number => e !== null).sort((x, y) => x - y);
  const times = rows.map((r) => r.unix_ms + shiftMs).sort((x, y) => x - y);
  const top = [...rows].sort((x, y) => (y.energy_eev ?? -1) - (x.energy_eev ?? -1)).slice(0, 10);
  return {
    window: { raDeg, decDeg, radiusDeg, thresholdEeV: threshold },
    blinded,
    count: rows.length,
    energyEeV: energies.length ? { min: energies[0], median: energies[Math.floor(energies.length / 2)], max: energies[energies.length - 1] } : null,
    time: times.length ? { first: new Date(times[0]!).toISOString(), last: new Date(times[times.length - 1]!).toISOString() } : null,
    mostEnergetic: top.map((r) => ({ id: r.event_id, time: new Date(r.unix_ms + shiftMs).toISOString(), energyEeV: r.energy_eev, raDeg: (r.ra_deg + offset) % 360, decDeg: r.dec_deg })),
  };
}
