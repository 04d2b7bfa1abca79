/**
 * The sky map's geometry: Mollweide's equal-area projection (Snyder 1987, "Map Projections: A
 * Working Manual", USGS Professional Paper 1395, pp. 249-252), evaluated by d3-geo-projection's
 * raw Mollweide, with a display frame around it, and the pure raster functions the map
 * component draws with.
 *
 * Coordinates, from the sky to the screen:
 *  - ICRS unit vectors (x toward RA 0 on the equator, z toward Dec +90 deg);
 *  - frame longitude / latitude: (RA, Dec) in the equatorial frame, (l, b) in the galactic
 *    frame (Hipparcos definition, via coordinates.ts), degrees;
 *  - display longitude / latitude (lambda, phi): lambda = s (lon - centre) reduced to
 *    [-180, 180] deg with s = -1 when longitude increases to the left (the astronomical
 *    convention, seen from inside the sphere) and s = +1 to the right; phi = latitude;
 *  - the unit plane: Mollweide's (x, y) for a unit sphere, y up, the map an ellipse of
 *    semi-axes 2 sqrt 2 (x) and sqrt 2 (y);
 *  - canvas pixels: a MapLayout scales and translates the unit plane (y down).
 *
 * All of the display transform is one orthogonal 3x3 matrix V (ICRS -> display vectors,
 * V = D(s) . R3(centre) . F, F = ICRS -> frame); its inverse is its transpose.
 * Pure module: no DOM.
 */
import { geoMollweideRaw } from "d3-geo-projection";
import { NO_DATA_RGBA, type ColourScale } from "./colour-scales";
import { DEG_PER_RAD, RAD_PER_DEG } from "./constants";
import { icrsToGalacticMatrix, icrsToSupergalacticMatrix } from "./coordinates";
import { vectorsToPixels, type HealpixOrder } from "./healpix";
import { lonLatDegToVector, multiply3 } from "./vectors";

/** Display frame: equatorial (ICRS RA, Dec) or galactic (l, b). */
export type SkyFrame = "equatorial" | "galactic";
/** Side toward which longitude increases on the map: "left" (astronomical convention) or "right". */
export type LonDirection = "left" | "right";

/** How the sky is laid out on the map. */
export interface SkyView {
  frame: SkyFrame;
  /** Frame longitude at the map's centre, degrees (any real; reduced mod 360). */
  centreLonDeg: number;
  /** Default in the component: "left". */
  lonIncreases: LonDirection;
}

const SQRT2 = Math.SQRT2;
/** Half width of the unit-sphere Mollweide ellipse, 2 sqrt 2 (Snyder 1987, eq. 31-1 at lambda = pi, phi = 0). */
export const MOLLWEIDE_HALF_WIDTH = 2 * SQRT2;
/** Half height of the unit-sphere Mollweide ellipse, sqrt 2 (Snyder 1987, eq. 31-2 at phi = 90 deg). */
export const MOLLWEIDE_HALF_HEIGHT = SQRT2;
const CX = (2 * SQRT2) / Math.PI;

// ---------------------------------------------------------------------------------------------
// Mollweide

/**
 * Mollweide forward, unit sphere: (lambda, phi) radians, lambda in [-pi, pi], phi in
 * [-pi/2, pi/2] -> [x, y] in the unit plane (y up): x = (2 sqrt 2 / pi) lambda cos theta,
 * y = sqrt 2 sin theta, 2 theta + sin 2 theta = pi sin phi (Snyder 1987, eqs. 31-1 to 31-3;
 * d3-geo-projection geoMollweideRaw, Newton iteration; error < 3e-9 up to |phi| = 89.9999 deg).
 */
export function mollweideForwardRad(lambdaRad: number, phiRad: number): [number, number] {
  // the Newton iteration converges slowly at the poles themselves (x ~ 6e-6 there after its 30
  // steps); a pole is the point (0, +-sqrt 2) whatever lambda (Snyder 1987, p. 251)
  if (phiRad >= Math.PI / 2) return [0, SQRT2];
  if (phiRad <= -Math.PI / 2) return [0, -SQRT2];
  return geoMollweideRaw(lambdaRad, phiRad);
}

/**
 * Mollweide inverse, unit sphere: [x, y] in the unit plane -> [lambda, phi] radians (Snyder 1987,
 * eqs. 31-4 to 31-6; d3-geo-projection geoMollweideRaw.invert), or null outside the ellipse
 * (x / 2 sqrt 2)^2 + (y / sqrt 2)^2 <= 1 (boundary included, up to 1e-12 for rounding).
 */
