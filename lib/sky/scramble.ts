/**
 * Data-driven expectations for arrays whose uptime and efficiency are not uniform
 * (METHODS section 4), both seeded and reproducible.
 *
 * 1. Time scrambling (Alexandreas et al. 1993, NIM A 328, 570): every event keeps its local
 *    (zenith, azimuth); its arrival time is replaced by another event's time. Siderea draws, for
 *    each repetition, a uniform random permutation of the observed times (Fisher-Yates), so the
 *    time distribution is kept exactly; nScramble repetitions give a reference set of
 *    N x nScramble ICRS directions, or a HEALPix expected-count map normalised to N.
 *
 * 2. Direct integration (Atkins et al. 2003, ApJ 595, 803): the local acceptance A(zenith,
 *    azimuth) is estimated by the events' histogram in (cos zenith, azimuth) cells, the event-rate
 *    history by the histogram of the events' local sidereal angles in time groups of equal
 *    counts (each group with its own precession-nutation matrix at its median time). Since the
 *    sky direction of a local direction depends on time only through the sidereal angle (and
 *    slowly through precession), the expected map is
 *      E(pixel) = sum_groups sum_lst-bins sum_cells n(group, lst-bin) A(cell) [direction in pixel],
 *    evaluated with one seeded jittered sample per (group, lst-bin, cell), i.e. a stratified
 *    Monte Carlo integration within each cell and bin. Normalised to N.
 */
import { RAD_PER_DEG } from "./constants";
import { horizontalToEquatorial, localApparentSiderealAngleRad, trueOfDateToIcrsMatrixAt, type AzimuthConvention, type Site } from "./coordinates";
import { nside2npix, vectorsToPixels, type HealpixMap, type HealpixOrder } from "./healpix";
import { createRandom } from "./random";
import type { UnitVectors } from "./vectors";

/** Events in local coordinates: zenith deg, azimuth deg (north-clockwise unless told), time Unix ms UTC. */
export interface LocalEvents {
  zenithDeg: ArrayLike<number>;
  azimuthDeg: ArrayLike<number>;
  unixMs: ArrayLike<number>;
}

/** Options of time scrambling. */
export interface ScrambleOptions {
  /** Repetitions, integer >= 1. */
  nScramble: number;
  seed: number;
  azimuthConvention?: AzimuthConvention;
}

function checkEvents(events: LocalEvents): number {
  const n = events.zenithDeg.length;
  if (events.azimuthDeg.length !== n || events.unixMs.length !== n) throw new RangeError("zenithDeg, azimuthDeg and unixMs lengths differ");
  if (n === 0) throw new RangeError("no events to scramble");
  return n;
}

function checkRepetitions(nScramble: number): void {
  if (!(Number.isInteger(nScramble) && nScramble >= 1)) throw new RangeError(`nScramble must be an integer >= 1, got ${nScramble}`);
}

/** Fisher-Yates shuffle of src into dst (seeded stream). */
function permute(src: ArrayLike<number>, dst: Float64Array, rnd: ReturnType<typeof createRandom>): void {
  const n = dst.length;
  for (let i = 0; i < n; i++) dst[i] = src[i];
  for (let i = n - 1; i > 0; i--) {
    const j = rnd.nextInt(i + 1);
    const t = dst[i]; dst[i] = dst[j]; dst[j] = t;
  }
}

/**
 * Time-scrambled reference directions (ICRS unit vectors), N x nScramble of them: block r
 * (elements r N .. r N + N - 1) is repetition r. Deterministic for a seed. Memory: 24 bytes per
 * direction; for large N prefer timeScrambledMap.
 */
export function timeScrambledDirections(events: LocalEvents, site: Site, options: ScrambleOptions): UnitVectors {
  const n = checkEvents(events);
  checkRepetitions(options.nScramble);
  const total = n * options.nScramble;
  const out: UnitVectors = { x: new Float64Array(total), y: new Float64Array(total), z: new Float64Array(total) };
  const rnd = createRandom(options.seed);
  const times = new Float64Array(n);
  for (let r = 0; r < options.nScramble; r++) {
    permute(events.unixMs, times, rnd);
    const eq = horizontalToEquatorial({ zenithDeg: events.zenithDeg, azimuthDeg: events.azimuthDeg, unixMs: times }, site, { azimuthConvention: options.azimuthConvention });
    out.x.set(eq.x, r * n); out.y.set(eq.y, r * n); out.z.set(eq.z, r * n);
  }
  return out;
}

/**
 * Time-scrambling expected-count map at nside/order in ICRS: counts of the scrambled
 * directions divided by nScramble, so the map sums to N. Float64Array data. Processes one
 * repetition at a time (memory ~ N). Deterministic for a seed; the same seed gives the same
 * directions as timeScrambledDirections.
 */
export function timeScrambledMap(events: LocalEvents, site: Site, options: ScrambleOptions & { nside: number; order: HealpixOrder }): HealpixMap {
  const n = checkEvents(events);
  checkRepetitions(options.nScramble);
  const data = new Float64Array(nside2npix(options.nside));
  const rnd = createRandom(options.seed);
  const times = new Float64Array(n);
  const pix = new Int32Array(n);
  const w = 1 / options.nScramble;
  for (let r = 0; r < options.nScramble; r++) {
    permute(events.unixMs, times, rnd);
    const eq = horizontalToEquatorial({ zenithDeg: events.zenithDeg, azimuthDeg: events.azimuthDeg, unixMs: times }, site, { azimuthConvention: options.azimuthConvention });
    vectorsToPixels(options.nside, options.order, eq, pix);
    for (let i = 0; i < n; i++) if (pix[i] >= 0) data[pix[i]] += w;
  }
  return { nside: options.nside, order: options.order, data };
}

