/**
 * Exact top-hat window scan (METHODS section 5).
 *
 * Windows are spherical caps of radius psi centred on the RING pixel centres of the scan
 * Nside (Gorski et al. 2005; centres from ring-geometry.ts). N_on is the exact number of
 * events with  x*cx + y*cy + z*cz >= cos(psi)  (the dot product of unit vectors, evaluated
 * in this order, which is also what the brute-force reference in the tests does).
 *
 * Two exact counters, picked by a cost estimate (or by the caller):
 *
 * 1. "strips" (gather, for many events). The events are indexed once: the sphere is cut
 *    into declination strips of height h (default 0.4 deg); each strip into equal cells
 *    in right ascension of width about c (default 0.05 deg at the strip's widest circle);
 *    events are sorted by (strip, cell) with a CSR offset table, so that the events of any
 *    run of cells are one contiguous slice and a run's count is a difference of offsets
 *    (each strip's coordinates are also stored twice in a row, interleaved, so that a run
 *    across RA 0/360 is contiguous too).
 *    For a window centred at declination dc and a strip [d0, d1], the cap's half-width in
 *    RA, dRA(dec) (spherical law of cosines), is unimodal in dec (its only stationary
 *    point is sin d* = sin dc / cos psi), so its minimum and maximum over the strip are
 *    taken at the strip ends or at d*. Cells entirely within +- min dRA of the centre
 *    are counted from the offsets with no per-event work; the events of cells that reach
 *    into +- max dRA are tested one by one with the dot product; everything else is
 *    outside. Bounds are widened by 1e-9 rad so round-off can only send an event to the
 *    exact test, never miscount it. All windows of one ring share dc, so the per-strip
 *    bounds are computed once per ring; strips are the outer loop so that a strip's data
 *    stay in cache for every ring that reaches it. Cost ~ windows x strips-per-window +
 *    edge events (counted with the default 0.4 deg strips and 0.05 deg cells: 3.5e6
 *    window-strip pairs and 4.2e7 edge tests for 1e6 events at Nside 64, 20 deg; about
 *    70% of the time goes to the edge tests).
 *
 * 2. "scatter" (for few events). For each event and each ring within psi in declination,
 *    the windows containing the event form one contiguous arc of the ring: its ends are
 *    estimated from dRA and then settled with the exact dot product against the
 *    neighbouring centres; the arc is added to a per-ring difference array, prefix-summed
 *    at the end. Cost ~ events x rings-within-psi.
 *
 * Expected counts: N_exp = f N with f = cap exposure / total exposure (cap-exposure.ts)
 * for a declination-only exposure, the epoch mean of f at the centre's declination of
 * date for a precessed exposure, or N_exp = (count of a scrambled reference set) / nScramble.
 * alpha = f / (1 - f), N_off = N - N_on; significance by Li & Ma 1983 eq. 17, signed.
 */
import { capExposureFractionTable, capExposureFractions, capHalfWidthRaRad, type CapQuadratureOptions, type DeclinationExposure } from "./cap-exposure";
import { liMaSignificanceFromFraction } from "./lima";
import { ringCentres, ringTable, type RingCentres, type RingTable } from "./ring-geometry";

const HALF_PI = Math.PI / 2;
const TWO_PI = 2 * Math.PI;
/** Widening of every geometric bound (radians) so round-off only ever routes an event to the exact test. */
const MARGIN_RAD = 1e-9;

/**
 * Events indexed for exact window counting: strips of declination, equal RA cells per strip,
 * events sorted by (strip, cell) and stored as interleaved unit vectors, each strip twice.
 */
export interface EventIndex {
  n: number;
  nStrips: number;
  /** Strip height, radians (pi / nStrips); strip s covers declinations [-pi/2 + s h, -pi/2 + (s + 1) h]. */
  stripHeightRad: number;
  /** Number of RA cells of each strip (cell k covers RA [k, k + 1) 2 pi / cells). */
  stripCells: Int32Array;
  /** Index of each strip's first cell in `offsets`. */
  stripCellBase: Int32Array;
  /** CSR: events of global cell k are sorted positions offsets[k] .. offsets[k + 1] - 1 (strip s starts at offsets[stripCellBase[s]]). */
  offsets: Int32Array;
  /**
   * Interleaved ICRS x, y, z of each strip's events written twice in a row (the strip starting
   * at sorted position a with m events occupies events 2a .. 2a + 2m - 1), so a run of cells
   * across RA 0/360 is one contiguous slice for the exact edge test.
   */
  wrapped: Float64Array;
}

/** Index geometry options (defaults tuned on a shared 2-core machine for 1e6 events, 20 deg windows). */
export interface EventIndexOptions {
  /** Declination strip height, degrees (default 0.4). */
  stripHeightDeg?: number;
  /** Target RA cell width on the strip's widest circle, degrees (default 0.05). */
  cellWidthDeg?: number;
}

