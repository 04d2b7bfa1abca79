/**
 * Node-only worker entry for the post-trial simulation (trials.ts). Each isotropic sky k is
 * drawn from its own stream createRandom(deriveSeed(seed, k)), so a sky's result does not
 * depend on which worker runs it or in which batch. The same code runs in-process when
 * trials are run without workers.
 *
 * Protocol: workerData = TrialContextData; the parent posts { type: "run", from, to };
 * the worker answers { type: "done", from, best: Float64Array } (best local significance
 * of skies from..to-1) or { type: "error", message }.
 */
import { isMainThread, parentPort, workerData } from "node:worker_threads";
import { createSamplerFromZDensity, drawFromReference, drawIsotropicSky, drawIsotropicSkyPrecessed, type DeclinationSampler, type SkyDirections, type SkyEpoch } from "./isotropic";
import { createRandom, deriveSeed } from "./random";
import { createSearchWorkspace, scanGeometry, searchBestWindow, type ScanGeometry, type SearchSpec, type SearchWorkspace } from "./scan";
import { liMaSignificanceFromFraction } from "./lima";
import {
  countQuantisedInWindows, createQuantisedScratch, createQuantisedSkySampler, drawQuantisedSky, planQuantisedWindows, prefixSumsByRing, windowProbabilities,
  type QuantisedScratch, type QuantisedSkySampler, type QuantisedWindowPlan,
} from "./quantised-sky";

/** How trial skies are drawn (plain data, so it can cross a thread boundary). */
export type TrialSkyModel =
  /** Declination-only exposure tabulated in z = sin(dec) (isotropic.ts tabulateZDensity); with epochs, defined in the equator of date. */
  | { kind: "declination"; zDensity: Float64Array; epochs?: ReadonlyArray<SkyEpoch> }
  /** Directions picked from a reference set (e.g. time-scrambled data). */
  | { kind: "reference"; x: Float64Array; y: Float64Array; z: Float64Array };

/** Everything a worker needs to simulate and search skies. */
export interface TrialContextData {
  siderea: "trials";
  search: SearchSpec;
  skyModel: TrialSkyModel;
  /** Number of events per sky (all events, before energy thresholds). */
  nEvents: number;
  /** Observed energies (EeV, NaN unknown) permuted onto each sky; null without thresholds. */
  energyEeV: Float64Array | null;
  seed: number;
  /**
   * Skies on a fine grid (quantised-sky.ts) instead of continuous directions: declination-only
   * sky models only. The skies are drawn in the frame where the exposure depends on declination
   * alone (the equator of date for a precessed exposure) and searched there, each window with
   * the exact expectation of such skies (windowProbabilities, not search.fractions);
   * subsetSizes are the numbers of events per energy threshold (thresholds in the order of
   * search.thresholdsEeV; one size without thresholds).
   */
  quantised?: { fineNside: number; subsetSizes: number[] } | null;
}

/** Prepared state for running skies (sampler, geometry, buffers). */
export interface TrialContext {
  data: TrialContextData;
  sampler: DeclinationSampler | null;
  geometry: ScanGeometry;
  sky: SkyDirections;
  energies: Float64Array | null;
  workspace: SearchWorkspace;
  grid: { sampler: QuantisedSkySampler; plans: QuantisedWindowPlan[]; fractions: Float64Array[]; scratch: QuantisedScratch; counts: Int32Array; ringCounts: Int32Array; windowCounts: Int32Array } | null;
}

/** Builds the per-thread state from the plain context data. */
export function createTrialContext(data: TrialContextData): TrialContext {
  const geometry = scanGeometry(data.search.nside);
  const n = data.nEvents;
  if (data.quantised) {
    if (data.skyModel.kind !== "declination") throw new RangeError("quantised trial skies need a declination-only sky model");
    const sampler = createQuantisedSkySampler(data.skyModel.zDensity, data.quantised.fineNside);
    const fine = sampler.fine;
    const plans = data.search.radiiDeg.map((r) => planQuantisedWindows(geometry.rings, fine, (r * Math.PI) / 180));
    return {
      data, sampler: null, geometry, sky: { x: new Float64Array(0), y: new Float64Array(0), z: new Float64Array(0) }, energies: null,
      workspace: createSearchWorkspace(0, geometry),
      grid: {
        sampler,
        plans,
        fractions: plans.map((plan) => windowProbabilities(plan, sampler)),
        scratch: createQuantisedScratch(fine),
        counts: new Int32Array(12 * fine.nside * fine.nside),
        ringCounts: new Int32Array(fine.nRings),
        windowCounts: new Int32Array(geometry.centres.x.length),
      },
    };
  }
  return {
    grid: null,
    data,
    sampler: data.skyModel.kind === "declination" ? createSamplerFromZDensity(data.skyModel.zDensity) : null,
    geometry,
    sky: { x: new Float64Array(n), y: new Float64Array(n), z: new Float64Array(n) },
    energies: data.energyEeV ? new Float64Array(n) : null,
    workspace: createSearchWorkspace(n, geometry),
  };
}

