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
}

/** Prepared state for running skies (sampler, geometry, buffers). */
export interface TrialContext {
  data: TrialContextData;
  sampler: DeclinationSampler | null;
  geometry: ScanGeometry;
  sky: SkyDirections;
  energies: Float64Array | null;
  workspace: SearchWorkspace;
}

/** Builds the per-thread state from the plain context data. */
export function createTrialContext(data: TrialContextData): TrialContext {
  const geometry = scanGeometry(data.search.nside);
  const n = data.nEvents;
  return {
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
