/**
 * `siderea scan --events FILE --lat DEG --lon DEG --zenith-max DEG --nside N --radius DEG
 *   [--exposure sommers|sommers-precessed|scrambled] [--n-scramble K] [--seed S] [--map FILE]`
 *
 * Exact top-hat window scan (METHODS section 5) over the RING pixel centres of --nside.
 * Prints JSON with the number of events and the window of largest local (pre-trial) Li-Ma
 * significance; --map FILE writes a CSV `pixel,ra,dec,n_on,n_expected,significance` with
 * every window in RING order. Default exposure: sommers-precessed.
 */
import { createWriteStream } from "node:fs";
import { sommersBreakpointsDecRad } from "../../sky/cap-exposure";
import { DEG_PER_RAD, RAD_PER_DEG } from "../../sky/constants";
import { equatorialToGalactic } from "../../sky/coordinates";
import { createSommersExposure, exposureEpochs } from "../../sky/exposure";
import { assertNside } from "../../sky/ring-geometry";
import { buildEventIndex, precessedWindowFractions, scanGeometry, scanWindows, type ScanExpectation } from "../../sky/scan";
import { timeScrambledDirections } from "../../sky/scramble";
import { parseCommandArgs, parseNumberOption, requireOptions } from "../args";
import { CliError, UsageError } from "../errors";
import { loadEvents } from "../load-events";

const USAGE = "usage: siderea scan --events FILE --lat DEG --lon DEG --zenith-max DEG --nside N --radius DEG [--exposure sommers|sommers-precessed|scrambled] [--n-scramble K] [--seed S] [--map FILE]";
const MODELS = ["sommers", "sommers-precessed", "scrambled"] as const;
type Model = (typeof MODELS)[number];

/** Runs the scan command with the arguments after the command word. */
export async function run(argv: string[]): Promise<void> {
  const t0 = performance.now();
  const { common, extra, help } = parseCommandArgs(argv, {
    nside: { type: "string" }, radius: { type: "string" }, exposure: { type: "string" },
    map: { type: "string" }, "n-scramble": { type: "string" }, seed: { type: "string" },
  });
  if (help) { process.stdout.write(`${USAGE}\n`); return; }
  requireOptions(common, ["events", "lat", "lon", "zenith-max"]);
  const nside = parseNumberOption(extra.nside, "nside", { integer: true, min: 1, max: 8192 });
  if (nside === undefined) throw new UsageError("missing required option --nside");
  try { assertNside(nside); } catch { throw new UsageError(`--nside must be a power of 2 in [1, 8192], got ${nside}`); }
  const radiusDeg = parseNumberOption(extra.radius, "radius", { above: 0, max: 179 });
  if (radiusDeg === undefined) throw new UsageError("missing required option --radius");
  const model = (extra.exposure ?? "sommers-precessed") as Model;
  if (!MODELS.includes(model)) throw new UsageError(`--exposure must be one of ${MODELS.join(", ")}, got "${String(extra.exposure)}"`);
  const nScramble = parseNumberOption(extra["n-scramble"], "n-scramble", { integer: true, min: 1, max: 1000 }) ?? 10;
  const seed = parseNumberOption(extra.seed, "seed", { integer: true, min: 0, max: Number.MAX_SAFE_INTEGER }) ?? 1;
  const mapPath = typeof extra.map === "string" ? extra.map : undefined;
  if (extra.map !== undefined && (!mapPath || mapPath.trim() === "")) throw new UsageError("--map needs a file path");

  const events = await loadEvents(common);
  if (events.n === 0) throw new CliError("no events left after the cuts");
  const tLoad = performance.now();
  const index = buildEventIndex(events.x, events.y, events.z);
  const tIndex = performance.now();

  const latRad = (common.latDeg as number) * RAD_PER_DEG;
  const zMaxRad = (common.zenithMaxDeg as number) * RAD_PER_DEG;
  const psi = radiusDeg * RAD_PER_DEG;
  const geometry = scanGeometry(nside);
  // Non-smooth points of the Sommers exposure: breakpoints of the cap quadrature.
  const quadrature = { breakpointsDecRad: sommersBreakpointsDecRad(latRad, zMaxRad), relTol: 1e-8 };
  let expectation: ScanExpectation;
  let epochsUsed = 0;
  if (model === "sommers") {
    expectation = { model: "declination", exposure: createSommersExposure(latRad, zMaxRad), quadrature, label: model };
  } else if (model === "sommers-precessed") {
    const ep = exposureEpochs(events.unixMs, 16);
    epochsUsed = ep.weight.length;
    const epochs = Array.from(ep.weight, (weight, k) => ({ weight, icrsToDate: ep.matrices.subarray(9 * k, 9 * k + 9) }));
    const fraction = precessedWindowFractions(nside, psi, createSommersExposure(latRad, zMaxRad), epochs, quadrature);
    expectation = { model: "fractions", fraction, label: model };
  } else {
    const ref = timeScrambledDirections(events, events.site, { nScramble, seed });
    expectation = { model: "reference", reference: buildEventIndex(ref.x, ref.y, ref.z), weight: 1 / nScramble, label: model };
  }
  const tExp = performance.now();
  const res = scanWindows(index, { nside, radiusDeg, expectation, geometry });
  const tScan = performance.now();
  if (mapPath) await writeMap(mapPath, res, geometry.centres);
  const tMap = performance.now();

  const gal = equatorialToGalactic([res.max.raDeg], [res.max.decDeg]);
  const out = {
    n: events.n,
    nside, radius: radiusDeg, exposure: model,
    ...(model === "scrambled" ? { nScramble, seed } : {}),
    ...(model === "sommers-precessed" ? { epochs: epochsUsed } : {}),
    windows: res.nOn.length,
    max: {
      significance: round(res.max.significance, 6), ra: round(res.max.raDeg, 6), dec: round(res.max.decDeg, 6),
      l: round(gal.lDeg[0], 6), b: round(gal.bDeg[0], 6),
      nOn: res.max.nOn, nExpected: round(res.max.nExpected, 6), pixel: res.max.pixel,
    },
    significanceKind: "local (pre-trial) Li & Ma 1983 eq. 17; the post-trial probability of this maximum needs isotropic simulations of the same search",
    caution: "preliminary: the maximum of a full-sky scan is the largest of many correlated trials; do not quote it as a detection",
    cuts: { read: events.nRead, cutByEnergy: events.cutByEnergy, cutByZenith: events.cutByZenith, droppedBadRows: events.droppedBadRows },
    timingsMs: {
      load: round(tLoad - t0, 1), index: round(tIndex - tLoad, 1), expectation: round(tExp - tIndex, 1),
      scan: round(tScan - tExp, 1), count: round(res.timingMs.count, 1), map: round(tMap - tScan, 1), total: round(tMap - t0, 1),
    },
  };
  await new Promise<void>((resolve, reject) => process.stdout.write(`${JSON.stringify(out)}\n`, (e) => (e ? reject(e) : resolve())));
}