/**
 * Builds the strip/cell index of n directions given as unit vectors (any frame; the scan
 * is in the same frame, ICRS for Siderea). Vectors must be unit length to ~1e-12. O(n)
 * (two counting sorts); copies the input.
 */
export function buildEventIndex(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, options: EventIndexOptions = {}): EventIndex {
  const n = x.length;
  if (y.length !== n || z.length !== n) throw new RangeError("x, y, z must have the same length");
  const nStrips = Math.max(1, Math.round(180 / (options.stripHeightDeg ?? 0.4)));
  const h = Math.PI / nStrips;
  const cellRad = ((options.cellWidthDeg ?? 0.05) * Math.PI) / 180;
  const stripCells = new Int32Array(nStrips);
  const stripCellBase = new Int32Array(nStrips);
  let totalCells = 0;
  for (let s = 0; s < nStrips; s++) {
    const d0 = -HALF_PI + s * h, d1 = d0 + h;
    const widest = d0 <= 0 && d1 >= 0 ? 1 : Math.max(Math.cos(d0), Math.cos(d1));
    const cells = Math.max(1, Math.min(1 << 20, Math.ceil((TWO_PI * widest) / cellRad)));
    stripCells[s] = cells;
    stripCellBase[s] = totalCells;
    totalCells += cells;
  }
  // Pass 1: strip and cell of every event. Pass 2: counting sort by strip into one interleaved
  // buffer (one sequential output stream per strip). Pass 3: per strip (in cache), counting
  // sort by cell straight into both copies of `wrapped`.
  const stripOf = new Int32Array(n), cellOf = new Int32Array(n);
  const stripStart = new Int32Array(nStrips + 1);
  for (let i = 0; i < n; i++) {
    const zi = z[i];
    const dec = zi >= 1 ? HALF_PI : zi <= -1 ? -HALF_PI : Math.asin(zi);
    let ra = Math.atan2(y[i], x[i]);
    if (ra < 0) ra += TWO_PI;
    if (ra >= TWO_PI) ra = 0;
    let s = Math.floor((dec + HALF_PI) / h);
    if (s >= nStrips) s = nStrips - 1; else if (s < 0) s = 0;
    const cells = stripCells[s];
    let k = Math.floor((ra * cells) / TWO_PI);
    if (k >= cells) k = cells - 1;
    stripOf[i] = s;
    cellOf[i] = k;
    stripStart[s + 1]++;
  }
  for (let s = 0; s < nStrips; s++) stripStart[s + 1] += stripStart[s];
  const cur = stripStart.slice(0, nStrips);
  const byStrip = new Float64Array(3 * n), cellByStrip = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const p = cur[stripOf[i]]++;
    const q = 3 * p;
    byStrip[q] = x[i]; byStrip[q + 1] = y[i]; byStrip[q + 2] = z[i];
    cellByStrip[p] = cellOf[i];
  }
  const offsets = new Int32Array(totalCells + 1);
  const wrapped = new Float64Array(6 * n);
  let fill = new Int32Array(0);
  for (let s = 0; s < nStrips; s++) {
    const a = stripStart[s], b = stripStart[s + 1], m = b - a, cells = stripCells[s], base = stripCellBase[s];
    if (fill.length < cells + 1) fill = new Int32Array(cells + 1);
    fill.fill(0, 0, cells + 1);
    for (let p = a; p < b; p++) fill[cellByStrip[p] + 1]++;
    fill[0] = a;
    for (let k = 0; k < cells; k++) fill[k + 1] += fill[k];
    offsets.set(fill.subarray(0, cells), base);
    // Sorted position P of the strip is event a + P of `wrapped` (the strip starts at 2 a there).
    for (let p = a; p < b; p++) {
      const q = 3 * (a + fill[cellByStrip[p]]++), r = q + 3 * m, o = 3 * p;
      const xi = byStrip[o], yi = byStrip[o + 1], zi = byStrip[o + 2];
      wrapped[q] = xi; wrapped[q + 1] = yi; wrapped[q + 2] = zi;
      wrapped[r] = xi; wrapped[r + 1] = yi; wrapped[r + 2] = zi;
    }
  }
  offsets[totalCells] = n;
  return { n, nStrips, stripHeightRad: h, stripCells, stripCellBase, offsets, wrapped };
}

/** The indexed directions as separate arrays (strip order), with RA in [0, 2 pi) and declination, radians. */
function indexDirections(ix: EventIndex): { n: number; x: Float64Array; y: Float64Array; z: Float64Array; raRad: Float64Array; decRad: Float64Array } {
  const n = ix.n;
  const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
  let i = 0;
  for (let s = 0; s < ix.nStrips; s++) {
    const a = ix.offsets[ix.stripCellBase[s]], b = ix.offsets[ix.stripCellBase[s] + ix.stripCells[s]];
    for (let e = 2 * a, end = a + b; e < end; e++, i++) {
      x[i] = ix.wrapped[3 * e]; y[i] = ix.wrapped[3 * e + 1]; z[i] = ix.wrapped[3 * e + 2];
    }
  }
  const raRad = new Float64Array(n), decRad = new Float64Array(n);
  fillRaDec(x, y, z, n, raRad, decRad);
  return { n, x, y, z, raRad, decRad };
}