export function mollweideInverseRad(x: number, y: number): [number, number] | null {
  const e = (x / MOLLWEIDE_HALF_WIDTH) ** 2 + (y / MOLLWEIDE_HALF_HEIGHT) ** 2;
  if (!(e <= 1 + 1e-12)) return null;
  const yc = Math.max(-SQRT2, Math.min(SQRT2, y));
  if (Math.abs(yc) >= SQRT2) return [0, yc > 0 ? Math.PI / 2 : -Math.PI / 2]; // a pole: any lambda
  const [lambda, phi] = geoMollweideRaw.invert(x, yc);
  return [Math.max(-Math.PI, Math.min(Math.PI, lambda)), phi];
}

// ---------------------------------------------------------------------------------------------
// Display frame

const ICRS_TO_GAL = icrsToGalacticMatrix();

/** Rotation ICRS -> frame (row-major; identity for equatorial, Hipparcos galactic otherwise). */
export function icrsToFrameMatrix(frame: SkyFrame): Float64Array {
  if (frame === "equatorial") return Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1);
  if (frame === "galactic") return Float64Array.from(ICRS_TO_GAL);
  throw new RangeError(`unknown sky frame: ${String(frame)}`);
}

/**
 * The orthogonal matrix V (row-major) taking ICRS unit vectors to display vectors, whose
 * longitude atan2(y, x) is the display longitude lambda and whose latitude is phi. Inverse: its
 * transpose (displayToIcrsMatrix).
 */
export function icrsToDisplayMatrix(view: SkyView): Float64Array {
  if (!Number.isFinite(view.centreLonDeg)) throw new RangeError(`centre longitude not finite: ${view.centreLonDeg}`);
  if (view.lonIncreases !== "left" && view.lonIncreases !== "right") throw new RangeError(`unknown longitude direction: ${String(view.lonIncreases)}`);
  const c = view.centreLonDeg * RAD_PER_DEG;
  const s = view.lonIncreases === "left" ? -1 : 1;
  const cc = Math.cos(c), sc = Math.sin(c);
  // D(s) . R3(c): rows (cos c, sin c, 0), s (-sin c, cos c, 0), (0, 0, 1)
  const r = Float64Array.of(cc, sc, 0, -s * sc, s * cc, 0, 0, 0, 1);
  return multiply3(r, icrsToFrameMatrix(view.frame));
}

/** Transpose of icrsToDisplayMatrix: display vectors -> ICRS. */
export function displayToIcrsMatrix(view: SkyView): Float64Array {
  const m = icrsToDisplayMatrix(view);
  return Float64Array.of(m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]);
}

function reduce180(deg: number): number {
  let d = deg % 360;
  if (d > 180) d -= 360; else if (d < -180) d += 360;
  return d + 0;
}

/** Frame longitude (deg) -> display longitude lambda in [-180, 180] deg (see the module comment). */
export function frameLonToDisplayLonDeg(view: SkyView, lonDeg: number): number {
  const s = view.lonIncreases === "left" ? -1 : 1;
  return reduce180(s * reduce180(lonDeg - view.centreLonDeg));
}

/** Display longitude lambda (deg) -> frame longitude in [0, 360) deg. Inverse of frameLonToDisplayLonDeg. */
export function displayLonToFrameLonDeg(view: SkyView, lambdaDeg: number): number {
  const s = view.lonIncreases === "left" ? -1 : 1;
  let lon = (view.centreLonDeg + s * lambdaDeg) % 360;
  if (lon < 0) lon += 360;
  return lon >= 360 ? 0 : lon + 0;
}

/** ICRS vector (any length) -> [lambda, phi] display degrees, lambda in [-180, 180], phi in [-90, 90]. */
export function icrsVectorToDisplayDeg(view: SkyView, x: number, y: number, z: number, m: ArrayLike<number> = icrsToDisplayMatrix(view)): [number, number] {
  const u = m[0] * x + m[1] * y + m[2] * z, v = m[3] * x + m[4] * y + m[5] * z, w = m[6] * x + m[7] * y + m[8] * z;
  return [u === 0 && v === 0 ? 0 : Math.atan2(v, u) * DEG_PER_RAD + 0, Math.atan2(w, Math.hypot(u, v)) * DEG_PER_RAD + 0];
}