function round(v: number, digits: number): number {
  if (!Number.isFinite(v)) return v;
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}

/**
 * Writes the RING-order window map as CSV through a buffered stream. The RA and declination
 * columns are formatted once per distinct value (all centres of a ring share a declination,
 * and rings with the same first centre share their RAs), which is what makes the writer fast.
 */
async function writeMap(path: string, res: { nOn: Int32Array; nExpected: Float64Array; significance: Float64Array }, centres: { phiRad: Float64Array; z: Float64Array; ring: Int32Array }): Promise<void> {
  const stream = createWriteStream(path, { encoding: "utf8" });
  const failed = new Promise<never>((_, reject) => stream.on("error", (e) => reject(new CliError(`cannot write map file "${path}": ${e.message}`))));
  const write = async (s: string) => { if (!stream.write(s)) await Promise.race([new Promise<void>((r) => stream.once("drain", () => r())), failed]); };
  await Promise.race([new Promise<void>((r) => stream.once("open", () => r())), failed]);
  await write("pixel,ra,dec,n_on,n_expected,significance\n");
  let buf = "";
  const raText = new Map<string, string[]>();
  let ringRa: string[] = [], decText = "", ringFirst = 0, lastRing = -1;
  for (let p = 0; p < res.nOn.length; p++) {
    const r = centres.ring[p];
    if (r !== lastRing) {
      // A new ring: its declination text, and the RA texts of the rings with the same centres.
      let ringEnd = p;
      while (ringEnd < res.nOn.length && centres.ring[ringEnd] === r) ringEnd++;
      const key = `${ringEnd - p}:${centres.phiRad[p]}`;
      let texts = raText.get(key);
      if (!texts) {
        texts = [];
        for (let q = p; q < ringEnd; q++) {
          let ra = centres.phiRad[q] * DEG_PER_RAD;
          if (ra >= 360) ra -= 360;
          texts.push(ra.toFixed(6));
        }
        raText.set(key, texts);
      }
      ringRa = texts; ringFirst = p; lastRing = r;
      decText = (Math.asin(centres.z[p]) * DEG_PER_RAD).toFixed(6);
    }
    buf += `${p},${ringRa[p - ringFirst]},${decText},${res.nOn[p]},${res.nExpected[p].toFixed(6)},${res.significance[p].toFixed(6)}\n`;
    if (buf.length > 1 << 16) { await write(buf); buf = ""; }
  }
  if (buf) await write(buf);
  await Promise.race([new Promise<void>((r) => stream.end(() => r())), failed]);
}
