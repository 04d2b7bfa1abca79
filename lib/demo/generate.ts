import { equatorialToHorizontal, galacticToEquatorial, type Site } from "@/lib/sky/coordinates";
import { createRandom, type Random } from "@/lib/sky/random";

/**
 * Demo event lists for the invented "Quebrada Alta test array". Every parameter here is
 * INVENTED for the demo scenario; none describes a real detector or a real sky.
 *
 * Sky: isotropic background with a weak dipole (amplitude DIPOLE_AMPLITUDE towards
 * DIPOLE_RA/DEC), plus a cluster: CLUSTER_FRACTION of the events drawn from a Fisher
 * distribution of width CLUSTER_SIGMA_DEG around CLUSTER_RA/DEC. Detector: a shower from
 * a direction is recorded at a uniformly drawn uptime instant with probability cos(zenith)
 * below the zenith cut (the projected area of a flat array), using the sky core's inverse
 * conversion (equatorial to local). Uptime: two years from DEMO_START with a few gaps
 * (maintenance weeks and a short daily dead time). Energies: a power law E^-3 above 3 EeV.
 */
export const DEMO_SITE: Site & { zenithMaxDeg: number } = { latitudeDeg: -31.4, longitudeDeg: -68.9, heightM: 1650, zenithMaxDeg: 60 };
export const DEMO_START_MS = Date.UTC(2023, 0, 1);
export const DEMO_SPAN_MS = 2 * 365.25 * 86_400_000;
/** Uptime gaps [start, end) in ms since DEMO_START: two maintenance stops and a power cut (invented). */
export const DEMO_GAPS_MS: [number, number][] = [
  [120 * 86_400_000, 134 * 86_400_000],
  [400 * 86_400_000, 407 * 86_400_000],
  [611.5 * 86_400_000, 613 * 86_400_000],
];
export const DIPOLE_AMPLITUDE = 0.06;
export const DIPOLE_RA_DEG = 100;
export const DIPOLE_DEC_DEG = -24;
/** Cluster centre, given in galactic coordinates l = 310, b = 20 (invented), converted to ICRS below. */
export const CLUSTER_L_DEG = 310;
export const CLUSTER_B_DEG = 20;
export const CLUSTER_SIGMA_DEG = 5;

export interface DemoOptions {
  n: number;
  seed: number;
  clusterFraction: number;
  /** Restrict event times to [fromMs, toMs) (Unix ms); default: the whole two years. */
  fromMs?: number;
  toMs?: number;
  idPrefix: string;
}

function inUptime(tMs: number): boolean {
  const s = tMs - DEMO_START_MS;
  for (const [a, b] of DEMO_GAPS_MS) if (s >= a && s < b) return false;
  // Daily dead time: 20 minutes of calibration from 11:00 UTC.
  const minuteOfDay = (tMs / 60_000) % 1440;
  return !(minuteOfDay >= 660 && minuteOfDay < 680);
}

function unitFromRaDec(raDeg: number, decDeg: number): [number, number, number] {
  const r = Math.PI / 180;
  return [Math.cos(decDeg * r) * Math.cos(raDeg * r), Math.cos(decDeg * r) * Math.sin(raDeg * r), Math.sin(decDeg * r)];
}

/** A direction from the Fisher distribution of concentration kappa around mu (Wood 1994 for the 2-sphere). */
function fisherAround(rng: Random, mu: [number, number, number], kappa: number): [number, number, number] {
  const u = rng.next();
  const w = 1 + Math.log(u + (1 - u) * Math.exp(-2 * kappa)) / kappa;
  const phi = 2 * Math.PI * rng.next();
  const s = Math.sqrt(Math.max(0, 1 - w * w));
  // Orthonormal basis around mu.
  const a: [number, number, number] = Math.abs(mu[2]) < 0.9 ? [0, 0, 1] : [1, 0, 0];
  const e1 = normalise(cross(a, mu));
  const e2 = cross(mu, e1);
  return [w * mu[0] + s * (Math.cos(phi) * e1[0] + Math.sin(phi) * e2[0]), w * mu[1] + s * (Math.cos(phi) * e1[1] + Math.sin(phi) * e2[1]), w * mu[2] + s * (Math.cos(phi) * e1[2] + Math.sin(phi) * e2[2])];
}

