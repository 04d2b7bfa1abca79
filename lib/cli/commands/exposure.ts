/**
 * `siderea exposure --lat DEG --zenith-max DEG [--dec-step DEG]`
 *
 * Prints JSON {"declination":[...],"exposure":[...]}: the Sommers 2001 relative exposure
 * (maximum 1) at declinations from -90 to +90 deg inclusive every --dec-step deg (default 1).
 */
import { exposureCurve } from "../../sky/exposure";
import { parseCommandArgs, parseNumberOption, requireOptions } from "../args";

const USAGE = "usage: siderea exposure --lat DEG --zenith-max DEG [--dec-step DEG]";

/** Runs the exposure command with the arguments after the command word. */
export async function run(argv: string[]): Promise<void> {
  const { common, extra, help } = parseCommandArgs(argv, { "dec-step": { type: "string" } });
  if (help) { process.stdout.write(`${USAGE}\n`); return; }
  requireOptions(common, ["lat", "zenith-max"]);
  const step = parseNumberOption(extra["dec-step"], "dec-step", { above: 0, max: 180 }) ?? 1;
  const curve = exposureCurve(common.latDeg as number, common.zenithMaxDeg as number, step);
  const json = JSON.stringify({ declination: Array.from(curve.decDeg), exposure: Array.from(curve.exposure) });
  await new Promise<void>((resolve, reject) => process.stdout.write(`${json}\n`, (e) => (e ? reject(e) : resolve())));
}