/** Display [lambda, phi] degrees -> ICRS unit vector (Float64Array(3)). Inverse of icrsVectorToDisplayDeg. */
export function displayDegToIcrsVector(view: SkyView, lambdaDeg: number, phiDeg: number, mT: ArrayLike<number> = displayToIcrsMatrix(view)): Float64Array {
  const d = lonLatDegToVector(lambdaDeg, phiDeg);
  return Float64Array.of(
    mT[0] * d[0] + mT[1] * d[1] + mT[2] * d[2],
    mT[3] * d[0] + mT[4] * d[1] + mT[5] * d[2],
    mT[6] * d[0] + mT[7] * d[1] + mT[8] * d[2],
  );
}

/** ICRS vector -> [x, y] in the Mollweide unit plane for this view. */
export function icrsVectorToPlane(view: SkyView, x: number, y: number, z: number): [number, number] {
  const [l, p] = icrsVectorToDisplayDeg(view, x, y, z);
  return mollweideForwardRad(l * RAD_PER_DEG, p * RAD_PER_DEG);
}

/** ICRS (RA, Dec) degrees -> [x, y] in the unit plane for this view. */
export function icrsRaDecDegToPlane(view: SkyView, raDeg: number, decDeg: number): [number, number] {
  const v = lonLatDegToVector(raDeg, decDeg);
  return icrsVectorToPlane(view, v[0], v[1], v[2]);
}

/** [x, y] in the unit plane -> ICRS unit vector, or null outside the ellipse. Inverse of icrsVectorToPlane. */
export function planeToIcrsVector(view: SkyView, x: number, y: number): Float64Array | null {
  const ll = mollweideInverseRad(x, y);
  if (!ll) return null;
  return displayDegToIcrsVector(view, ll[0] * DEG_PER_RAD, ll[1] * DEG_PER_RAD);
}

/** [x, y] in the unit plane -> frame [lon in [0, 360), lat] degrees, or null outside the ellipse. */
export function planeToFrameLonLatDeg(view: SkyView, x: number, y: number): [number, number] | null {
  const ll = mollweideInverseRad(x, y);
  if (!ll) return null;
  return [displayLonToFrameLonDeg(view, ll[0] * DEG_PER_RAD), ll[1] * DEG_PER_RAD + 0];
}

/** Display [lambda, phi] degrees -> [x, y] in the unit plane (Mollweide forward). */
export function displayDegToPlane(lambdaDeg: number, phiDeg: number): [number, number] {
  return mollweideForwardRad(lambdaDeg * RAD_PER_DEG, phiDeg * RAD_PER_DEG);
}

// ---------------------------------------------------------------------------------------------
// Curves on the sphere, cut at the map edge

/**
 * A curve as display coordinates: interleaved [lambda0, phi0, lambda1, phi1, ...] in degrees.
 * Consecutive points are joined; a curve never crosses the map edge (it may end on it).
 */
export type DisplayCurve = Float64Array;

/**
 * The small circle of angular radius radiusDeg (0 < radius <= 180; 90 = a great circle) around
 * the ICRS direction (px, py, pz), sampled at `samples` evenly spaced points, as display curves
 * split where the circle crosses the map edge (lambda = +-180 deg); each crossing is located by
 * bisection (to ~1e-10 rad) and both pieces end exactly on the edge. A circle that does not
 * cross the edge comes back as one closed curve (last point = first point).
 */
