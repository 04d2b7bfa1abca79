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
 *    into declination strips of height h (default 0.25 deg); each strip into equal cells
 *    in right ascension of width about c (default 0.02 deg at the strip's widest circle);
 *    events are sorted by (strip, cell) with a CSR offset table, so that the events of any
 *    run of cells are one contiguous slice and a run's count is a difference of offsets.
 *    For a window centred at declination dc and a strip [d0, d1], the cap's half-width in
 *    RA, dRA(dec) (spherical law of cosines), is unimodal in dec (its only stationary
 *    point is sin d* = sin dc / cos psi), so its minimum and maximum over the strip are
 *    taken at the strip ends or at d*. Cells entirely within +- min dRA of the centre
 *    are counted from the offsets with no per-event work; the events of cells that reach
 *    into +- max dRA are tested one by one with the dot product; everything else is
 *    outside. Bounds are widened by 1e-9 rad so round-off can only send an event to the
 *    exact test, never miscount it. All windows of one ring share dc, so the per-strip
 *    bounds are computed once per ring. Cost ~ windows x strips-per-window + edge events.
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

/** Events indexed for exact window counting. Arrays are sorted by (strip, cell). */
export interface EventIndex {
  n: number;
  nStrips: number;
  stripHeightRad: number;
  /** Number of RA cells of each strip. */
  stripCells: Int32Array;
  /** Index of each strip's first cell in `offsets`. */
  stripCellBase: Int32Array;
  /** CSR: events of global cell k are sorted positions offsets[k] .. offsets[k + 1] - 1. */
  offsets: Int32Array;
  /** ICRS unit vectors, sorted. */
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** Right ascension of each sorted event, radians in [0, 2 pi). */
  raRad: Float64Array;
  /** Declination of each sorted event, radians. */
  decRad: Float64Array;
}

/** Index geometry options (defaults tuned on this machine for 1e6 events, 20 deg windows). */
export interface EventIndexOptions {
  /** Declination strip height, degrees (default 0.25). */
  stripHeightDeg?: number;
  /** Target RA cell width on the strip's widest circle, degrees (default 0.02). */
  cellWidthDeg?: number;
}

/**
 * Builds the strip/cell index of n directions given as unit vectors (any frame; the scan
 * is in the same frame, ICRS for Siderea). Vectors must be unit length to ~1e-12. O(n)
 * (counting sort); copies the input.
 */
export function buildEventIndex(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, options: EventIndexOptions = {}): EventIndex {
  const n = x.length;
  if (y.length !== n || z.length !== n) throw new RangeError("x, y, z must have the same length");
  const nStrips = Math.max(1, Math.round(180 / (options.stripHeightDeg ?? 0.25)));
  const h = Math.PI / nStrips;
  const cellRad = ((options.cellWidthDeg ?? 0.02) * Math.PI) / 180;
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
  const cellOf = new Int32Array(n);
  const raTmp = new Float64Array(n), decTmp = new Float64Array(n);
  const counts = new Int32Array(totalCells + 1);
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
    const g = stripCellBase[s] + k;
    cellOf[i] = g;
    raTmp[i] = ra;
    decTmp[i] = dec;
    counts[g + 1]++;
  }
  const offsets = counts;
  for (let k = 0; k < totalCells; k++) offsets[k + 1] += offsets[k];
  const cursor = offsets.slice(0, totalCells);
  const sx = new Float64Array(n), sy = new Float64Array(n), sz = new Float64Array(n);
  const sra = new Float64Array(n), sdec = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = cursor[cellOf[i]]++;
    sx[p] = x[i]; sy[p] = y[i]; sz[p] = z[i]; sra[p] = raTmp[i]; sdec[p] = decTmp[i];
  }
  return { n, nStrips, stripHeightRad: h, stripCells, stripCellBase, offsets, x: sx, y: sy, z: sz, raRad: sra, decRad: sdec };
}

/** Counting method of countEventsInWindows; "auto" picks by a cost estimate. */
export type WindowCountMethod = "auto" | "strips" | "scatter";

/**
 * Exact number of indexed events in every window of radius radiusRad (0 < psi < pi)
 * centred on the RING pixel centres of nside. Returns counts in RING pixel order
 * (length 12 nside^2). See the module comment for the two methods; both are exact.
 */
