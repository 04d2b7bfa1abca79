/**
 * Isotropic trial skies on a fine HEALPix grid, and their exact window counts by per-ring
 * prefix sums (METHODS section 5, the top-hat windows; Gorski et al. 2005 for the RING
 * geometry).
 *
 * A post-trial probability needs many isotropic skies with as many events as the data (a
 * million or more), each scanned like the data. Drawing and indexing a million continuous
 * directions per sky costs more than the scan itself, so trial skies are drawn directly on a
 * fine grid: every simulated event sits at the centre of a pixel of the RING grid at
 * `fineNside` (default 512, pixels of 0.11 deg, far below the angular resolution of air-shower
 * arrays). The sky is then a count map, drawn in O(1) per event, and the number of events
 * within psi of a window centre is, for each fine ring, a contiguous run of that ring's pixels,
 * counted as a difference of the ring's prefix sums: no per-event work in the scan at all.
 *
 * Drawing: the probability of fine ring r is the integral of the exposure-weighted density
 * over its band of z = sin(dec), the band edges half-way between neighbouring ring centres
 * (so the sky is the continuous isotropic sky with every event moved to the ring of its band),
 * shared equally by the ring's pixels (the exposure does not depend on right ascension in the
 * frame it is drawn in). Rings by Walker's alias method (Walker 1977; Vose 1991), the pixel
 * in the ring uniformly: two uniform deviates per event.
 *
 * Expectation: the probability that one event of such a sky falls in a window is the sum of
 * the probabilities of the fine pixels whose centres are inside it (windowProbabilities), the
 * exact counterpart of the cap integral for these skies; searching them with cap integrals
 * instead would give each window a slightly wrong expectation (the pixel centres inside a cap
 * do not cover its area exactly: about 0.1 sigma at a million events on an Nside-256 grid).
 *
 * Counting: window centre c (declination dc, longitude phi_c) and fine ring r (declination
 * d_r): a pixel centre at longitude phi is inside when cos psi <= sin dc sin d_r +
 * cos dc cos d_r cos(phi - phi_c) (spherical law of cosines), i.e. |phi - phi_c| <= Delta with
 * Delta = acos((cos psi - sin dc sin d_r) / (cos dc cos d_r)), computed once per (window
 * ring, fine ring) since all windows of a ring share dc. The decision differs from a dot
 * product of unit vectors only for pixel centres within about 1e-12 rad of a window's edge.
 */
import { ringTable, type RingTable } from "./ring-geometry";
import type { Random } from "./random";

/** Default fine grid of trial skies: Nside 512 (3,145,728 pixels of 0.115 deg). */
export const TRIAL_SKY_FINE_NSIDE = 512;

/** Sampler of quantised skies: the fine ring table and an alias table over its rings. */
export interface QuantisedSkySampler {
  fine: RingTable;
  /** Walker alias table over rings: keep ring r with probability aliasKeep[r], else take aliasOther[r]. */
  aliasKeep: Float64Array;
  aliasOther: Int32Array;
  /** Probability of each fine ring (sums to 1). */
  ringProbability: Float64Array;
}

/**
 * Builds the sampler from an exposure tabulated on a uniform grid of z = sin(dec) (as made
 * by isotropic.ts tabulateZDensity: value k at z = -1 + 2k/m, any normalisation, >= 0).
 * Throws if the exposure vanishes everywhere.
 */