export function smallCircleDisplayCurves(view: SkyView, px: number, py: number, pz: number, radiusDeg: number, samples = 360): DisplayCurve[] {
  if (!(radiusDeg > 0 && radiusDeg <= 180)) throw new RangeError(`radius must be in (0, 180] deg, got ${radiusDeg}`);
  if (!(Number.isInteger(samples) && samples >= 8)) throw new RangeError(`samples must be an integer >= 8, got ${samples}`);
  const m = icrsToDisplayMatrix(view);
  const n0 = Math.hypot(px, py, pz);
  if (!(n0 > 0)) throw new RangeError("pole vector must be non-zero and finite");
  // pole in display coordinates and an orthonormal basis (e1, e2) of its plane
  const p = [(m[0] * px + m[1] * py + m[2] * pz) / n0, (m[3] * px + m[4] * py + m[5] * pz) / n0, (m[6] * px + m[7] * py + m[8] * pz) / n0];
  const helper = Math.abs(p[2]) < 0.9 ? [0, 0, 1] : [1, 0, 0];
  let e1 = [helper[1] * p[2] - helper[2] * p[1], helper[2] * p[0] - helper[0] * p[2], helper[0] * p[1] - helper[1] * p[0]];
  const n1 = Math.hypot(e1[0], e1[1], e1[2]);
  e1 = [e1[0] / n1, e1[1] / n1, e1[2] / n1];
  const e2 = [p[1] * e1[2] - p[2] * e1[1], p[2] * e1[0] - p[0] * e1[2], p[0] * e1[1] - p[1] * e1[0]];
  const rho = radiusDeg * RAD_PER_DEG;
  const cr = Math.cos(rho), sr = Math.sin(rho);
  const point = (t: number, out: number[]) => {
    const c = Math.cos(t), s = Math.sin(t);
    out[0] = cr * p[0] + sr * (c * e1[0] + s * e2[0]);
    out[1] = cr * p[1] + sr * (c * e1[1] + s * e2[1]);
    out[2] = cr * p[2] + sr * (c * e1[2] + s * e2[2]);
    return out;
  };
  const dt = (2 * Math.PI) / samples;
  const a = [0, 0, 0], b = [0, 0, 0], q = [0, 0, 0];
  // parameters of edge crossings: y changes sign where x < 0
  const crossings: number[] = [];
  for (let k = 0; k < samples; k++) {
    point(k * dt, a); point((k + 1) * dt, b);
    const ya = a[1], yb = b[1];
    if ((ya < 0) === (yb < 0)) continue;
    let lo = k * dt, hi = (k + 1) * dt;
    for (let it = 0; it < 40; it++) {
      const mid = (lo + hi) / 2;
      point(mid, q);
      if ((q[1] < 0) === (ya < 0)) lo = mid; else hi = mid;
    }
    const tc = (lo + hi) / 2;
    point(tc, q);
    if (q[0] < 0) crossings.push(tc);
  }
  const lonLat = (v: number[]): [number, number] => [Math.atan2(v[1], v[0]) * DEG_PER_RAD + 0, Math.atan2(v[2], Math.hypot(v[0], v[1])) * DEG_PER_RAD + 0];
  if (crossings.length === 0) {
    const out = new Float64Array(2 * (samples + 1));
    for (let k = 0; k <= samples; k++) {
      const [l, ph] = lonLat(point((k % samples) * dt, a));
      out[2 * k] = l; out[2 * k + 1] = ph;
    }
    return [out];
  }
  // one piece from each crossing to the next (cyclically)
  const curves: DisplayCurve[] = [];
  for (let c = 0; c < crossings.length; c++) {
    const t0 = crossings[c];
    const t1 = c + 1 < crossings.length ? crossings[c + 1] : crossings[0] + 2 * Math.PI;
    const pts: number[] = [];
    // a point just after t0 tells on which side of the edge this piece starts
    // and a point just before t1 on which side it ends
    const eps = Math.min(1e-6, (t1 - t0) / 2);
    const startSide = point(t0 + eps, q)[1] < 0 ? -180 : 180;
    const endSide = point(t1 - eps, q)[1] < 0 ? -180 : 180;
    pts.push(startSide, lonLat(point(t0, a))[1]);
    let last = startSide;
    for (let k = Math.floor(t0 / dt) + 1; k * dt < t1; k++) {
      const [l, ph] = lonLat(point(k * dt, a));
      last = Math.abs(l) === 180 ? (last < 0 ? -180 : 180) : l;
      pts.push(last, ph);
    }
    pts.push(endSide, lonLat(point(t1, a))[1]);
    curves.push(Float64Array.from(pts));
  }
  return curves;
}

/** North galactic pole as an ICRS unit vector (third row of the Hipparcos ICRS -> galactic rotation). */
export function galacticPoleIcrs(): Float64Array {
  return Float64Array.of(ICRS_TO_GAL[6], ICRS_TO_GAL[7], ICRS_TO_GAL[8]);
}

/** North supergalactic pole as an ICRS unit vector (RC3 definition, via coordinates.ts). */
export function supergalacticPoleIcrs(): Float64Array {
  const m = icrsToSupergalacticMatrix();
  return Float64Array.of(m[6], m[7], m[8]);
}