/** RA in [0, 2 pi) and declination (radians) of unit vectors, the same conventions as the index. */
function fillRaDec(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, n: number, raRad: Float64Array, decRad: Float64Array): void {
  for (let i = 0; i < n; i++) {
    const zi = z[i];
    decRad[i] = zi >= 1 ? HALF_PI : zi <= -1 ? -HALF_PI : Math.asin(zi);
    let ra = Math.atan2(y[i], x[i]);
    if (ra < 0) ra += TWO_PI;
    raRad[i] = ra >= TWO_PI ? 0 : ra;
  }
}

/** Ring table and centre vectors of one scan Nside, computed once and reused across scans. */
export interface ScanGeometry {
  nside: number;
  rings: RingTable;
  centres: RingCentres;
}

/** Window-centre geometry of a scan at nside (RING order; Gorski et al. 2005). */
export function scanGeometry(nside: number): ScanGeometry {
  return { nside, rings: ringTable(nside), centres: ringCentres(nside) };
}

/** Counting method of countEventsInWindows; "auto" picks by a cost estimate. */
export type WindowCountMethod = "auto" | "strips" | "scatter";

/**
 * Exact number of indexed events in every window of radius radiusRad (0 < psi < pi)
 * centred on the RING pixel centres of nside (or of a precomputed scanGeometry). Returns counts in RING pixel order
 * (length 12 nside^2). See the module comment for the two methods; both are exact.
 */
export function countEventsInWindows(index: EventIndex, nsideOrGeometry: number | ScanGeometry, radiusRad: number, method: WindowCountMethod = "auto"): Int32Array {
  if (!(radiusRad > 0 && radiusRad < Math.PI)) throw new RangeError(`window radius must be in (0, pi) rad, got ${radiusRad}`);
  const g = typeof nsideOrGeometry === "number" ? scanGeometry(nsideOrGeometry) : nsideOrGeometry;
  const { rings, centres, nside } = g;
  let m = method;
  if (m === "auto") {
    // Cost model (measured on a shared 2-core machine): strips ~ 60 ns per (window, strip)
    // pair plus ~20 ns per edge test; scatter ~ 70 ns per (event, ring) pair.
    const stripsPerWindow = Math.min(index.nStrips, (2 * radiusRad) / index.stripHeightRad + 1);
    const ringsPerEvent = Math.min(rings.nRings, (2 * radiusRad * (4 * nside)) / Math.PI + 1);
    const edgeFraction = Math.min(1, (4 * Math.sin(Math.min(radiusRad, Math.PI / 2)) * (index.stripHeightRad + 0.002)) / (4 * Math.PI));
    const stripCost = 60 * 12 * nside * nside * Math.min(stripsPerWindow, index.nStrips) + 20 * 12 * nside * nside * index.n * edgeFraction;
    const scatterCost = 70 * index.n * ringsPerEvent;
    m = scatterCost < stripCost ? "scatter" : "strips";
  }
  return m === "scatter" ? countByScatter(indexDirections(index), rings, centres, radiusRad) : countByStrips(index, rings, centres, radiusRad);
}

/**
 * Exact window counts for bare directions (unit vectors, same length) without building an
 * index, by the scatter method: the fast path for small samples such as trial skies.
 * raRad / decRad are filled into `work` when given (length >= n). Reuses `scratch` if given;
 * the returned array is then scratch.out (overwritten by the next call).
 */
export function countDirectionsInWindows(
  dirs: { x: Float64Array; y: Float64Array; z: Float64Array; n?: number },
  geometry: ScanGeometry, radiusRad: number,
  work?: { raRad: Float64Array; decRad: Float64Array }, scratch?: ScatterScratch,
): Int32Array {
  if (!(radiusRad > 0 && radiusRad < Math.PI)) throw new RangeError(`window radius must be in (0, pi) rad, got ${radiusRad}`);
  const n = dirs.n ?? dirs.x.length;
  const raRad = work ? work.raRad : new Float64Array(n), decRad = work ? work.decRad : new Float64Array(n);
  fillRaDec(dirs.x, dirs.y, dirs.z, n, raRad, decRad);
  return countByScatter({ n, x: dirs.x, y: dirs.y, z: dirs.z, raRad, decRad }, geometry.rings, geometry.centres, radiusRad, scratch);
}

/** Scratch arrays for countDirectionsInWindows at one geometry. */
export function createScatterScratch(geometry: ScanGeometry): ScatterScratch {
  const npix = geometry.centres.x.length;
  return { diff: new Int32Array(npix + geometry.rings.nRings), out: new Int32Array(npix) };
}

