/**
 * The computations of a saved analysis, from event arrays and settings to a summary and
 * HEALPix result maps. Shared by the job worker, reproductions and the command line, so the
 * same settings and events give the same numbers everywhere. Node only (trials use worker
 * threads); no database or framework.
 */
import { RAD_PER_DEG, DEG_PER_RAD } from "@/lib/sky/constants";
import { equatorialToGalactic, localApparentSiderealAngleRad } from "@/lib/sky/coordinates";
import { sommersBreakpointsDecRad } from "@/lib/sky/cap-exposure";
import { reconstructDipole } from "@/lib/sky/dipole";
import { eastWestAnalysis } from "@/lib/sky/east-west";
import { createSommersExposure, exposureEpochs, exposureMap } from "@/lib/sky/exposure";
import { vectorsToPixels } from "@/lib/sky/healpix";
import { tabulateZDensity } from "@/lib/sky/isotropic";
import { rayleighAnalysis, siderealCoverageWeights } from "@/lib/sky/rayleigh";
import { buildEventIndex, declinationWindowFractions, precessedWindowFractions, scanGeometry, scanWindows } from "@/lib/sky/scan";
import { timeScrambledDirections } from "@/lib/sky/scramble";
import { runTrials, oneSidedSigmaFromP, type TrialSkyModel } from "@/lib/sky/trials";
import type { AnalysisSettings } from "@/lib/validations/analysis";
import { configurationExposure } from "@/lib/coverage/model";
import { createPrecessedDeclinationExposure, declinationExposureMap, vectorExposureMap } from "@/lib/sky/efficiency-exposure";

/** Events of one dataset version, as stored (ICRS unit vectors from the ingestion). */
export interface AnalysisEvents {
  n: number;
  unixMs: Float64Array;
  zenithDeg: Float64Array;
  azimuthDeg: Float64Array;
  energyEeV: Float64Array;
  raDeg: Float64Array;
  decDeg: Float64Array;
}

export interface AnalysisSite {
  latitudeDeg: number;
  longitudeDeg: number;
  heightM: number;
}

export type MapLayer = "counts" | "expected" | "excess" | "significance" | "exposure";

export interface ComputeResult {
  summary: Record<string, unknown>;
  nside: number;
  maps: Partial<Record<MapLayer, Float32Array>>;
}

export interface ComputeOptions {
  onProgress?: (fraction: number, message: string) => void;
  signal?: AbortSignal;
  workers?: number;
}

/** The caution every result carries (and the UI repeats). */
export const RESULT_CAUTION =
  "Preliminary until reviewed under the collaboration's own rules. The local significance is the best of many overlapping windows; read it with the post-trial probability and the trials counted.";

/**
 * The declination exposure of an analysis: Sommers (2001) for the site's latitude and the
 * settings' cut, or, when the settings carry a coverage configuration, that configuration's
 * latitude, cut and zenith efficiency (lib/sky/efficiency-exposure.ts).
 */
function analysisExposure(site: AnalysisSite, s: AnalysisSettings) {
  if (!s.coverage) {
    const latRad = site.latitudeDeg * RAD_PER_DEG, zMaxRad = s.zenithMaxDeg * RAD_PER_DEG;
    return { latDeg: site.latitudeDeg, latRad, zMaxRad, omega: createSommersExposure(latRad, zMaxRad), fromConfiguration: false };
  }
  const c = s.coverage;
  const latRad = c.latitudeDeg * RAD_PER_DEG, zMaxRad = c.zenithMaxDeg * RAD_PER_DEG;
  // Full efficiency: Sommers' closed form itself (the same numbers as an analysis at that latitude).
  const omega = c.efficiency.kind === "full" ? createSommersExposure(latRad, zMaxRad) : configurationExposure(c).relative;
  return { latDeg: c.latitudeDeg, latRad, zMaxRad, omega, fromConfiguration: true };
}

/** The exposure map of an analysis (RING, ICRS, Float32): exposureMap for Sommers, else the configuration's. */
function analysisExposureMap(site: AnalysisSite, s: AnalysisSettings, nside: number, model: "sommers" | "sommers-precessed", epochs: ReturnType<typeof exposureEpochs>): Float32Array {
  if (!s.coverage) {
    return Float32Array.from(exposureMap({ nside, order: "ring", frame: "equatorial", latDeg: site.latitudeDeg, zenithMaxDeg: s.zenithMaxDeg, model, epochs }).data);
  }
  const { omega } = analysisExposure(site, s);
  if (model === "sommers") return Float32Array.from(declinationExposureMap(omega, { nside, order: "ring", frame: "equatorial" }).data);
  return Float32Array.from(vectorExposureMap(createPrecessedDeclinationExposure(omega, epochs), nside, "ring").data);
}