/** The galactic plane (b = 0, Hipparcos) as display curves for this view. */
export function galacticPlaneCurves(view: SkyView, samples = 360): DisplayCurve[] {
  const p = galacticPoleIcrs();
  return smallCircleDisplayCurves(view, p[0], p[1], p[2], 90, samples);
}

/** The supergalactic plane (SGB = 0, RC3) as display curves for this view. */
export function supergalacticPlaneCurves(view: SkyView, samples = 360): DisplayCurve[] {
  const p = supergalacticPoleIcrs();
  return smallCircleDisplayCurves(view, p[0], p[1], p[2], 90, samples);
}

/**
 * The line of constant ICRS declination decDeg (open interval (-90, 90); e.g. the edge of a
 * field of view) as display curves: the small circle of radius 90 - dec around the north
 * celestial pole.
 */
export function declinationCurves(view: SkyView, decDeg: number, samples = 360): DisplayCurve[] {
  if (!(decDeg > -90 && decDeg < 90)) throw new RangeError(`declination must be in (-90, 90) deg, got ${decDeg}`);
  return smallCircleDisplayCurves(view, 0, 0, 1, 90 - decDeg, samples);
}

/** A window (spherical cap edge) of radius radiusDeg in (0, 180] around ICRS (raDeg, decDeg), as display curves. */
export function windowCurves(view: SkyView, raDeg: number, decDeg: number, radiusDeg: number, samples = 120): DisplayCurve[] {
  const v = lonLatDegToVector(raDeg, decDeg);
  return smallCircleDisplayCurves(view, v[0], v[1], v[2], radiusDeg, samples);
}

// ---------------------------------------------------------------------------------------------
// Raster

/** Placement of the unit plane on a pixel grid: plane (x, y) -> pixel (cx + k x, cy - k y). */
export interface MapLayout {
  widthPx: number;
  heightPx: number;
  centreXPx: number;
  centreYPx: number;
  /** Pixels per unit of the plane. */
  pxPerUnit: number;
}

/** The largest Mollweide ellipse that fits a widthPx x heightPx grid with paddingPx on every side, centred. */
export function mollweideLayout(widthPx: number, heightPx: number, paddingPx = 0): MapLayout {
  if (!(widthPx > 0 && heightPx > 0)) throw new RangeError(`grid size must be positive, got ${widthPx} x ${heightPx}`);
  const k = Math.max(0, Math.min((widthPx - 2 * paddingPx) / (2 * MOLLWEIDE_HALF_WIDTH), (heightPx - 2 * paddingPx) / (2 * MOLLWEIDE_HALF_HEIGHT)));
  return { widthPx, heightPx, centreXPx: widthPx / 2, centreYPx: heightPx / 2, pxPerUnit: k };
}

/** The same layout on a grid `factor` times finer (e.g. devicePixelRatio). */
export function scaleLayout(layout: MapLayout, factor: number): MapLayout {
  return {
    widthPx: Math.round(layout.widthPx * factor), heightPx: Math.round(layout.heightPx * factor),
    centreXPx: layout.centreXPx * factor, centreYPx: layout.centreYPx * factor, pxPerUnit: layout.pxPerUnit * factor,
  };
}

/** Pixel position (x right, y down, in pixels) -> unit-plane [x, y]. */
export function pixelToPlane(layout: MapLayout, xPx: number, yPx: number): [number, number] {
  return [(xPx - layout.centreXPx) / layout.pxPerUnit, (layout.centreYPx - yPx) / layout.pxPerUnit];
}

/** Unit-plane [x, y] -> pixel position. Inverse of pixelToPlane. */
export function planeToPixel(layout: MapLayout, x: number, y: number): [number, number] {
  return [layout.centreXPx + x * layout.pxPerUnit, layout.centreYPx - y * layout.pxPerUnit];
}

/**
 * For every pixel of the grid (row-major, integer sizes; pixel (i, j) sampled at its centre
 * (i + 0.5, j + 0.5)), the HEALPix pixel (nside, order, ICRS) seen there, or -1 outside the
 * ellipse: inverse Mollweide per row (theta and phi are constant along a row, Snyder 1987
 * eqs. 31-4 to 31-6, the formula of geoMollweideRaw.invert), rotation to ICRS by the view's
 * matrix, then lib/sky/healpix vectorsToPixels one row at a time. Cache the result while the
 * view, the layout and the map's nside/order are unchanged; a new layer only needs colourise.
 */
