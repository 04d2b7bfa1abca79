/**
 * Post-trial probability of the best window of a search (METHODS section 5): the fraction
 * of isotropic simulated skies - same number of events, same exposure, energies permuted
 * from the data so every threshold keeps its count - whose best local significance over
 * the same search (radii x thresholds x windows) reaches the observed best.
 *
 * Large skies (QUANTISED_SKIES_FROM events and more, declination-only exposures) are drawn on
 * a fine HEALPix grid and counted by per-ring prefix sums (quantised-sky.ts): the events sit at
 * the centres of pixels several times smaller than the window spacing, and their window counts
 * are exact. Smaller skies, and skies drawn from a reference set, are continuous directions.
 *
 * Skies run on node:worker_threads (Node only; this file and trials-worker.ts are the
 * only sky modules that touch Node APIs). Sky k always uses the stream
 * deriveSeed(seed, k), so results do not depend on the number of workers or batches.
 */
import { createRequire } from "node:module";
import { availableParallelism } from "node:os";
import { pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import { scanGeometry, searchBestWindow, type SearchBest, type SearchSpec } from "./scan";
import { createTrialContext, runTrialSky, type TrialContextData, type TrialSkyModel } from "./trials-worker";

export type { TrialSkyModel } from "./trials-worker";

/** Inputs of a post-trial simulation. */
export interface TrialsOptions {
  /** Observed events: ICRS unit vectors and energies (EeV, NaN unknown; may be null without thresholds). */
  events: { x: Float64Array; y: Float64Array; z: Float64Array; energyEeV?: Float64Array | null };
  search: SearchSpec;
  skyModel: TrialSkyModel;
  nSkies: number;
  seed: number;
  /** Worker threads; default min(2, os.availableParallelism()); 0 runs in this thread. */
  workers?: number;
  /** Skies per message to a worker (default 8). */
  batchSize?: number;
  signal?: AbortSignal;
  onProgress?: (skiesDone: number, nSkies: number) => void;
  /** "auto" (default): quantised for declination-only models from QUANTISED_SKIES_FROM events on. */
  skies?: "auto" | "continuous" | "quantised";
  /** Fine grid of quantised skies (default trialSkyFineNside(search.nside, search.radiiDeg)). */
  fineNside?: number;
}

/** Skies of at least this many events are drawn on a fine grid (when the model allows it). */
export const QUANTISED_SKIES_FROM = 100_000;

/**
 * Fine grid of quantised trial skies for a search: four times the window grid's Nside, at
 * least 256 (pixels of 0.23 deg), and fine enough for eight pixel spacings across the smallest
 * radius; at most 1024.
 */
export function trialSkyFineNside(scanNside: number, radiiDeg: ReadonlyArray<number>): number {
  const smallest = Math.min(...radiiDeg);
  let fine = Math.max(256, 4 * scanNside);
  while (fine < 1024 && 58.6 / fine > smallest / 8) fine *= 2;
  return Math.min(1024, fine);
}

/** How the skies of a search were drawn (for the record of an analysis). */
export interface TrialSkiesUsed {
  kind: "continuous" | "quantised";
  /** Fine grid of quantised skies, null for continuous ones. */
  fineNside: number | null;
}

/** Local and post-trial results, side by side. */
export interface TrialsResult {
  /** Best window of the observed data (local significance in `significance`). */
  observed: SearchBest;
  nSkies: number;
  /** Skies whose best local significance >= the observed one. */
  nReached: number;
  /** Post-trial chance probability nReached / nSkies (0 when no sky reached it: see the bound). */
  postTrialP: number;
  /** When nReached = 0: the probability is below 1 / nSkies (reported as this bound). */
  postTrialPUpperBound: number | null;
  /** One-sided Gaussian equivalent of postTrialP; null when p = 0. */
  postTrialSigma: number | null;
  /** When nReached = 0: the equivalent significance exceeds this (from 1 / nSkies). */
  postTrialSigmaLowerBound: number | null;
  /** Best local significance of each simulated sky. */
  skyBest: Float64Array;
  /** How the skies were drawn. */
  skies: TrialSkiesUsed;
}

/** Runs the observed search and the isotropic trials. Rejects with an AbortError on abort. */
export async function runTrials(opts: TrialsOptions): Promise<TrialsResult> {
  const { events, search, nSkies } = opts;
  if (!(Number.isInteger(nSkies) && nSkies >= 1)) throw new RangeError(`nSkies must be a positive integer, got ${nSkies}`);
  const energies = search.thresholdsEeV.length > 0 ? (events.energyEeV ?? null) : null;
  if (search.thresholdsEeV.length > 0 && !energies) throw new RangeError("energy thresholds need event energies");
  const geometry = scanGeometry(search.nside);
  const observed = searchBestWindow(events, energies, search, geometry);
  const nEvents = events.x.length;
  const mode = opts.skies ?? "auto";
  const model = opts.skyModel;
  const quantised = model.kind === "declination" && (mode === "quantised" || (mode === "auto" && nEvents >= QUANTISED_SKIES_FROM));
  if (mode === "quantised" && model.kind !== "declination") throw new RangeError("quantised trial skies need a declination-only sky model");
  let quantisedData: TrialContextData["quantised"] = null;
  if (quantised) {
    const subsetSizes = search.thresholdsEeV.length === 0 ? [nEvents] : search.thresholdsEeV.map((t) => {
      let c = 0;
      for (let i = 0; i < nEvents; i++) if (energies![i] >= t) c++;
      return c;
    });
    quantisedData = { fineNside: opts.fineNside ?? trialSkyFineNside(search.nside, search.radiiDeg), subsetSizes };
  }
  const data: TrialContextData = {
    siderea: "trials", search, skyModel: model, nEvents,
    energyEeV: energies && !quantised ? Float64Array.from(energies) : null, seed: opts.seed, quantised: quantisedData,
  };
  const skyBest = await simulateSkies(data, nSkies, opts);
  let reached = 0;
  for (let k = 0; k < nSkies; k++) if (skyBest[k] >= observed.significance) reached++;
  const p = reached / nSkies;
  return {
    observed, nSkies, nReached: reached, postTrialP: p,
    postTrialPUpperBound: reached === 0 ? 1 / nSkies : null,
    postTrialSigma: reached === 0 ? null : oneSidedSigmaFromP(p),
    postTrialSigmaLowerBound: reached === 0 ? oneSidedSigmaFromP(1 / nSkies) : null,
    skyBest,
    skies: { kind: quantised ? "quantised" : "continuous", fineNside: quantisedData?.fineNside ?? null },
  };
}

function abortError(): Error {
  const e = new Error("trials aborted");
  e.name = "AbortError";
  return e;
}

/**
 * How to start the worker. Compiled (.js): the worker file itself. From TypeScript source
 * (tsx, vitest): a small evaluated bootstrap that registers tsx's loader inside the new
 * thread (loader hooks are per thread) and then imports trials-worker.ts.
 */
function workerSpec(): { entry: string | URL; options: { eval?: boolean } } {
  const self = import.meta.url;
  if (!self.endsWith(".ts")) return { entry: new URL("./trials-worker.js", self), options: {} };
  const workerFile = new URL("./trials-worker.ts", self).href;
  const tsxApi = new URL("dist/esm/api/index.mjs", pathToFileURL(createRequire(self).resolve("tsx/package.json"))).href;
  const code = `import(${JSON.stringify(tsxApi)}).then((api) => { api.register(); return import(${JSON.stringify(workerFile)}); })`
    + `.catch((e) => { require("node:worker_threads").parentPort.postMessage({ type: "error", message: String(e && e.stack || e) }); });`;
  return { entry: code, options: { eval: true } };
}

async function simulateSkies(data: TrialContextData, nSkies: number, opts: TrialsOptions): Promise<Float64Array> {
  const out = new Float64Array(nSkies);
  const nWorkers = Math.max(0, Math.min(opts.workers ?? Math.min(2, availableParallelism()), nSkies));
  const batch = Math.max(1, opts.batchSize ?? 8);
  if (opts.signal?.aborted) throw abortError();
  if (nWorkers === 0) {
    const ctx = createTrialContext(data);
    for (let k = 0; k < nSkies; k++) {
      if (opts.signal?.aborted) throw abortError();
      out[k] = runTrialSky(ctx, k);
      if ((k + 1) % batch === 0 || k + 1 === nSkies) {
        opts.onProgress?.(k + 1, nSkies);
        await new Promise((r) => setImmediate(r)); // let an abort arrive
      }
    }
    return out;
  }
  const spec = workerSpec();
  return new Promise<Float64Array>((resolve, reject) => {
    const workers: Worker[] = [];
    let next = 0, done = 0, finished = false;
    const finish = (err: Error | null) => {
      if (finished) return;
      finished = true;
      opts.signal?.removeEventListener("abort", onAbort);
      for (const w of workers) void w.terminate();
      if (err) reject(err); else resolve(out);
    };
    const onAbort = () => finish(abortError());
    opts.signal?.addEventListener("abort", onAbort, { once: true });
    const dispatch = (w: Worker) => {
      if (next >= nSkies) return;
      const from = next, to = Math.min(nSkies, next + batch);
      next = to;
      w.postMessage({ type: "run", from, to });
    };
    for (let i = 0; i < nWorkers; i++) {
      const w = new Worker(spec.entry, { ...spec.options, workerData: data });
      workers.push(w);
      w.on("message", (msg: { type: string; from?: number; best?: Float64Array; message?: string }) => {
        if (finished) return;
        if (msg.type === "error") { finish(new Error(`trial worker failed: ${msg.message}`)); return; }
        if (msg.type === "done" && msg.best && msg.from !== undefined) {
          out.set(msg.best, msg.from);
          done += msg.best.length;
          opts.onProgress?.(done, nSkies);
          if (done === nSkies) finish(null); else dispatch(w);
        }
      });
      w.on("error", (err) => finish(err instanceof Error ? err : new Error(String(err))));
      w.on("exit", (code) => { if (!finished && code !== 0) finish(new Error(`trial worker exited with code ${code}`)); });
      for (let b = 0; b < 2; b++) dispatch(w); // keep one batch queued per worker
    }
  });
}

/**
 * Complementary error function erfc(x), fractional error < 1.2e-7 everywhere (Chebyshev
 * fit of Numerical Recipes in C, 2nd ed., section 6.2, erfcc).
 */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r = t * Math.exp(-z * z - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806
    + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))));
  return x >= 0 ? r : 2 - r;
}

/**
 * One-sided Gaussian significance s with P(Z >= s) = p for a standard normal Z, i.e.
 * p = erfc(s / sqrt 2) / 2; p in (0, 1). Bisection to 1e-10. Infinity for p <= 0 is never
 * returned: callers report a bound instead (p = 0 -> RangeError).
 */
export function oneSidedSigmaFromP(p: number): number {
  if (!(p > 0 && p < 1)) {
    if (p >= 1) return -Infinity;
    throw new RangeError(`p must be in (0, 1), got ${p}`);
  }
  let lo = -40, hi = 40;
  for (let i = 0; i < 200 && hi - lo > 1e-10; i++) {
    const mid = (lo + hi) / 2;
    if (0.5 * erfc(mid / Math.SQRT2) > p) lo = mid; else hi = mid;
  }
  return (lo + hi) / 2;
}