function selectEvents(events: AnalysisEvents, zenithMaxDeg: number, energyMinEeV: number | null) {
  const keep: number[] = [];
  for (let i = 0; i < events.n; i++) {
    if (!(events.zenithDeg[i]! <= zenithMaxDeg)) continue;
    if (energyMinEeV !== null && !(events.energyEeV[i]! >= energyMinEeV)) continue;
    keep.push(i);
  }
  const n = keep.length;
  const out = {
    n,
    unixMs: new Float64Array(n), zenithDeg: new Float64Array(n), azimuthDeg: new Float64Array(n), energyEeV: new Float64Array(n),
    raDeg: new Float64Array(n), decDeg: new Float64Array(n), x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n),
  };
  for (let k = 0; k < n; k++) {
    const i = keep[k]!;
    out.unixMs[k] = events.unixMs[i]!; out.zenithDeg[k] = events.zenithDeg[i]!; out.azimuthDeg[k] = events.azimuthDeg[i]!;
    out.energyEeV[k] = events.energyEeV[i]!; out.raDeg[k] = events.raDeg[i]!; out.decDeg[k] = events.decDeg[i]!;
    const ra = events.raDeg[i]! * RAD_PER_DEG, dec = events.decDeg[i]! * RAD_PER_DEG;
    out.x[k] = Math.cos(dec) * Math.cos(ra); out.y[k] = Math.cos(dec) * Math.sin(ra); out.z[k] = Math.sin(dec);
  }
  return out;
}

function round(v: number, digits = 6): number {
  if (!Number.isFinite(v)) return v;
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}

function pixelRaDec(geometry: ReturnType<typeof scanGeometry>, p: number) {
  let ra = geometry.centres.phiRad[p]! * DEG_PER_RAD;
  if (ra >= 360) ra -= 360;
  return { raDeg: ra, decDeg: Math.asin(geometry.centres.z[p]!) * DEG_PER_RAD };
}

