/**
 * The small static map of an alert's window, rendered on the server without a browser: the
 * local-significance map of the rerun (HEALPix RING, ICRS) around the window, in a gnomonic
 * (tangent-plane) projection centred on it, north up and east to the left as on the sky, with
 * the window's circle and a mark at its centre. Returns a PNG (lib/mail/png.ts).
 */
import { makeColourScale, valueToRgba } from "@/lib/sky/colour-scales";
import { vectorToPixel } from "@/lib/sky/healpix";
import { encodePng } from "./png";

const RAD_PER_DEG = Math.PI / 180;

export interface WindowImageInput {
  nside: number;
  /** Local significance per RING pixel (NaN where the array sees nothing). */
  significance: Float32Array;
  centreRaDeg: number;
  centreDecDeg: number;
  radiusDeg: number;
  sizePx?: number;
}

export interface WindowImage {
  png: Buffer;
  /** Half the width of the picture, degrees from the centre along a side. */
  halfWidthDeg: number;
  /** The colour scale runs from -maxSigma (blue) to +maxSigma (red). */
  maxSigma: number;
  sizePx: number;
}

export function renderWindowImage(input: WindowImageInput): WindowImage {
  const size = input.sizePx ?? 200;
  const halfWidthDeg = Math.min(60, Math.max(3 * input.radiusDeg, 5));
  const t = Math.tan(halfWidthDeg * RAD_PER_DEG);
  const ra = input.centreRaDeg * RAD_PER_DEG, dec = input.centreDecDeg * RAD_PER_DEG;
  const c = [Math.cos(dec) * Math.cos(ra), Math.cos(dec) * Math.sin(ra), Math.sin(dec)];
  const east = [-Math.sin(ra), Math.cos(ra), 0];
  const north = [-Math.sin(dec) * Math.cos(ra), -Math.sin(dec) * Math.sin(ra), Math.cos(dec)];
  const pix = new Int32Array(size * size);
  const cosAngle = new Float64Array(size * size);
  let maxAbs = 0;
  for (let j = 0; j < size; j++) {
    const y = (1 - (2 * (j + 0.5)) / size) * t; // north up
    for (let i = 0; i < size; i++) {
      const x = (1 - (2 * (i + 0.5)) / size) * t; // east to the left
      let dx = c[0]! + x * east[0]! + y * north[0]!, dy = c[1]! + x * east[1]! + y * north[1]!, dz = c[2]! + x * east[2]! + y * north[2]!;
      const n = Math.hypot(dx, dy, dz);
      dx /= n; dy /= n; dz /= n;
      const k = j * size + i;
      pix[k] = vectorToPixel(input.nside, "ring", dx, dy, dz);
      cosAngle[k] = dx * c[0]! + dy * c[1]! + dz * c[2]!;
      const v = input.significance[pix[k]!]!;
      if (Number.isFinite(v)) maxAbs = Math.max(maxAbs, Math.abs(v));
    }
  }
  const maxSigma = Math.max(3, Math.ceil(maxAbs));
  const scale = makeColourScale("diverging", [-maxSigma, maxSigma]);
  const rgba = new Uint8ClampedArray(size * size * 4);
  // Circle of the window: image pixels whose angular distance to the centre is within half a
  // pixel of the radius (pixel scale at the centre of a gnomonic image: 2 t / size radians).
  const pxRad = (2 * t) / size;
  const rad = input.radiusDeg * RAD_PER_DEG;
  for (let k = 0; k < size * size; k++) {
    valueToRgba(scale, input.significance[pix[k]!]!, rgba, 4 * k);
    const angle = Math.acos(Math.min(1, Math.max(-1, cosAngle[k]!)));
    const ring = Math.abs(angle - rad) <= 0.75 * pxRad * (1 + Math.tan(angle) ** 2);
    if (ring) { rgba[4 * k] = 20; rgba[4 * k + 1] = 20; rgba[4 * k + 2] = 20; rgba[4 * k + 3] = 255; }
  }
  // A small cross at the centre.
  const mid = size >> 1;
  for (let d = -5; d <= 5; d++) {
    for (const [i, j] of [[mid + d, mid], [mid, mid + d]] as const) {
      const k = j * size + i;
      rgba[4 * k] = 255; rgba[4 * k + 1] = 255; rgba[4 * k + 2] = 255; rgba[4 * k + 3] = 255;
    }
  }
  return { png: encodePng(size, size, rgba), halfWidthDeg, maxSigma, sizePx: size };
}
