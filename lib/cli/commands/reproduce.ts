/**
 * `reproduce --bundle FILE --events FILE`: reruns a saved analysis from its reproduction
 * bundle (downloaded from the analysis page) and the dataset's events CSV (the dataset's
 * "Download converted events" file, or any CSV with the canonical columns), and says whether
 * the headline numbers come back. Checks first that the events are the ones the analysis used
 * (SHA-256 of the canonical event table). Prints JSON; exits 0 on a match, 3 on a mismatch.
 */
import { readFile } from "node:fs/promises";
import { parseArgs } from "node:util";
import { compareSummaries } from "@/lib/analyses/canonical";
import { computeHotspot, computeLargeScale } from "@/lib/analyses/compute";
import { CanonicalHasher } from "@/lib/datasets/canonical";
import { AnalysisSettingsSchema } from "@/lib/validations/analysis";
import { CliError, UsageError } from "../errors";
import { loadEvents } from "../load-events";

const USAGE = "usage: siderea reproduce --bundle FILE --events FILE [--workers N]";

export async function run(argv: string[]): Promise<void> {
  let values: { bundle?: string; events?: string; workers?: string; help?: boolean };
  try {
    ({ values } = parseArgs({ args: argv, options: { bundle: { type: "string" }, events: { type: "string" }, workers: { type: "string" }, help: { type: "boolean" } }, strict: true }));
  } catch (e) {
    throw new UsageError((e as Error).message);
  }
  if (values.help) { process.stdout.write(`${USAGE}\n`); return; }
  if (!values.bundle || !values.events) throw new UsageError(`--bundle and --events are required; ${USAGE}`);
  let bundle: Record<string, any>;
  try {
    bundle = JSON.parse(await readFile(values.bundle, "utf8"));
  } catch (e) {
    throw new CliError(`cannot read bundle "${values.bundle}": ${(e as NodeJS.ErrnoException).code === "ENOENT" ? "no such file" : (e as Error).message}`);
  }
  if (bundle.format !== "siderea-reproduction-bundle") throw new CliError(`"${values.bundle}" is not a Siderea reproduction bundle`);
  if (!bundle.site) throw new CliError("the bundle does not name its site (made by an older version): cannot convert the events");
  const settings = AnalysisSettingsSchema.parse(bundle.settings);
  const events = await loadEvents({
    events: values.events, latDeg: bundle.site.latitudeDeg, lonDeg: bundle.site.longitudeDeg, heightM: bundle.site.heightM,
    azimuthConvention: "north-clockwise", timeFormat: "iso", energyUnit: "EeV", dropBadRows: false,
  });
  const hasher = new CanonicalHasher();
  for (let i = 0; i < events.n; i++) hasher.add(events.ids[i]!, events.unixMs[i]!, events.zenithDeg[i]!, events.azimuthDeg[i]!, events.energyEeV[i]!);
  const hash = hasher.digest();
  const dataMatch = hash === bundle.dataset.contentHash;
  const site = { latitudeDeg: bundle.site.latitudeDeg, longitudeDeg: bundle.site.longitudeDeg, heightM: bundle.site.heightM };
  const workers = values.workers === undefined ? undefined : Number(values.workers);
  const input = { n: events.n, unixMs: events.unixMs, zenithDeg: events.zenithDeg, azimuthDeg: events.azimuthDeg, energyEeV: events.energyEeV, raDeg: events.raDeg, decDeg: events.decDeg };
  const result = settings.kind === "hotspot" ? await computeHotspot(input, site, settings, { workers }) : await computeLargeScale(input, site, settings, { workers });
  const rerun = JSON.parse(JSON.stringify({ ...result.summary, blinded: bundle.headline?.blinded, datasetHash: hash }));
  const differences = compareSummaries(bundle.headline, rerun);
  const match = dataMatch && differences.length === 0;
  process.stdout.write(`${JSON.stringify({
    match,
    data: { match: dataMatch, contentHash: hash, expected: bundle.dataset.contentHash, events: events.n },
    tolerance: "identical strings; numbers within 1e-9 relative",
    differences: differences.slice(0, 50),
    analysis: bundle.analysis,
    note: dataMatch ? undefined : bundle.dataset.blindedWhenRun ? "the analysis ran on a blinded dataset: reproduce it from the blinded export" : "the events are not the dataset version the analysis used",
  })}\n`);
  if (!match) process.exitCode = 3;
}