export function createQuantisedSkySampler(zDensity: Float64Array, fineNside = TRIAL_SKY_FINE_NSIDE): QuantisedSkySampler {
  const fine = ringTable(fineNside);
  const m = zDensity.length - 1;
  if (!(m >= 1)) throw new RangeError("z-density table needs at least 2 values");
  const dz = 2 / m;
  // Exact integral of the piecewise-linear table from -1 to z.
  const cum = new Float64Array(m + 1);
  for (let k = 0; k < m; k++) cum[k + 1] = cum[k] + 0.5 * (zDensity[k] + zDensity[k + 1]) * dz;
  const integralTo = (z: number): number => {
    if (z <= -1) return 0;
    if (z >= 1) return cum[m];
    const u = (z + 1) / dz;
    let k = Math.floor(u);
    if (k >= m) k = m - 1;
    const s = u - k, a = zDensity[k], b = zDensity[k + 1];
    return cum[k] + dz * (a * s + ((b - a) * s * s) / 2);
  };
  const R = fine.nRings;
  const prob = new Float64Array(R);
  let total = 0;
  for (let r = 0; r < R; r++) {
    // Rings run from the north pole (r = 0) southwards; band edges half-way between centres.
    const zHi = r === 0 ? 1 : 0.5 * (fine.z[r - 1] + fine.z[r]);
    const zLo = r === R - 1 ? -1 : 0.5 * (fine.z[r] + fine.z[r + 1]);
    const w = Math.max(0, integralTo(zHi) - integralTo(zLo));
    prob[r] = w;
    total += w;
  }
  if (!(total > 0)) throw new RangeError("exposure is zero everywhere");
  for (let r = 0; r < R; r++) prob[r] /= total;
  // Vose's alias construction.
  const keep = new Float64Array(R), other = new Int32Array(R);
  const scaled = Float64Array.from(prob, (p) => p * R);
  const small: number[] = [], large: number[] = [];
  for (let r = 0; r < R; r++) (scaled[r] < 1 ? small : large).push(r);
  while (small.length && large.length) {
    const s = small.pop()!, l = large[large.length - 1]!;
    keep[s] = scaled[s];
    other[s] = l;
    scaled[l] = scaled[l] + scaled[s] - 1;
    if (scaled[l] < 1) { large.pop(); small.push(l); }
  }
  for (const r of large) { keep[r] = 1; other[r] = r; }
  for (const r of small) { keep[r] = 1; other[r] = r; }
  return { fine, aliasKeep: keep, aliasOther: other, ringProbability: prob };
}

/**
 * Adds n isotropic events to a fine RING count map (length 12 fineNside^2), in place: first
 * every event's ring by the alias table (one uniform deviate), then, ring by ring, each of the
 * ring's events to a uniformly chosen pixel (one deviate), so the increments stay within one
 * ring's few kilobytes instead of jumping across the whole map. Deterministic for a stream.
 */
export function drawQuantisedSky(n: number, sampler: QuantisedSkySampler, random: Random, counts: Int32Array, ringCounts?: Int32Array): void {
  const { fine, aliasKeep, aliasOther } = sampler;
  if (counts.length !== 12 * fine.nside * fine.nside) throw new RangeError("count map length does not match the fine Nside");
  const R = fine.nRings, nPix = fine.nPixels, first = fine.firstPixel;
  const perRing = ringCounts && ringCounts.length >= R ? ringCounts.fill(0, 0, R) : new Int32Array(R);
  // Deviates in blocks (random.fillUniform gives the values of successive next() calls); the
  // unused rest of the last block of the first pass is skipped. Inner loops run over whole
  // blocks, with no per-event test for the block's end.
  const BLOCK = 4096;
  const u = new Float64Array(BLOCK);
  for (let i = 0; i < n; i += BLOCK) {
    random.fillUniform(u);
    const m = Math.min(BLOCK, n - i);
    for (let k = 0; k < m; k++) {
      // One deviate: its integer part picks the column, the fraction is the coin (32-bit deviates
      // leave 20 or more bits for the coin with at most 4095 rings). The alias is taken without a
      // branch (the coin is unpredictable).
      const x = u[k] * R;
      const c = x | 0;
      const alias = (x - c >= aliasKeep[c]) as unknown as number;
      perRing[c + alias * (aliasOther[c] - c)]++;
    }
  }
  let at = BLOCK;
  for (let r = 0; r < R; r++) {
    const f = first[r], np = nPix[r];
    let left = perRing[r];
    while (left > 0) {
      if (at === BLOCK) { random.fillUniform(u); at = 0; }
      const take = Math.min(left, BLOCK - at);
      for (let k = at, end = at + take; k < end; k++) counts[f + ((u[k] * np) | 0)]++;
      at += take;
      left -= take;
    }
  }
}