export function countEventsInWindows(index: EventIndex, nside: number, radiusRad: number, method: WindowCountMethod = "auto"): Int32Array {
  if (!(radiusRad > 0 && radiusRad < Math.PI)) throw new RangeError(`window radius must be in (0, pi) rad, got ${radiusRad}`);
  const rings = ringTable(nside);
  const centres = ringCentres(nside);
  let m = method;
  if (m === "auto") {
    // Cost model (measured): strips ~ 6 ns per (window, strip) pair; scatter ~ 25 ns per (event, ring).
    const stripsPerWindow = Math.min(index.nStrips, (2 * radiusRad) / index.stripHeightRad + 1);
    const ringsPerEvent = Math.min(rings.nRings, (2 * radiusRad * (4 * nside)) / Math.PI + 1);
    const stripCost = 6 * 12 * nside * nside * stripsPerWindow + 3 * index.n * Math.min(1, (4 * radiusRad * 0.01) / Math.PI);
    const scatterCost = 25 * index.n * ringsPerEvent;
    m = scatterCost < stripCost ? "scatter" : "strips";
  }
  return m === "scatter" ? countByScatter(index, rings, centres, radiusRad) : countByStrips(index, rings, centres, radiusRad);
}

function countByStrips(ix: EventIndex, rings: RingTable, c: RingCentres, psi: number): Int32Array {
  const out = new Int32Array(c.x.length);
  const cosPsi = Math.cos(psi);
  const { offsets, stripCells, stripCellBase, x, y, z } = ix;
  const h = ix.stripHeightRad;
  const cx = c.x, cy = c.y, cz = c.z;
  for (let r = 0; r < rings.nRings; r++) {
    const dc = rings.latRad[r];
    const first = rings.firstPixel[r], nWin = rings.nPixels[r];
    const phi0 = rings.phi0Rad[r], dPhi = rings.dPhiRad[r];
    const capLo = dc - psi, capHi = dc + psi;
    const sinStar = Math.sin(dc) / cosPsi;
    const dStar = Math.abs(sinStar) < 1 ? Math.asin(sinStar) : NaN;
    let sLo = Math.floor((Math.max(-HALF_PI, capLo - MARGIN_RAD) + HALF_PI) / h);
    let sHi = Math.floor((Math.min(HALF_PI, capHi + MARGIN_RAD) + HALF_PI) / h);
    if (sLo < 0) sLo = 0;
    if (sHi >= ix.nStrips) sHi = ix.nStrips - 1;
    for (let s = sLo; s <= sHi; s++) {
      const base = stripCellBase[s], cells = stripCells[s];
      const stripStart = offsets[base], stripEnd = offsets[base + cells];
      if (stripStart === stripEnd) continue;
      const d0 = Math.max(-HALF_PI, -HALF_PI + s * h - MARGIN_RAD);
      const d1 = Math.min(HALF_PI, -HALF_PI + (s + 1) * h + MARGIN_RAD);
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
      if (dIn >= Math.PI) {
        const all = stripEnd - stripStart;
        for (let j = 0; j < nWin; j++) out[first + j] += all;
        continue;
      }
      const inv = cells / TWO_PI;
      const inCells = dIn > MARGIN_RAD ? (dIn - MARGIN_RAD) * inv : -1;
      const outWhole = dOut + MARGIN_RAD >= Math.PI;
      const outCells = (dOut + MARGIN_RAD) * inv;
      for (let j = 0; j < nWin; j++) {
        const p = first + j;
        const u = (phi0 + j * dPhi) * inv;
        const qx = cx[p], qy = cy[p], qz = cz[p];
        let count = 0;
        let ki = 0, ke = 0;
        const hasInner = inCells > 0 && (ki = Math.ceil(u - inCells)) < (ke = Math.floor(u + inCells));
        if (hasInner) {
          // Fully inside cells [ki, ke): difference of offsets, with RA wrap.
          let a = ki, b = ke;
          if (a < 0) { a += cells; b += cells; }
          if (b <= cells) count += offsets[base + b] - offsets[base + a];
          else count += offsets[base + cells] - offsets[base + a] + offsets[base + b - cells] - offsets[base];
        }
        // Edge cells, tested event by event.
        let ko: number, kf: number;
        if (outWhole) { ko = 0; kf = cells; }
        else { ko = Math.floor(u - outCells); kf = Math.floor(u + outCells) + 1; }
        if (hasInner) {
          if (outWhole || kf - ko >= cells) {
            count += countCells(x, y, z, offsets, base, cells, qx, qy, qz, cosPsi, ke, ki + cells);
          } else {
            count += countCells(x, y, z, offsets, base, cells, qx, qy, qz, cosPsi, ko, ki);
            count += countCells(x, y, z, offsets, base, cells, qx, qy, qz, cosPsi, ke, kf);
          }
        } else {
          count += kf - ko >= cells ? countCells(x, y, z, offsets, base, cells, qx, qy, qz, cosPsi, 0, cells) : countCells(x, y, z, offsets, base, cells, qx, qy, qz, cosPsi, ko, kf);
        }
        out[p] += count;
      }
    }
  }
  return out;
}

