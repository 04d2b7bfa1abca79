/**
 * `reproduce --bundle FILE --events FILE`: reruns a saved analysis from its reproduction
 * bundle (downloaded from the analysis page) and the dataset's events CSV (the dataset's
 * "Download converted events" file, or any CSV with the canonical columns), and says whether
 * the headline numbers come back (lib/analyses/verify-bundle.ts, the check the web app's
 * verification job runs too). Prints JSON; exits 0 on a match, 3 on a mismatch.
 */
import { readFile } from "node:fs/promises";
import { parseArgs } from "node:util";
import { checkBundle } from "@/lib/analyses/verify-bundle";
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
  let bundle: { format?: string; site?: { latitudeDeg: number; longitudeDeg: number; heightM: number }; analysis?: unknown };
  try {
    bundle = JSON.parse(await readFile(values.bundle, "utf8"));
  } catch (e) {
    throw new CliError(`cannot read bundle "${values.bundle}": ${(e as NodeJS.ErrnoException).code === "ENOENT" ? "no such file" : (e as Error).message}`);
  }
  if (bundle.format !== "siderea-reproduction-bundle") throw new CliError(`"${values.bundle}" is not a Siderea reproduction bundle`);
  if (!bundle.site) throw new CliError("the bundle does not name its site (made by an older version): cannot convert the events");
  // loadEvents converts at the bundle's site; checkBundle uses those directions.
  const events = await loadEvents({
    events: values.events, latDeg: bundle.site.latitudeDeg, lonDeg: bundle.site.longitudeDeg, heightM: bundle.site.heightM,
    azimuthConvention: "north-clockwise", timeFormat: "iso", energyUnit: "EeV", dropBadRows: false,
  });
  const workers = values.workers === undefined ? undefined : Number(values.workers);
  let check;
  try {
    check = await checkBundle(bundle, events, { workers });
  } catch (e) {
    throw new CliError((e as Error).message);
  }
  process.stdout.write(`${JSON.stringify({ ...check, analysis: bundle.analysis })}\n`);
  if (!check.match) process.exitCode = 3;
}