/** Window geometry against the fine rings, for one scan grid and radius. */
export interface QuantisedWindowPlan {
  fine: RingTable;
  /** Scan (window) rings. */
  rings: RingTable;
  /** Pairs (fine ring, window ring), grouped by fine ring so that a fine ring's prefix sums stay in cache. */
  pairFine: Int32Array;
  pairWindow: Int32Array;
  /** Half-width in longitude of the window's intersection with the fine ring (radians); >= pi: the whole ring. */
  pairHalfWidthRad: Float64Array;
}

/**
 * Pairs every window ring of the scan grid with the fine rings that its windows of radius
 * psiRad (0, pi) reach, and the longitude half-width of each intersection.
 */
export function planQuantisedWindows(rings: RingTable, fine: RingTable, psiRad: number): QuantisedWindowPlan {
  if (!(psiRad > 0 && psiRad < Math.PI)) throw new RangeError(`window radius must be in (0, pi) rad, got ${psiRad}`);
  const cosPsi = Math.cos(psiRad);
  const fineOut: number[] = [], windowOut: number[] = [], half: number[] = [];
  for (let r = 0; r < fine.nRings; r++) {
    const dr = fine.latRad[r], cdr = Math.cos(dr), sdr = fine.z[r];
    for (let w = 0; w < rings.nRings; w++) {
      const dc = rings.latRad[w];
      if (Math.abs(dr - dc) > psiRad + 1e-9) continue;
      const t = (cosPsi - Math.sin(dc) * sdr) / (Math.cos(dc) * cdr);
      if (t > 1) continue; // no pixel centre of this ring is inside
      fineOut.push(r);
      windowOut.push(w);
      half.push(t <= -1 ? Math.PI : Math.acos(t));
    }
  }
  return { fine, rings, pairFine: Int32Array.from(fineOut), pairWindow: Int32Array.from(windowOut), pairHalfWidthRad: Float64Array.from(half) };
}

/** Scratch for countQuantisedInWindows: doubled per-ring prefix sums of a fine map. */
export interface QuantisedScratch {
  prefix: Int32Array;
  /** Start of fine ring r's prefix run (length 2 nPixels[r] + 1) in `prefix`. */
  base: Int32Array;
}

export function createQuantisedScratch(fine: RingTable): QuantisedScratch {
  const base = new Int32Array(fine.nRings);
  let at = 0;
  for (let r = 0; r < fine.nRings; r++) { base[r] = at; at += 2 * fine.nPixels[r] + 1; }
  return { prefix: new Int32Array(at), base };
}

/** Fills the scratch with the prefix sums of a fine RING count map (each ring's run twice, for wrap-around). */
export function prefixSumsByRing(counts: Int32Array, fine: RingTable, scratch: QuantisedScratch): void {
  const { prefix, base } = scratch;
  for (let r = 0; r < fine.nRings; r++) {
    const n = fine.nPixels[r], f = fine.firstPixel[r];
    let b = base[r], acc = 0;
    prefix[b] = 0;
    for (let k = 0; k < n; k++) { acc += counts[f + k]; prefix[++b] = acc; }
    for (let k = 0; k < n; k++) { acc += counts[f + k]; prefix[++b] = acc; }
  }
}

/**
 * Number of events of a fine count map (prefix sums already in `scratch`) in every window of
 * the plan, RING order of the scan grid, written to `out` (length of the scan grid's pixels).
 */