const cross = (a: number[], b: number[]): [number, number, number] => [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
const normalise = (v: [number, number, number]): [number, number, number] => {
  const n = Math.hypot(v[0], v[1], v[2]);
  return [v[0] / n, v[1] / n, v[2] / n];
};

/** Generates a demo batch as canonical CSV text (id,time,zenith,azimuth,energy). Deterministic for a seed. */
export function generateDemoCsv(options: DemoOptions): string {
  const rng = createRandom(options.seed);
  const from = options.fromMs ?? DEMO_START_MS;
  const to = options.toMs ?? DEMO_START_MS + DEMO_SPAN_MS;
  const cluster = galacticToEquatorial([CLUSTER_L_DEG], [CLUSTER_B_DEG]);
  const clusterVec = unitFromRaDec(cluster.raDeg[0]!, cluster.decDeg[0]!);
  const kappa = 1 / (CLUSTER_SIGMA_DEG * (Math.PI / 180)) ** 2;
  const dip = unitFromRaDec(DIPOLE_RA_DEG, DIPOLE_DEC_DEG);
  const cutCos = Math.cos((DEMO_SITE.zenithMaxDeg * Math.PI) / 180);
  const lines: string[] = ["id,time,zenith,azimuth,energy"];
  let accepted = 0;
  const BATCH = 20_000;
  while (accepted < options.n) {
    const ra = new Float64Array(BATCH), dec = new Float64Array(BATCH), t = new Float64Array(BATCH);
    for (let i = 0; i < BATCH; i++) {
      let v: [number, number, number];
      if (rng.next() < options.clusterFraction) v = fisherAround(rng, clusterVec, kappa);
      else {
        // Isotropic with a dipole: accept-reject on (1 + d cos angle) / (1 + d).
        do {
          const z = 2 * rng.next() - 1, p = 2 * Math.PI * rng.next(), s = Math.sqrt(1 - z * z);
          v = [s * Math.cos(p), s * Math.sin(p), z];
        } while (rng.next() * (1 + DIPOLE_AMPLITUDE) > 1 + DIPOLE_AMPLITUDE * (v[0] * dip[0] + v[1] * dip[1] + v[2] * dip[2]));
      }
      ra[i] = ((Math.atan2(v[1], v[0]) * 180) / Math.PI + 360) % 360;
      dec[i] = (Math.asin(Math.max(-1, Math.min(1, v[2]))) * 180) / Math.PI;
      let tm: number;
      do tm = from + rng.next() * (to - from); while (!inUptime(tm));
      t[i] = Math.round(tm);
    }
    const local = equatorialToHorizontal({ raDeg: ra, decDeg: dec, unixMs: t }, DEMO_SITE);
    for (let i = 0; i < BATCH && accepted < options.n; i++) {
      const cz = Math.cos((local.zenithDeg[i]! * Math.PI) / 180);
      if (cz <= cutCos || rng.next() >= cz) continue;
      // E^-3 above 3 EeV: inverse CDF E = 3 u^(-1/2).
      const energy = 3 * Math.pow(1 - rng.next(), -0.5);
      accepted++;
      lines.push(`${options.idPrefix}${String(accepted).padStart(6, "0")},${new Date(t[i]!).toISOString()},${local.zenithDeg[i]!.toFixed(4)},${local.azimuthDeg[i]!.toFixed(4)},${energy.toFixed(3)}`);
    }
  }
  // Chronological order, as a reconstruction would write them.
  const body = lines.slice(1).sort((a, b) => (a.split(",")[1]! < b.split(",")[1]! ? -1 : 1));
  return `${lines[0]}\n${body.join("\n")}\n`;
}

/** The demo's first dataset (two years) and the later batch that strengthens the cluster. */
export function demoBatches(): { main: string; later: string } {
  const end = DEMO_START_MS + DEMO_SPAN_MS;
  return {
    main: generateDemoCsv({ n: 40_000, seed: 20260101, clusterFraction: 0.004, idPrefix: "QA-" }),
    later: generateDemoCsv({ n: 4_000, seed: 20260202, clusterFraction: 0.03, fromMs: end, toMs: end + 60 * 86_400_000, idPrefix: "QB-" }),
  };
}