function countByStrips(ix: EventIndex, rings: RingTable, c: RingCentres, psi: number): Int32Array {
  const out = new Int32Array(c.x.length);
  const cosPsi = Math.cos(psi);
  const { offsets, stripCells, stripCellBase, wrapped } = ix;
  const h = ix.stripHeightRad;
  const cx = c.x, cy = c.y, cz = c.z;
  const lat = rings.latRad;
  // Stationary point of the RA half-width in declination, per ring (NaN if none).
  const dStarOf = new Float64Array(rings.nRings);
  for (let r = 0; r < rings.nRings; r++) {
    const sinStar = Math.sin(lat[r]) / cosPsi;
    dStarOf[r] = Math.abs(sinStar) < 1 ? Math.asin(sinStar) : NaN;
  }
  // Strip-major order: a strip's events and offsets stay in cache for all rings that reach it.
  for (let s = 0; s < ix.nStrips; s++) {
    const base = stripCellBase[s], cells = stripCells[s];
    const stripStart0 = offsets[base], stripEnd = offsets[base + cells];
    if (stripStart0 === stripEnd) continue;
    const stripM = stripEnd - stripStart0;
    // offsets[...] + stripStart is the event position in `wrapped` (strip stored at 2 a).
    const stripStart = stripStart0;
    const d0 = Math.max(-HALF_PI, -HALF_PI + s * h - MARGIN_RAD);
    const d1 = Math.min(HALF_PI, -HALF_PI + (s + 1) * h + MARGIN_RAD);
    const inv = cells / TWO_PI;
    for (let r = firstRingBelow(lat, d1 + psi + MARGIN_RAD); r < rings.nRings; r++) {
      const dc = lat[r];
      if (dc < d0 - psi - MARGIN_RAD) break;
      const capLo = dc - psi, capHi = dc + psi, dStar = dStarOf[r];
      // Outer bound over the part of the strip within the cap's declination range.
      const o0 = Math.max(d0, capLo), o1 = Math.min(d1, capHi);
      if (o0 > o1) continue;
      let dOut = Math.max(capHalfWidthRaRad(o0, dc, psi), capHalfWidthRaRad(o1, dc, psi));
      if (dStar > o0 && dStar < o1) dOut = Math.max(dOut, capHalfWidthRaRad(dStar, dc, psi));
      // Inner bound: only if the whole strip lies within the cap's declination range.
      let dIn = -1;
      if (d0 >= capLo && d1 <= capHi) {
        dIn = Math.min(capHalfWidthRaRad(d0, dc, psi), capHalfWidthRaRad(d1, dc, psi));
        if (dStar > d0 && dStar < d1) dIn = Math.min(dIn, capHalfWidthRaRad(dStar, dc, psi));
      }
      const first = rings.firstPixel[r], nWin = rings.nPixels[r];
      if (dIn >= Math.PI) {
        const all = stripM;
        for (let j = 0; j < nWin; j++) out[first + j] += all;
        continue;
      }
      const phi0 = rings.phi0Rad[r], dPhi = rings.dPhiRad[r];
      const inCells = dIn > MARGIN_RAD ? (dIn - MARGIN_RAD) * inv : -1;
      const outWhole = dOut + MARGIN_RAD >= Math.PI;
      const outCells = (dOut + MARGIN_RAD) * inv;
      const whole = outWhole || 2 * outCells + 2 >= cells;
      for (let j = 0; j < nWin; j++) {
        const p = first + j;
        const u = (phi0 + j * dPhi) * inv;
        const qx = cx[p], qy = cy[p], qz = cz[p];
        let count = 0;
        let ki = inCells > 0 ? Math.ceil(u - inCells) | 0 : 0;
        let ke = inCells > 0 ? Math.floor(u + inCells) | 0 : 0;
        // Event slices in `wrapped` are addressed by cell index k in [0, 2 cells]:
        // pos(k) = (k <= cells ? offsets[base + k] : offsets[base + k - cells] + m) + a.
        let p0: number, p1: number, p2 = 0, p3 = 0;
        let ko = 0, kf = 0;
        if (!whole) { ko = Math.floor(u - outCells) | 0; kf = (Math.floor(u + outCells) | 0) + 1; }
        if (!whole && kf - ko < cells) {
          const sh = ko < 0 ? cells : ko >= cells ? -cells : 0;
          ko += sh; kf += sh;
          if (ki < ke) {
            ki += sh; ke += sh;
            const oi = (ki <= cells ? offsets[base + ki] : offsets[base + ki - cells] + stripM) + stripStart;
            const oe = (ke <= cells ? offsets[base + ke] : offsets[base + ke - cells] + stripM) + stripStart;
            count = oe - oi;
            p0 = (ko <= cells ? offsets[base + ko] : offsets[base + ko - cells] + stripM) + stripStart; p1 = oi;
            p2 = oe; p3 = (kf <= cells ? offsets[base + kf] : offsets[base + kf - cells] + stripM) + stripStart;
          } else {
            p0 = (ko <= cells ? offsets[base + ko] : offsets[base + ko - cells] + stripM) + stripStart;
            p1 = (kf <= cells ? offsets[base + kf] : offsets[base + kf - cells] + stripM) + stripStart;
          }
        } else if (ki < ke) {
          // The outer bound covers the whole circle: test the complement of the inner run.
          const sh = ke < 0 ? cells : ke >= cells ? -cells : 0;
          ki += sh; ke += sh;
          const oi = (ki <= cells ? offsets[base + ki] : offsets[base + ki - cells] + stripM) + stripStart;
          const oe = (ke <= cells ? offsets[base + ke] : offsets[base + ke - cells] + stripM) + stripStart;
          // If the inner run [ki, ke) starts below cell 0, it wraps: the complement is [ke, ki + cells).
          if (ki < 0) {
            const oi2 = offsets[base + ki + cells] + stripStart;
            count = oe + stripM - oi2;
            p0 = oe; p1 = oi2;
          } else {
            count = oe - oi;
            p0 = oe; p1 = oi + stripM;
          }
        } else {
          p0 = stripStart + stripStart0; p1 = p0 + stripM;
        }
        // The comparison's boolean is added as a number: no branch. An `if` or `? 1 : 0` here
        // becomes a branch that edge events mispredict half the time (the scan then took twice as long).
        for (let q = 3 * p0, qe = 3 * p1; q < qe; q += 3) count += (wrapped[q] * qx + wrapped[q + 1] * qy + wrapped[q + 2] * qz >= cosPsi) as unknown as number;
        for (let q = 3 * p2, qe = 3 * p3; q < qe; q += 3) count += (wrapped[q] * qx + wrapped[q + 1] * qy + wrapped[q + 2] * qz >= cosPsi) as unknown as number;
        out[p] += count;
      }
    }
  }
  return out;
}