/** Best local significance of isotropic sky number skyIndex (deterministic in seed and skyIndex). */
export function runTrialSky(ctx: TrialContext, skyIndex: number): number {
  const { data } = ctx;
  const rnd = createRandom(deriveSeed(data.seed, skyIndex));
  if (ctx.grid && data.quantised) return runQuantisedSky(ctx.grid, data.quantised, data.search, rnd);
  const model = data.skyModel;
  if (model.kind === "reference") drawFromReference(data.nEvents, model, rnd, ctx.sky);
  else if (model.epochs && model.epochs.length > 0) drawIsotropicSkyPrecessed(data.nEvents, ctx.sampler!, model.epochs, rnd, ctx.sky);
  else drawIsotropicSky(data.nEvents, ctx.sampler!, rnd, ctx.sky);
  if (ctx.energies && data.energyEeV) {
    // Energies: a uniform random permutation of the observed ones (Fisher-Yates), so every
    // threshold selects the same number of events as in the data.
    const e = ctx.energies;
    e.set(data.energyEeV);
    for (let i = e.length - 1; i > 0; i--) { const j = rnd.nextInt(i + 1); const t = e[i]; e[i] = e[j]; e[j] = t; }
  }
  return searchBestWindow(ctx.sky, ctx.energies, data.search, ctx.geometry, ctx.workspace).significance;
}

/**
 * A quantised sky searched over radii and energy thresholds. The events above a threshold of
 * an isotropic sky with permuted energies are a uniformly chosen subset of its events, that is
 * an isotropic sky of that size in their own right, and the subsets are nested: so the
 * smallest subset is drawn first, searched, and grown by further events to the next size.
 */
function runQuantisedSky(
  grid: NonNullable<TrialContext["grid"]>, q: NonNullable<TrialContextData["quantised"]>, search: SearchSpec, rnd: ReturnType<typeof createRandom>,
): number {
  const order = q.subsetSizes.map((size, k) => ({ size, k })).sort((a, b) => a.size - b.size || a.k - b.k);
  grid.counts.fill(0);
  let drawn = 0, best = -Infinity;
  const npix = grid.windowCounts.length;
  for (const { size } of order) {
    if (size > drawn) {
      drawQuantisedSky(size - drawn, grid.sampler, rnd, grid.counts, grid.ringCounts);
      drawn = size;
    }
    if (size === 0) continue;
    prefixSumsByRing(grid.counts, grid.sampler.fine, grid.scratch);
    for (let k = 0; k < grid.plans.length; k++) {
      const counts = countQuantisedInWindows(grid.plans[k], grid.scratch, grid.windowCounts);
      const f = grid.fractions[k];
      for (let p = 0; p < npix; p++) {
        const c = counts[p];
        if (best >= 0 && c <= f[p] * size) continue; // not above expectation: negative significance
        const s = liMaSignificanceFromFraction(c, size, f[p]);
        if (s > best) best = s;
      }
    }
  }
  return best;
}

if (!isMainThread && parentPort && (workerData as TrialContextData | undefined)?.siderea === "trials") {
  const port = parentPort;
  let ctx: TrialContext | null = null;
  port.on("message", (msg: { type: string; from: number; to: number }) => {
    if (msg.type !== "run") return;
    try {
      ctx ??= createTrialContext(workerData as TrialContextData);
      const best = new Float64Array(msg.to - msg.from);
      for (let k = msg.from; k < msg.to; k++) best[k - msg.from] = runTrialSky(ctx, k);
      port.postMessage({ type: "done", from: msg.from, best }, [best.buffer]);
    } catch (err) {
      port.postMessage({ type: "error", message: err instanceof Error ? err.message : String(err) });
    }
  });
}