/** Exact count of the events of cells [a0, b0) of one strip (RA wrap allowed, b0 - a0 <= cells) with dot >= cosPsi. */
function countCells(x: Float64Array, y: Float64Array, z: Float64Array, offsets: Int32Array, base: number, cells: number,
  qx: number, qy: number, qz: number, cosPsi: number, a0: number, b0: number): number {
  if (b0 <= a0) return 0;
  let a = a0, b = b0;
  if (a < 0) { a += cells; b += cells; } else if (a >= cells) { a -= cells; b -= cells; }
  let k = 0;
  if (b <= cells) {
    for (let e = offsets[base + a], end = offsets[base + b]; e < end; e++) if (x[e] * qx + y[e] * qy + z[e] * qz >= cosPsi) k++;
  } else {
    for (let e = offsets[base + a], end = offsets[base + cells]; e < end; e++) if (x[e] * qx + y[e] * qy + z[e] * qz >= cosPsi) k++;
    for (let e = offsets[base], end = offsets[base + b - cells]; e < end; e++) if (x[e] * qx + y[e] * qy + z[e] * qz >= cosPsi) k++;
  }
  return k;
}

/** Whether centre j (any integer, taken modulo the ring size) of a ring is within the window of an event. */
function centreInside(cx: Float64Array, cy: Float64Array, cz: Float64Array, first: number, nWin: number, j: number,
  ex: number, ey: number, ez: number, cosPsi: number): boolean {
  const p = first + (((j % nWin) + nWin) % nWin);
  return ex * cx[p] + ey * cy[p] + ez * cz[p] >= cosPsi;
}

function countByScatter(ix: EventIndex, rings: RingTable, c: RingCentres, psi: number): Int32Array {
  const npix = c.x.length;
  const nRings = rings.nRings;
  const diff = new Int32Array(npix + nRings); // ring r uses slots firstPixel[r] + r .. + nPixels[r]
  const out = new Int32Array(npix);
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
      if (t <= -1 - 1e-12) { diff[slot] += 1; diff[slot + nWin] -= 1; continue; }
      if (t >= 1 + 1e-12) continue;
      if (nWin <= 8 || !(t > -1 + 1e-9)) {
        for (let j = 0; j < nWin; j++) if (centreInside(cx, cy, cz, first, nWin, j, ex, ey, ez, cosPsi)) { out[first + j] += 1; }
        continue;
      }
      const dPhi = rings.dPhiRad[r];
      const half = Math.acos(t < 1 ? t : 1) / dPhi;
      const jc = (ra - rings.phi0Rad[r]) / dPhi;
      let jlo = Math.ceil(jc - half), jhi = Math.floor(jc + half);
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
export function precessedWindowFractions(nside: number, radiusRad: number, omegaOfDate: DeclinationExposure, epochs: ReadonlyArray<ExposureEpoch>, options: CapQuadratureOptions = {}): Float64Array {
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
export function scanWindows(index: EventIndex, options: { nside: number; radiusDeg: number; expectation: ScanExpectation; method?: WindowCountMethod }): ScanResult {
  const { nside, radiusDeg, expectation } = options;
  const psi = (radiusDeg * Math.PI) / 180;
  const t0 = performance.now();
  const nOn = countEventsInWindows(index, nside, psi, options.method);
  const t1 = performance.now();
  const npix = nOn.length;
  const n = index.n;
  const nExpected = new Float64Array(npix);
  let fraction: Float64Array;
  if (expectation.model === "reference") {
    const ref = countEventsInWindows(index === expectation.reference ? index : expectation.reference, nside, psi, options.method);
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
  const c = ringCentres(nside);
  let raDeg = (c.phiRad[best] * 180) / Math.PI;
  if (raDeg >= 360) raDeg -= 360;
  const label = expectation.label ?? expectation.model;
  return {
    nside, radiusDeg, n, model: label, nOn, nExpected, significance,
    max: { pixel: best, significance: significance[best], raDeg, decDeg: (Math.asin(c.z[best]) * 180) / Math.PI, nOn: nOn[best], nExpected: nExpected[best] },
    timingMs: { count: t1 - t0, expectation: t2 - t1, significance: t3 - t2 },
  };
}