/** Whether centre j (any integer, taken modulo the ring size) of a ring is within the window of an event. */
function centreInside(cx: Float64Array, cy: Float64Array, cz: Float64Array, first: number, nWin: number, j: number,
  ex: number, ey: number, ez: number, cosPsi: number): boolean {
  const p = first + (((j % nWin) + nWin) % nWin);
  return ex * cx[p] + ey * cy[p] + ez * cz[p] >= cosPsi;
}

/** Arrays the scatter counter may reuse between calls (one set per scan geometry). */
export interface ScatterScratch {
  diff: Int32Array;
  out: Int32Array;
}

function countByScatter(ix: { n: number; x: ArrayLike<number>; y: ArrayLike<number>; z: ArrayLike<number>; raRad: ArrayLike<number>; decRad: ArrayLike<number> }, rings: RingTable, c: RingCentres, psi: number, scratch?: ScatterScratch): Int32Array {
  const npix = c.x.length;
  const nRings = rings.nRings;
  // Ring r uses difference slots firstPixel[r] + r .. firstPixel[r] + r + nPixels[r].
  const diff = scratch ? scratch.diff.fill(0) : new Int32Array(npix + nRings);
  const out = scratch ? scratch.out.fill(0) : new Int32Array(npix);
  const cosPsi = Math.cos(psi);
  const cx = c.x, cy = c.y, cz = c.z;
  const lat = rings.latRad;
  const rhoRing = new Float64Array(nRings);
  for (let r = 0; r < nRings; r++) rhoRing[r] = Math.cos(lat[r]);
  for (let e = 0; e < ix.n; e++) {
    const ex = ix.x[e], ey = ix.y[e], ez = ix.z[e], ra = ix.raRad[e], dec = ix.decRad[e];
    const rhoE = Math.sqrt(Math.max(0, (1 - ez) * (1 + ez)));
    // Rings with |lat - dec| <= psi (+ margin); latRad decreases with r.
    const rFirst = firstRingBelow(lat, dec + psi + MARGIN_RAD);
    for (let r = rFirst; r < nRings; r++) {
      const dc = lat[r];
      if (dc < dec - psi - MARGIN_RAD) break;
      const first = rings.firstPixel[r], nWin = rings.nPixels[r];
      const slot = first + r;
      const t = (cosPsi - ez * cz[first]) / (rhoE * rhoRing[r]);
      // A distance bound of 1e-12 in t is a dot-product margin of 1e-12 rho rho_c: trusted only if rho rho_c >= 1e-3.
      const wellPosed = rhoE * rhoRing[r] >= 1e-3;
      if (wellPosed && t <= -1 - 1e-12) { diff[slot] += 1; diff[slot + nWin] -= 1; continue; }
      if (wellPosed && t >= 1 + 1e-12) continue;
      if (nWin <= 8 || !wellPosed || !(t > -1 + 1e-9)) {
        for (let j = 0; j < nWin; j++) if (centreInside(cx, cy, cz, first, nWin, j, ex, ey, ez, cosPsi)) { out[first + j] += 1; }
        continue;
      }
      const dPhi = rings.dPhiRad[r];
      const half = Math.acos(t < 1 ? t : 1) / dPhi;
      const jc = (ra - rings.phi0Rad[r]) / dPhi;
      const lo = jc - half, hi = jc + half;
      let jlo = Math.ceil(lo), jhi = Math.floor(hi);
      // Fast path: with |t| < 1 - 1e-6 the arc ends are known to ~1e-11 of a window spacing,
      // so when both lie more than 1e-7 spacings from a centre, no centre is near the edge and
      // rounding decides exactly what the dot product would.
      if (t > -1 + 1e-6 && t < 1 - 1e-6 && jlo - lo > 1e-7 && lo - (jlo - 1) > 1e-7 && hi - jhi > 1e-7 && jhi + 1 - hi > 1e-7
        && jhi - jlo + 1 < nWin - 1) {
        if (jhi >= jlo) {
          let a = jlo % nWin;
          if (a < 0) a += nWin;
          const len = jhi - jlo + 1;
          if (a + len <= nWin) { diff[slot + a] += 1; diff[slot + a + len] -= 1; }
          else { diff[slot + a] += 1; diff[slot + nWin] -= 1; diff[slot] += 1; diff[slot + a + len - nWin] -= 1; }
        }
        continue;
      }
      // Settle the arc's ends with the exact test (the inside set is one contiguous arc).
      while (jhi - jlo + 2 <= nWin && centreInside(cx, cy, cz, first, nWin, jlo - 1, ex, ey, ez, cosPsi)) jlo--;
      while (jlo <= jhi && !centreInside(cx, cy, cz, first, nWin, jlo, ex, ey, ez, cosPsi)) jlo++;
      while (jhi - jlo + 2 <= nWin && centreInside(cx, cy, cz, first, nWin, jhi + 1, ex, ey, ez, cosPsi)) jhi++;
      while (jhi >= jlo && !centreInside(cx, cy, cz, first, nWin, jhi, ex, ey, ez, cosPsi)) jhi--;
      if (jhi < jlo) {
        // Arc estimate empty: the nearest centres may still be inside (tangent ring).
        const jn = Math.round(jc);
        for (let j = jn - 1; j <= jn + 1; j++) if (centreInside(cx, cy, cz, first, nWin, j, ex, ey, ez, cosPsi)) out[first + (((j % nWin) + nWin) % nWin)] += 1;
        continue;
      }
      if (jhi - jlo + 1 >= nWin - 1) {
        for (let j = 0; j < nWin; j++) if (centreInside(cx, cy, cz, first, nWin, j, ex, ey, ez, cosPsi)) out[first + j] += 1;
        continue;
      }
      let a = ((jlo % nWin) + nWin) % nWin;
      const len = jhi - jlo + 1;
      if (a + len <= nWin) { diff[slot + a] += 1; diff[slot + a + len] -= 1; }
      else { diff[slot + a] += 1; diff[slot + nWin] -= 1; diff[slot] += 1; diff[slot + a + len - nWin] -= 1; }
    }
  }
  for (let r = 0; r < nRings; r++) {
    const first = rings.firstPixel[r], slot = first + r;
    let acc = 0;
    for (let j = 0; j < rings.nPixels[r]; j++) { acc += diff[slot + j]; out[first + j] += acc; }
  }
  return out;
}