/** Options of direct integration. */
export interface DirectIntegrationOptions {
  nside: number;
  order: HealpixOrder;
  seed: number;
  azimuthConvention?: AzimuthConvention;
  /** Acceptance cells: bins in cos(zenith) between cos(max observed zenith) and 1 (default 30). */
  zenithBins?: number;
  /** Acceptance cells in azimuth over 360 deg (default 72, 5 deg). */
  azimuthBins?: number;
  /** Bins of local sidereal angle over 2 pi (default 360, 1 deg). */
  siderealBins?: number;
  /** Time groups of equal event counts, each with its own precession (default 4). */
  timeGroups?: number;
}

/**
 * Direct-integration expected-count map (Atkins et al. 2003; see the module comment) at
 * nside/order in ICRS, normalised to N events. Deterministic for a seed.
 */
export function directIntegrationMap(events: LocalEvents, site: Site, options: DirectIntegrationOptions): HealpixMap {
  const n = checkEvents(events);
  const nZen = options.zenithBins ?? 30, nAz = options.azimuthBins ?? 72, nLst = options.siderealBins ?? 360;
  const nGroups = Math.min(options.timeGroups ?? 4, n);
  for (const [k, v] of [["zenithBins", nZen], ["azimuthBins", nAz], ["siderealBins", nLst], ["timeGroups", nGroups]] as const) {
    if (!(Number.isInteger(v) && v >= 1)) throw new RangeError(`${k} must be an integer >= 1, got ${v}`);
  }
  const eastCcw = options.azimuthConvention === "east-counterclockwise";
  // acceptance histogram in (cos zenith, azimuth)
  let zMaxDeg = 0;
  for (let i = 0; i < n; i++) if (events.zenithDeg[i] > zMaxDeg) zMaxDeg = events.zenithDeg[i];
  const cosMin = Math.cos(Math.min(90, zMaxDeg) * RAD_PER_DEG);
  const dCos = (1 - cosMin) / nZen || 1;
  const acc = new Float64Array(nZen * nAz);
  for (let i = 0; i < n; i++) {
    const c = Math.cos(events.zenithDeg[i] * RAD_PER_DEG);
    let a = eastCcw ? 90 - events.azimuthDeg[i] : events.azimuthDeg[i];
    a %= 360; if (a < 0) a += 360;
    const kz = Math.min(nZen - 1, Math.max(0, Math.floor((c - cosMin) / dCos)));
    const ka = Math.min(nAz - 1, Math.floor((a / 360) * nAz));
    acc[kz * nAz + ka] += 1 / n;
  }
  const cells: number[] = [];
  for (let k = 0; k < acc.length; k++) if (acc[k] > 0) cells.push(k);

  // time groups of equal counts (by sorted time) and their sidereal-angle histograms
  const order = Array.from({ length: n }, (_, i) => i).sort((p, q) => events.unixMs[p] - events.unixMs[q]);
  const sortedT = Float64Array.from(order, (i) => events.unixMs[i]);
  const lst = localApparentSiderealAngleRad(sortedT, site.longitudeDeg);
  const phi = site.latitudeDeg * RAD_PER_DEG, sphi = Math.sin(phi), cphi = Math.cos(phi);
  const data = new Float64Array(nside2npix(options.nside));
  const rnd = createRandom(options.seed);
  const batch = 1 << 16;
  const bx = new Float64Array(batch), by = new Float64Array(batch), bz = new Float64Array(batch), bw = new Float64Array(batch);
  const pix = new Int32Array(batch);
  let fill = 0;
  const flush = () => {
    vectorsToPixels(options.nside, options.order, { x: bx.subarray(0, fill), y: by.subarray(0, fill), z: bz.subarray(0, fill) }, pix);
    for (let k = 0; k < fill; k++) if (pix[k] >= 0) data[pix[k]] += bw[k];
    fill = 0;
  };
  const hist = new Float64Array(nLst);
  for (let g = 0; g < nGroups; g++) {
    const i0 = Math.floor((g * n) / nGroups), i1 = Math.floor(((g + 1) * n) / nGroups);
    if (i1 <= i0) continue;
    hist.fill(0);
    for (let i = i0; i < i1; i++) hist[Math.min(nLst - 1, Math.floor((lst[i] / (2 * Math.PI)) * nLst))]++;
    const m = trueOfDateToIcrsMatrixAt(sortedT[(i0 + i1 - 1) >> 1]);
    for (let b = 0; b < nLst; b++) {
      if (hist[b] === 0) continue;
      for (const cell of cells) {
        const kz = Math.floor(cell / nAz), ka = cell - kz * nAz;
        const cz = cosMin + dCos * (kz + rnd.next());
        const sz = Math.sqrt(Math.max(0, 1 - cz * cz));
        const ar = ((ka + rnd.next()) / nAz) * 2 * Math.PI;
        const th = ((b + rnd.next()) / nLst) * 2 * Math.PI;
        const e = sz * Math.sin(ar), nn = sz * Math.cos(ar);
        const xm = cphi * cz - sphi * nn, zm = sphi * cz + cphi * nn;
        const ct = Math.cos(th), st = Math.sin(th);
        const xt = ct * xm - st * e, yt = st * xm + ct * e;
        bx[fill] = m[0] * xt + m[1] * yt + m[2] * zm;
        by[fill] = m[3] * xt + m[4] * yt + m[5] * zm;
        bz[fill] = m[6] * xt + m[7] * yt + m[8] * zm;
        bw[fill] = hist[b] * acc[cell];
        if (++fill === batch) flush();
      }
    }
  }
  if (fill) flush();
  return { nside: options.nside, order: options.order, data };
}
