/**
 * Checks a reproduction bundle against an event table: the events' canonical SHA-256 must be
 * the bundle's, and rerunning the bundle's settings and seed must give its headline numbers
 * (numbers within 1e-9 relative, everything else identical). Node only.
 */
import { compareSummaries } from "@/lib/analyses/canonical";
import { computeHotspot, computeLargeScale } from "@/lib/analyses/compute";
import { CanonicalHasher } from "@/lib/datasets/canonical";
import { horizontalToEquatorial } from "@/lib/sky/coordinates";
import { AnalysisSettingsSchema } from "@/lib/validations/analysis";

export interface BundleEvents {
  n: number;
  ids: ArrayLike<string>;
  unixMs: Float64Array;
  zenithDeg: Float64Array;
  azimuthDeg: Float64Array;
  energyEeV: Float64Array;
  /** ICRS directions when the caller has already converted the events at the bundle's site. */
  raDeg?: Float64Array;
  decDeg?: Float64Array;
}

export interface BundleCheck {
  match: boolean;
  data: { match: boolean; contentHash: string; expected: string; events: number };
  tolerance: string;
  differences: { path: string; saved: unknown; rerun: unknown }[];
  note?: string;
}

// Bundles are JSON documents we wrote; their shape is checked field by field below.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export async function checkBundle(bundle: any, events: BundleEvents, opts: { workers?: number } = {}): Promise<BundleCheck> {
  if (bundle?.format !== "siderea-reproduction-bundle") throw new Error("this is not a Siderea reproduction bundle");
  if (!bundle.site) throw new Error("the bundle does not name its site (made by an older version)");
  const settings = AnalysisSettingsSchema.parse(bundle.settings);
  const hasher = new CanonicalHasher();
  for (let i = 0; i < events.n; i++) hasher.add(events.ids[i]!, events.unixMs[i]!, events.zenithDeg[i]!, events.azimuthDeg[i]!, events.energyEeV[i]!);
  const hash = hasher.digest();
  const site = { latitudeDeg: Number(bundle.site.latitudeDeg), longitudeDeg: Number(bundle.site.longitudeDeg), heightM: Number(bundle.site.heightM) };
  const eq = events.raDeg && events.decDeg
    ? { raDeg: events.raDeg, decDeg: events.decDeg }
    : horizontalToEquatorial({ zenithDeg: events.zenithDeg, azimuthDeg: events.azimuthDeg, unixMs: events.unixMs }, site, { azimuthConvention: "north-clockwise" });
  const input = { n: events.n, unixMs: events.unixMs, zenithDeg: events.zenithDeg, azimuthDeg: events.azimuthDeg, energyEeV: events.energyEeV, raDeg: eq.raDeg, decDeg: eq.decDeg };
  const result = settings.kind === "hotspot" ? await computeHotspot(input, site, settings, opts) : await computeLargeScale(input, site, settings, opts);
  const rerun = JSON.parse(JSON.stringify({ ...result.summary, blinded: bundle.headline?.blinded, datasetHash: hash }));
  const differences = compareSummaries(bundle.headline, rerun);
  const dataMatch = hash === bundle.dataset?.contentHash;
  return {
    match: dataMatch && differences.length === 0,
    data: { match: dataMatch, contentHash: hash, expected: String(bundle.dataset?.contentHash), events: events.n },
    tolerance: "identical strings; numbers within 1e-9 relative",
    differences: differences.slice(0, 50),
    note: dataMatch ? undefined : bundle.dataset?.blindedWhenRun ? "the analysis ran on a blinded dataset: check it against the blinded export" : "the events are not the dataset version the analysis used",
  };
}