export function rasterIndex(layout: MapLayout, view: SkyView, nside: number, order: HealpixOrder): Int32Array {
  const W = layout.widthPx, H = layout.heightPx;
  if (!(Number.isInteger(W) && Number.isInteger(H) && W > 0 && H > 0)) throw new RangeError(`raster size must be positive integers, got ${W} x ${H}`);
  const mT = displayToIcrsMatrix(view);
  const m0 = mT[0], m1 = mT[1], m2 = mT[2], m3 = mT[3], m4 = mT[4], m5 = mT[5], m6 = mT[6], m7 = mT[7], m8 = mT[8];
  const out = new Int32Array(W * H).fill(-1);
  const xs = new Float64Array(W), ys = new Float64Array(W), zs = new Float64Array(W);
  const row = { x: xs, y: ys, z: zs };
  const k = layout.pxPerUnit, cx = layout.centreXPx, cy = layout.centreYPx;
  if (!(k > 0)) return out;
  for (let j = 0; j < H; j++) {
    const y = (cy - (j + 0.5)) / k;
    if (!(Math.abs(y) < SQRT2)) continue;
    const theta = Math.asin(y / SQRT2);
    const cosTheta = Math.cos(theta);
    const sinPhi = (2 * theta + Math.sin(2 * theta)) / Math.PI;
    const sp = sinPhi > 1 ? 1 : sinPhi < -1 ? -1 : sinPhi;
    const cp = Math.sqrt(1 - sp * sp);
    const lamPerPx = 1 / (k * CX * cosTheta);
    // columns inside the ellipse: |lambda| <= pi
    const halfPx = Math.PI / lamPerPx;
    const i0 = Math.max(0, Math.ceil(cx - halfPx - 0.5)), i1 = Math.min(W - 1, Math.floor(cx + halfPx - 0.5));
    if (i1 < i0) continue;
    const n = i1 - i0 + 1;
    for (let c = 0; c < n; c++) {
      const lam = (i0 + c + 0.5 - cx) * lamPerPx;
      const dx = cp * Math.cos(lam), dy = cp * Math.sin(lam);
      xs[c] = m0 * dx + m1 * dy + m2 * sp;
      ys[c] = m3 * dx + m4 * dy + m5 * sp;
      zs[c] = m6 * dx + m7 * dy + m8 * sp;
    }
    const seg = n === W ? row : { x: xs.subarray(0, n), y: ys.subarray(0, n), z: zs.subarray(0, n) };
    vectorsToPixels(nside, order, seg, out.subarray(j * W + i0, j * W + i0 + n));
  }
  return out;
}

/**
 * Colours a raster index: RGBA bytes (length 4 * index.length, e.g. for an ImageData) with
 * transparent pixels where index < 0, NO_DATA_RGBA where the value is NaN, and the scale's LUT
 * colour (linear in its domain, clamped) otherwise. values[ipix] must be in the order and Nside
 * the index was built for. `out` may be supplied (and is reused) to avoid allocation.
 */
export function colourise(index: Int32Array, values: ArrayLike<number>, scale: ColourScale, out?: Uint8ClampedArray): Uint8ClampedArray {
  const res = out ?? new Uint8ClampedArray(index.length * 4);
  if (res.length < index.length * 4) throw new RangeError("output array too short");
  const lut = scale.lut, top = scale.lutSize - 1;
  const lo = scale.domain[0], f = top / (scale.domain[1] - scale.domain[0]);
  const nr = NO_DATA_RGBA[0], ng = NO_DATA_RGBA[1], nb = NO_DATA_RGBA[2], na = NO_DATA_RGBA[3];
  const nv = values.length;
  for (let p = 0, o = 0; p < index.length; p++, o += 4) {
    const ip = index[p];
    if (ip < 0 || ip >= nv) { res[o] = 0; res[o + 1] = 0; res[o + 2] = 0; res[o + 3] = 0; continue; }
    const v = values[ip];
    if (v !== v) { res[o] = nr; res[o + 1] = ng; res[o + 2] = nb; res[o + 3] = na; continue; }
    let t = (v - lo) * f + 0.5;
    t = t < 0 ? 0 : t > top ? top : t;
    const e = 4 * (t | 0);
    res[o] = lut[e]; res[o + 1] = lut[e + 1]; res[o + 2] = lut[e + 2]; res[o + 3] = lut[e + 3];
  }
  return res;
}