/** First ring index whose latitude is <= latRad (ring latitudes decrease with the index). */
function firstRingBelow(lat: Float64Array, latRad: number): number {
  let lo = 0, hi = lat.length;
  while (lo < hi) { const mid = (lo + hi) >> 1; if (lat[mid] > latRad) lo = mid + 1; else hi = mid; }
  return lo;
}

/**
 * Exposure fraction f of every window (RING order, length 12 nside^2) for an exposure
 * depending on declination only (e.g. Sommers 2001 applied to ICRS declinations): one
 * cap integral per ring (cap-exposure.ts).
 */
export function declinationWindowFractions(nside: number, radiusRad: number, omega: DeclinationExposure, options: CapQuadratureOptions = {}): Float64Array {
  const rings = ringTable(nside);
  const perRing = capExposureFractions(omega, rings.latRad, radiusRad, options);
  const f = new Float64Array(12 * nside * nside);
  for (let r = 0; r < rings.nRings; r++) f.fill(perRing[r], rings.firstPixel[r], rings.firstPixel[r] + rings.nPixels[r]);
  return f;
}

/** One epoch of a precessed exposure: a weight and the rotation ICRS -> true equator of date. */
export interface ExposureEpoch {
  weight: number;
  /** Row-major 3x3 rotation from ICRS to the equator and equinox of date. */
  icrsToDate: ArrayLike<number>;
}