export function countQuantisedInWindows(plan: QuantisedWindowPlan, scratch: QuantisedScratch, out: Int32Array): Int32Array {
  const { fine, rings, pairFine, pairWindow, pairHalfWidthRad } = plan;
  const { prefix, base } = scratch;
  out.fill(0);
  for (let q = 0; q < pairFine.length; q++) {
    const r = pairFine[q], w = pairWindow[q], delta = pairHalfWidthRad[q];
    const first = rings.firstPixel[w], nWin = rings.nPixels[w];
    const n = fine.nPixels[r], b = base[r];
    const total = prefix[b + n];
    if (total === 0) continue;
    if (delta >= Math.PI) {
      for (let j = 0; j < nWin; j++) out[first + j] += total;
      continue;
    }
    // Pixel k of ring r is at phi0 + k dPhi; inside when a <= k <= a + width, with a the
    // (fractional) pixel position of phi_c - Delta.
    const inv = 1 / fine.dPhiRad[r];
    const a0 = (rings.phi0Rad[w] - delta - fine.phi0Rad[r]) * inv, width = 2 * delta * inv;
    const stepInt = n / nWin;
    if (Number.isInteger(stepInt)) {
      // The fine ring has a whole number S of pixels per window step: window j's run is window
      // 0's run moved by j S pixels, so no rounding per window (two plain loops either side of
      // the wrap at 2 pi).
      let lo = Math.ceil(a0) | 0;
      const len = (Math.floor(a0 + width) | 0) - lo;
      if (len < 0) continue;
      if (len + 1 >= n) { for (let j = 0; j < nWin; j++) out[first + j] += total; continue; }
      if (lo < 0) lo += n; else if (lo >= n) lo -= n;
      // run of window j: prefix indices b + lo + j S .. b + lo + j S + len + 1 (the doubled ring
      // holds them while lo + j S < n; afterwards lo + j S - n)
      const jWrap = Math.min(nWin, Math.ceil((n - lo) / stepInt));
      let o = b + lo;
      for (let j = 0; j < jWrap; j++, o += stepInt) out[first + j] += prefix[o + len + 1] - prefix[o];
      o = b + lo + jWrap * stepInt - n;
      for (let j = jWrap; j < nWin; j++, o += stepInt) out[first + j] += prefix[o + len + 1] - prefix[o];
      continue;
    }
    const step = rings.dPhiRad[w] * inv;
    for (let j = 0; j < nWin; j++) {
      const a = a0 + j * step;
      let lo = Math.ceil(a) | 0;
      let hi = Math.floor(a + width) | 0;
      if (hi < lo) continue;
      if (hi - lo + 1 >= n) { out[first + j] += total; continue; }
      if (lo < 0) { lo += n; hi += n; } else if (lo >= n) { lo -= n; hi -= n; }
      out[first + j] += prefix[b + hi + 1] - prefix[b + lo];
    }
  }
  return out;
}

/**
 * Probability that one event of a quantised sky falls in each window of the plan (RING order
 * of the scan grid): the sum over the fine pixels inside (by the same runs as the counts) of
 * their probabilities, ringProbability[r] / nPixels[r]. The N_exp of a quantised sky of n
 * events is n times this.
 */
export function windowProbabilities(plan: QuantisedWindowPlan, sampler: QuantisedSkySampler): Float64Array {
  const { fine, rings, pairFine, pairWindow, pairHalfWidthRad } = plan;
  if (sampler.fine.nside !== fine.nside) throw new RangeError("sampler and plan use different fine grids");
  const out = new Float64Array(12 * rings.nside * rings.nside);
  for (let q = 0; q < pairFine.length; q++) {
    const r = pairFine[q], w = pairWindow[q], delta = pairHalfWidthRad[q];
    const n = fine.nPixels[r], perPixel = sampler.ringProbability[r] / n;
    if (perPixel === 0) continue;
    const first = rings.firstPixel[w], nWin = rings.nPixels[w];
    if (delta >= Math.PI) {
      for (let j = 0; j < nWin; j++) out[first + j] += n * perPixel;
      continue;
    }
    const inv = 1 / fine.dPhiRad[r];
    const a0 = (rings.phi0Rad[w] - delta - fine.phi0Rad[r]) * inv, width = 2 * delta * inv, step = rings.dPhiRad[w] * inv;
    const stepInt = n / nWin;
    for (let j = 0; j < nWin; j++) {
      // the same runs as countQuantisedInWindows (the fixed-stride form there gives the same lengths)
      const a = Number.isInteger(stepInt) ? a0 : a0 + j * step;
      const lo = Math.ceil(a) | 0, len = (Math.floor(a + width) | 0) - lo;
      if (len < 0) continue;
      out[first + j] += (len + 1 >= n ? n : len + 1) * perPixel;
    }
  }
  return out;
}