/** Hotspot scan: top-hat windows over radii and energy thresholds, Li-Ma, post-trial from isotropic skies. */
export async function computeHotspot(all: AnalysisEvents, site: AnalysisSite, s: AnalysisSettings, opts: ComputeOptions = {}): Promise<ComputeResult> {
  const thresholds = [...s.energyThresholdsEeV].sort((a, b) => a - b);
  const events = selectEvents(all, s.zenithMaxDeg, thresholds.length ? thresholds[0]! : null);
  if (events.n === 0) throw new Error("no events pass the zenith cut and the lowest energy threshold");
  opts.onProgress?.(0.02, "preparing the exposure");
  const { latRad, zMaxRad, omega } = analysisExposure(site, s);
  const quadrature = { breakpointsDecRad: sommersBreakpointsDecRad(latRad, zMaxRad), relTol: 1e-8 };
  const geometry = scanGeometry(s.nside);
  const epochsAll = exposureEpochs(events.unixMs, 16);
  const epochs = Array.from(epochsAll.weight, (weight, k) => ({ weight, icrsToDate: epochsAll.matrices.subarray(9 * k, 9 * k + 9) }));

  let skyModel: TrialSkyModel;
  let scrambled: { x: Float64Array; y: Float64Array; z: Float64Array } | null = null;
  if (s.exposure === "scrambled") {
    scrambled = timeScrambledDirections(events, site, { nScramble: s.nScramble, seed: s.seed });
    skyModel = { kind: "reference", x: scrambled.x, y: scrambled.y, z: scrambled.z };
  } else if (s.exposure === "sommers-precessed") {
    skyModel = { kind: "declination", zDensity: tabulateZDensity(omega), epochs };
  } else {
    skyModel = { kind: "declination", zDensity: tabulateZDensity(omega) };
  }
  const fractions = s.radiiDeg.map((r) => {
    const psi = r * RAD_PER_DEG;
    if (s.exposure === "sommers") return declinationWindowFractions(s.nside, psi, omega, quadrature);
    if (s.exposure === "sommers-precessed") return precessedWindowFractions(s.nside, psi, omega, epochs, quadrature);
    const ref = buildEventIndex(scrambled!.x, scrambled!.y, scrambled!.z);
    const res = scanWindows(ref, { nside: s.nside, radiusDeg: r, expectation: { model: "declination", exposure: () => 1 }, geometry });
    const f = new Float64Array(res.nOn.length);
    for (let p = 0; p < f.length; p++) f[p] = res.nOn[p]! / scrambled!.x.length;
    return f;
  });
  const search = { nside: s.nside, radiiDeg: s.radiiDeg, fractions, thresholdsEeV: thresholds };
  opts.onProgress?.(0.05, "scanning the data and the isotropic skies");
  const trials = await runTrials({
    events: { x: events.x, y: events.y, z: events.z, energyEeV: events.energyEeV },
    search,
    skyModel,
    nSkies: s.nSkies,
    seed: s.seed,
    workers: opts.workers,
    signal: opts.signal,
    onProgress: (done, total) => opts.onProgress?.(0.05 + 0.85 * (done / total), `isotropic skies: ${done} of ${total}`),
  });
  opts.onProgress?.(0.92, "maps of the best radius and threshold");

  // Maps at the best radius and threshold of the search.
  const best = trials.observed;
  const subset = best.thresholdEeV === null ? events : selectEvents(all, s.zenithMaxDeg, best.thresholdEeV);
  const index = buildEventIndex(subset.x, subset.y, subset.z);
  const rIndex = s.radiiDeg.indexOf(best.radiusDeg);
  const scan = scanWindows(index, { nside: s.nside, radiusDeg: best.radiusDeg, expectation: { model: "fractions", fraction: fractions[rIndex]! }, geometry });
  const npix = scan.nOn.length;
  const counts = new Float32Array(npix), expected = new Float32Array(npix), excess = new Float32Array(npix), significance = new Float32Array(npix);
  for (let p = 0; p < npix; p++) {
    counts[p] = scan.nOn[p]!;
    expected[p] = scan.nExpected[p]!;
    // Windows the array never sees (no exposure) carry no significance: NaN, drawn as "no data".
    const seen = scan.nExpected[p]! > 0;
    excess[p] = seen ? scan.nOn[p]! - scan.nExpected[p]! : NaN;
    significance[p] = seen ? scan.significance[p]! : NaN;
  }
  const exposure = analysisExposureMap(site, s, s.nside, s.exposure === "sommers" ? "sommers" : "sommers-precessed", epochsAll);

  // Top windows: local maxima taken greedily, each at least one radius from those before it.
  const order = Array.from({ length: npix }, (_, p) => p).sort((a, b) => scan.significance[b]! - scan.significance[a]!);
  const cosSep = Math.cos(best.radiusDeg * RAD_PER_DEG);
  const chosen: number[] = [];
  for (const p of order) {
    if (chosen.length >= 20 || !(scan.significance[p]! > 0)) break;
    const cx = geometry.centres.x[p]!, cy = geometry.centres.y[p]!, cz = geometry.centres.z[p]!;
    if (chosen.some((q) => cx * geometry.centres.x[q]! + cy * geometry.centres.y[q]! + cz * geometry.centres.z[q]! > cosSep)) continue;
    chosen.push(p);
  }
  const sorted = Float64Array.from(trials.skyBest).sort();
  const reached = (sig: number) => {
    // Number of skies whose best local significance is >= sig (binary search in the sorted list).
    let lo = 0, hi = sorted.length;
    while (lo < hi) { const mid = (lo + hi) >> 1; if (sorted[mid]! >= sig) hi = mid; else lo = mid + 1; }
    return sorted.length - lo;
  };
  const postTrial = (sig: number) => {
    const k = reached(sig);
    const p = k / s.nSkies;
    return { nReached: k, p: round(p, 8), pUpperBound: k === 0 ? round(1 / s.nSkies, 8) : null, sigma: k === 0 ? null : round(oneSidedSigmaFromP(p), 4), sigmaLowerBound: k === 0 ? round(oneSidedSigmaFromP(1 / s.nSkies), 4) : null };
  };
  const windows = chosen.map((p) => {
    const { raDeg, decDeg } = pixelRaDec(geometry, p);
    const g = equatorialToGalactic([raDeg], [decDeg]);
    return {
      pixel: p, raDeg: round(raDeg), decDeg: round(decDeg), lDeg: round(g.lDeg[0]!), bDeg: round(g.bDeg[0]!),
      nOn: scan.nOn[p]!, nExpected: round(scan.nExpected[p]!), excess: round(scan.nOn[p]! - scan.nExpected[p]!),
      localSignificance: round(scan.significance[p]!), postTrial: postTrial(scan.significance[p]!),
    };
  });
  const top = windows[0];
  opts.onProgress?.(1, "done");
  return {
    nside: s.nside,
    maps: { counts, expected, excess, significance, exposure },
    summary: {
      kind: "hotspot",
      nEvents: events.n,
      best: {
        radiusDeg: best.radiusDeg, thresholdEeV: best.thresholdEeV, nInSubset: best.n,
        ...(top ?? {}),
        localSignificance: round(best.significance),
        postTrial: {
          nSkies: trials.nSkies, nReached: trials.nReached, p: round(trials.postTrialP, 8),
          pUpperBound: trials.postTrialPUpperBound, sigma: trials.postTrialSigma === null ? null : round(trials.postTrialSigma, 4),
          sigmaLowerBound: trials.postTrialSigmaLowerBound === null ? null : round(trials.postTrialSigmaLowerBound, 4),
        },
      },
      trials: {
        counted: `${s.radiiDeg.length} radii x ${Math.max(1, thresholds.length)} energy thresholds x ${npix} windows (Nside ${s.nside}), against ${s.nSkies} isotropic skies with the same number of events and exposure`,
        radiiDeg: s.radiiDeg, thresholdsEeV: thresholds, windows: npix, nSkies: s.nSkies,
        skies: trials.skies.kind === "quantised"
          ? `isotropic skies with each event at the centre of its HEALPix Nside-${trials.skies.fineNside} pixel, counted exactly`
          : "isotropic skies of continuous directions, counted exactly",
      },
      windows,
      exposureModel: s.exposure,
      epochs: s.exposure === "sommers-precessed" ? epochs.length : undefined,
      coverageConfiguration: s.coverage ? { id: s.coverage.configurationId, name: s.coverage.name, latitudeDeg: s.coverage.latitudeDeg, zenithMaxDeg: s.coverage.zenithMaxDeg, efficiency: s.coverage.efficiency.kind } : undefined,
      caution: RESULT_CAUTION,
    },
  };
}