/**
 * Exposure fraction of every window for an exposure defined in the equator of date and
 * carried into ICRS over the data's epochs: f = sum_k w_k f_date(dec_k) / sum_k w_k with
 * dec_k the window centre's declination of date at epoch k (a cap stays a cap under the
 * rotation, only its centre moves). f_date is tabulated (capExposureFractionTable).
 */
export function precessedWindowFractions(nside: number, radiusRad: number, omegaOfDate: DeclinationExposure, epochs: ReadonlyArray<ExposureEpoch>, options: CapQuadratureOptions & { stepDeg?: number } = {}): Float64Array {
  if (epochs.length === 0) throw new RangeError("at least one epoch is needed");
  const table = capExposureFractionTable(omegaOfDate, radiusRad, options);
  const c = ringCentres(nside);
  const f = new Float64Array(c.x.length);
  let wSum = 0;
  for (const ep of epochs) wSum += ep.weight;
  for (const ep of epochs) {
    const m6 = ep.icrsToDate[6], m7 = ep.icrsToDate[7], m8 = ep.icrsToDate[8];
    const w = ep.weight / wSum;
    for (let p = 0; p < f.length; p++) {
      const zd = m6 * c.x[p] + m7 * c.y[p] + m8 * c.z[p];
      f[p] += w * table(zd >= 1 ? HALF_PI : zd <= -1 ? -HALF_PI : Math.asin(zd));
    }
  }
  return f;
}

/** How a scan gets its expected counts. */
export type ScanExpectation =
  /** Per-window exposure fractions f (RING order), N_exp = f N. */
  | { model: "fractions"; fraction: Float64Array; label?: string }
  /** Declination-only exposure; fractions from cap integrals. */
  | { model: "declination"; exposure: DeclinationExposure; quadrature?: CapQuadratureOptions; label?: string }
  /** Reference set (e.g. time-scrambled events): N_exp = weight x count of reference events in the window. */
  | { model: "reference"; reference: EventIndex; weight: number; label?: string };

/** Result of a scan: per-window arrays in RING order and the window of largest significance. */
export interface ScanResult {
  nside: number;
  radiusDeg: number;
  n: number;
  model: string;
  nOn: Int32Array;
  nExpected: Float64Array;
  /** Signed Li & Ma eq. 17 significance per window. */
  significance: Float64Array;
  max: { pixel: number; significance: number; raDeg: number; decDeg: number; nOn: number; nExpected: number };
  /** Milliseconds spent counting the events and computing expectations. */
  timingMs: { count: number; expectation: number; significance: number };
}

/**
 * Full-sky top-hat scan: radius in degrees (0, 180), windows at the RING centres of nside.
 * N = index.n. Reference: METHODS section 5; Li & Ma 1983 eq. 17.
 */
export function scanWindows(index: EventIndex, options: { nside: number; radiusDeg: number; expectation: ScanExpectation; method?: WindowCountMethod; geometry?: ScanGeometry }): ScanResult {
  const { nside, radiusDeg, expectation } = options;
  const geometry = options.geometry && options.geometry.nside === nside ? options.geometry : scanGeometry(nside);
  const psi = (radiusDeg * Math.PI) / 180;
  const t0 = performance.now();
  const nOn = countEventsInWindows(index, geometry, psi, options.method);
  const t1 = performance.now();
  const npix = nOn.length;
  const n = index.n;
  const nExpected = new Float64Array(npix);
  let fraction: Float64Array;
  if (expectation.model === "reference") {
    const ref = countEventsInWindows(expectation.reference, geometry, psi, options.method);
    fraction = new Float64Array(npix);
    for (let p = 0; p < npix; p++) { nExpected[p] = ref[p] * expectation.weight; fraction[p] = n > 0 ? nExpected[p] / n : 0; }
  } else {
    fraction = expectation.model === "fractions" ? expectation.fraction : declinationWindowFractions(nside, psi, expectation.exposure, expectation.quadrature);
    if (fraction.length !== npix) throw new RangeError(`expected ${npix} window fractions, got ${fraction.length}`);
    for (let p = 0; p < npix; p++) nExpected[p] = fraction[p] * n;
  }
  const t2 = performance.now();
  const significance = new Float64Array(npix);
  let best = 0;
  for (let p = 0; p < npix; p++) {
    const s = liMaSignificanceFromFraction(nOn[p], n, fraction[p]);
    significance[p] = s;
    if (s > significance[best] || Number.isNaN(significance[best])) best = p;
  }
  const t3 = performance.now();
  const c = geometry.centres;
  let raDeg = (c.phiRad[best] * 180) / Math.PI;
  if (raDeg >= 360) raDeg -= 360;
  const label = expectation.label ?? expectation.model;
  return {
    nside, radiusDeg, n, model: label, nOn, nExpected, significance,
    max: { pixel: best, significance: significance[best], raDeg, decDeg: (Math.asin(c.z[best]) * 180) / Math.PI, nOn: nOn[best], nExpected: nExpected[best] },
    timingMs: { count: t1 - t0, expectation: t2 - t1, significance: t3 - t2 },
  };
}

