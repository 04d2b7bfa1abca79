/**
 * `siderea dipole --events FILE --lat DEG --lon DEG [--zenith-max DEG] [--weighted]`
 *
 * Large-scale anisotropy (METHODS section 6): Rayleigh first harmonic in right ascension
 * (Linsley 1975; unweighted unless --weighted, which weights events by the inverse event
 * count of their local-sidereal-time bin, 24 bins), the east-west differential harmonic
 * (Bonino et al. 2011) and the 3-D dipole from the RA harmonic and the azimuthal north-south
 * asymmetry (Aublin & Parizot 2005), with uncertainties. Prints JSON.
 */
import { RAD_PER_DEG } from "../../sky/constants";
import { localApparentSiderealAngleRad } from "../../sky/coordinates";
import { reconstructDipole } from "../../sky/dipole";
import { eastWestAnalysis } from "../../sky/east-west";
import { siderealCoverageWeights } from "../../sky/rayleigh";
import { parseCommandArgs, requireOptions } from "../args";
import { CliError } from "../errors";
import { loadEvents } from "../load-events";

const USAGE = "usage: siderea dipole --events FILE --lat DEG --lon DEG [--zenith-max DEG] [--weighted]";

/** Runs the dipole command with the arguments after the command word. */
export async function run(argv: string[]): Promise<void> {
  const t0 = performance.now();
  const { common, extra, help } = parseCommandArgs(argv, { weighted: { type: "boolean" } });
  if (help) { process.stdout.write(`${USAGE}\n`); return; }
  requireOptions(common, ["events", "lat", "lon"]);
  const events = await loadEvents(common);
  if (events.n < 2) throw new CliError(`need at least 2 events after the cuts, got ${events.n}`);
  const tLoad = performance.now();
  const n = events.n;
  const raRad = new Float64Array(n), decRad = new Float64Array(n);
  for (let i = 0; i < n; i++) { raRad[i] = events.raDeg[i] * RAD_PER_DEG; decRad[i] = events.decDeg[i] * RAD_PER_DEG; }
  const lst = localApparentSiderealAngleRad(events.unixMs, events.site.longitudeDeg);
  const weighted = extra.weighted === true;
  const weights = weighted ? siderealCoverageWeights(lst, 24) : undefined;
  const dip = reconstructDipole({ raRad, decRad, zenithDeg: events.zenithDeg, azimuthDeg: events.azimuthDeg, latitudeDeg: events.site.latitudeDeg, weights });
  const ew = eastWestAnalysis(events.azimuthDeg, lst, { zenithDeg: events.zenithDeg, decRad });
  const r = dip.rayleigh;
  const out = {
    n,
    rayleigh: {
      weighted, a: r.a, b: r.b, amplitude: r.amplitude, phase: r.phaseDeg, p: r.p, sigma: r.sigma,
      nEffective: r.nEffective, significant: r.significant,
      amplitudeUpperLimit99: r.amplitudeUpperLimit99, isotropicAmplitude99: r.isotropicAmplitude99,
      method: "Linsley 1975; 99% upper limit: Neyman construction on the Rice distribution",
    },
    eastWest: {
      a: ew.aEW, b: ew.bEW, amplitude: ew.amplitudeEW, phase: ew.phaseEWDeg, p: ew.p, sigma: ew.sigmaEW,
      nEast: ew.nEast, nWest: ew.nWest,
      raAmplitude: ew.amplitudeRA, raAmplitudeSigma: ew.sigmaRA, raPhase: ew.phaseRADeg, conversionFactor: ew.conversionFactor,
      method: "Bonino et al. 2011, ApJ 738, 67 (local sidereal time of date)",
    },
    dipole: {
      amplitude: dip.amplitude, ra: dip.raDeg, dec: dip.decDeg,
      amplitudeSigma: dip.sigmaAmplitude, raSigma: dip.sigmaRaDeg, decSigma: dip.sigmaDecDeg,
      dPerp: dip.dPerp, dPerpSigma: dip.sigmaDPerp, dZ: dip.dZ, dZSigma: dip.sigmaDZ,
      azimuthHarmonic: dip.azimuthHarmonic,
      method: "Aublin & Parizot 2005, A&A 441, 407; uncertainties by linear propagation",
    },
    caution: "preliminary: direction uncertainties assume the amplitude is well above its error",
    timingsMs: { load: Math.round((tLoad - t0) * 10) / 10, analysis: Math.round((performance.now() - tLoad) * 10) / 10 },
    units: { phase: "deg", ra: "deg", dec: "deg" },
  };
  await new Promise<void>((resolve, reject) => process.stdout.write(`${JSON.stringify(out)}\n`, (e) => (e ? reject(e) : resolve())));
}