/** Large-scale anisotropy: Rayleigh first harmonic in RA, east-west method, 3-D dipole. */
export async function computeLargeScale(all: AnalysisEvents, site: AnalysisSite, s: AnalysisSettings, opts: ComputeOptions = {}): Promise<ComputeResult> {
  const thresholds = [...s.energyThresholdsEeV].sort((a, b) => a - b);
  const events = selectEvents(all, s.zenithMaxDeg, thresholds.length ? thresholds[0]! : null);
  if (events.n === 0) throw new Error("no events pass the zenith cut and the energy threshold");
  opts.onProgress?.(0.1, "harmonic analysis");
  const raRad = Float64Array.from(events.raDeg, (r) => r * RAD_PER_DEG);
  const decRad = Float64Array.from(events.decDeg, (d) => d * RAD_PER_DEG);
  const lst = localApparentSiderealAngleRad(events.unixMs, site.longitudeDeg);
  const weights = s.weighted ? siderealCoverageWeights(lst) : undefined;
  const rayleigh = rayleighAnalysis(raRad, weights);
  const eastWest = eastWestAnalysis(events.azimuthDeg, lst, { zenithDeg: events.zenithDeg, decRad });
  const dipole = reconstructDipole({ raRad, decRad, zenithDeg: events.zenithDeg, azimuthDeg: events.azimuthDeg, latitudeDeg: site.latitudeDeg, weights });
  // Events per hour of right ascension, with the fitted first harmonic for the plot.
  const raCounts = new Array<number>(24).fill(0);
  for (let i = 0; i < events.n; i++) raCounts[Math.min(23, Math.floor(events.raDeg[i]! / 15))]! += 1;
  const mean = events.n / 24;
  const fitted = raCounts.map((_, h) => {
    const ra = (h + 0.5) * 15 * RAD_PER_DEG;
    return round(mean * (1 + rayleigh.a * Math.cos(ra) + rayleigh.b * Math.sin(ra)), 3);
  });
  // Counts per pixel at Nside 64 (HEALPix binning of the directions).
  const nside = 64;
  const counts = new Float32Array(12 * nside * nside);
  const pix = vectorsToPixels(nside, "ring", { x: events.x, y: events.y, z: events.z });
  for (let i = 0; i < pix.length; i++) counts[pix[i]!]! += 1;
  const epochsAll = exposureEpochs(events.unixMs, 16);
  const exposure = analysisExposureMap(site, s, nside, "sommers-precessed", epochsAll);
  opts.onProgress?.(1, "done");
  // Ten significant digits: small probabilities keep their value.
  const clean = (o: object) => JSON.parse(JSON.stringify(o, (_, v) => (typeof v === "number" && Number.isFinite(v) && v !== 0 ? Number(v.toPrecision(10)) : v)));
  return {
    nside,
    maps: { counts, exposure },
    summary: {
      kind: "large-scale",
      nEvents: events.n,
      rayleigh: clean(rayleigh),
      eastWest: clean(eastWest),
      dipole: clean(dipole),
      raHistogram: { hourEdges: Array.from({ length: 25 }, (_, i) => i), counts: raCounts, fitted },
      trials: { counted: "one first harmonic in right ascension (no search over directions)" },
      caution: RESULT_CAUTION,
    },
  };
}