/**
 * A search: scans at several window radii and energy thresholds (METHODS section 5). The
 * window fractions are fixed per radius (they depend on the exposure, not on the events).
 */
export interface SearchSpec {
  nside: number;
  radiiDeg: ReadonlyArray<number>;
  /** Per radius (same order as radiiDeg): window exposure fractions f in RING order. */
  fractions: ReadonlyArray<Float64Array>;
  /** Energy thresholds in EeV; each selects the nested subset E >= threshold (unknown energies never pass). Empty: all events, one subset. */
  thresholdsEeV: ReadonlyArray<number>;
}

/** Best (largest signed Li-Ma) window of a search. */
export interface SearchBest {
  significance: number;
  radiusDeg: number;
  /** null when the search has no energy thresholds. */
  thresholdEeV: number | null;
  pixel: number;
  /** Events in the subset scanned. */
  n: number;
  nOn: number;
  nExpected: number;
}

/** Reusable arrays for searchBestWindow (sized for up to `capacity` events). */
export interface SearchWorkspace {
  capacity: number;
  x: Float64Array; y: Float64Array; z: Float64Array;
  raRad: Float64Array; decRad: Float64Array;
  scratch: ScatterScratch;
}

/** Allocates a workspace for searches of up to capacity events at a geometry. */
export function createSearchWorkspace(capacity: number, geometry: ScanGeometry): SearchWorkspace {
  return {
    capacity,
    x: new Float64Array(capacity), y: new Float64Array(capacity), z: new Float64Array(capacity),
    raRad: new Float64Array(capacity), decRad: new Float64Array(capacity),
    scratch: createScatterScratch(geometry),
  };
}

/**
 * Runs a search on one set of directions (unit vectors; energies in EeV or null) and
 * returns its best window over all radii and thresholds. Counting is exact (scatter for
 * small subsets, the strip index for large ones).
 */
export function searchBestWindow(
  dirs: { x: Float64Array; y: Float64Array; z: Float64Array },
  energyEeV: ArrayLike<number> | null,
  spec: SearchSpec, geometry: ScanGeometry, workspace?: SearchWorkspace,
): SearchBest {
  const nAll = dirs.x.length;
  const ws = workspace && workspace.capacity >= nAll ? workspace : createSearchWorkspace(nAll, geometry);
  const best: SearchBest = { significance: -Infinity, radiusDeg: NaN, thresholdEeV: null, pixel: -1, n: 0, nOn: 0, nExpected: 0 };
  const thresholds: ReadonlyArray<number | null> = spec.thresholdsEeV.length > 0 ? spec.thresholdsEeV : [null];
  const npix = geometry.centres.x.length;
  for (const thr of thresholds) {
    let n = 0;
    if (thr === null || energyEeV === null) {
      ws.x.set(dirs.x); ws.y.set(dirs.y); ws.z.set(dirs.z); n = nAll;
    } else {
      for (let i = 0; i < nAll; i++) if (energyEeV[i] >= thr) { ws.x[n] = dirs.x[i]; ws.y[n] = dirs.y[i]; ws.z[n] = dirs.z[i]; n++; }
    }
    if (n === 0) continue;
    const sub = { x: ws.x.subarray(0, n), y: ws.y.subarray(0, n), z: ws.z.subarray(0, n) };
    let index: EventIndex | null = null;
    for (let k = 0; k < spec.radiiDeg.length; k++) {
      const psi = (spec.radiiDeg[k] * Math.PI) / 180;
      const ringsPerEvent = Math.min(geometry.rings.nRings, (2 * psi * 4 * geometry.nside) / Math.PI + 1);
      let counts: Int32Array;
      if (70 * n * ringsPerEvent < 60 * npix * Math.min(450, (2 * psi) / (0.4 * Math.PI / 180) + 1)) {
        counts = countDirectionsInWindows({ ...sub, n }, geometry, psi, { raRad: ws.raRad, decRad: ws.decRad }, ws.scratch);
      } else {
        index ??= buildEventIndex(sub.x, sub.y, sub.z);
        counts = countEventsInWindows(index, geometry, psi, "strips");
      }
      const f = spec.fractions[k];
      for (let p = 0; p < npix; p++) {
        const s = liMaSignificanceFromFraction(counts[p], n, f[p]);
        if (s > best.significance) {
          best.significance = s; best.radiusDeg = spec.radiiDeg[k]; best.thresholdEeV = thr; best.pixel = p;
          best.n = n; best.nOn = counts[p]; best.nExpected = f[p] * n;
        }
      }
    }
  }
  return best;
}
