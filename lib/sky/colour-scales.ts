/**
 * Siderea's colour scales for sky maps: a sequential scale ("night to dawn") for counts and
 * exposure, and a diverging scale ("ice to ember": blue - neutral - orange-brown) for signed
 * significance. Both are our own control points in OKLCh, interpolated piecewise-linearly in
 * OKLab (Ottosson 2020, "A perceptual color space for image processing"), so that equal steps
 * in value are roughly equal perceived steps. The sequential scale's lightness rises
 * monotonically; the diverging scale's lightness is symmetric about its neutral mid-point and
 * its two arms differ in blue-yellow hue, not red-green, so they stay apart for protan and
 * deutan viewers (checked with Machado et al. 2009 in the tests).
 *
 * Colours: sRGB (IEC 61966-2-1) components in [0, 1] (gamma-encoded) or RGBA bytes [0, 255].
 * Pure module: no DOM.
 */

/** Which scale: sequential (counts, exposure) or diverging (signed significance). */
export type ColourScaleKind = "sequential" | "diverging";

/** A colour in OKLab: L in [0, 1], a and b roughly in [-0.4, 0.4]. */
export type Oklab = [number, number, number];

/** A control point of a palette: position t in [0, 1] and an OKLCh colour (L in [0, 1], chroma, hue in degrees). */
export interface OklchStop {
  t: number;
  L: number;
  C: number;
  hDeg: number;
}

/**
 * Sequential control points (our own): deep indigo (L 0.22) -> plum -> rose-copper -> amber ->
 * pale cream (L 0.96). Lightness strictly increasing in t.
 */
export const SEQUENTIAL_STOPS: readonly OklchStop[] = [
  { t: 0, L: 0.22, C: 0.075, hDeg: 278 },
  { t: 0.25, L: 0.405, C: 0.125, hDeg: 305 },
  { t: 0.5, L: 0.59, C: 0.13, hDeg: 8 },
  { t: 0.75, L: 0.775, C: 0.125, hDeg: 62 },
  { t: 1, L: 0.96, C: 0.06, hDeg: 95 },
];

/**
 * Diverging control points (our own): deep blue (L 0.40) -> light blue -> warm neutral
 * (L 0.965, t = 0.5) -> light orange-tan -> brown (L 0.40). Lightness is the same at t and 1 - t.
 */
export const DIVERGING_STOPS: readonly OklchStop[] = [
  { t: 0, L: 0.4, C: 0.12, hDeg: 262 },
  { t: 0.25, L: 0.68, C: 0.085, hDeg: 245 },
  { t: 0.5, L: 0.965, C: 0.006, hDeg: 85 },
  { t: 0.75, L: 0.68, C: 0.1, hDeg: 62 },
  { t: 1, L: 0.4, C: 0.085, hDeg: 45 },
];

/** RGBA bytes of pixels with no data (NaN): a neutral mid grey (OKLab L ~ 0.72, zero chroma), opaque. */
export const NO_DATA_RGBA: readonly [number, number, number, number] = [158, 158, 158, 255];

/** sRGB transfer function, encoded component in [0, 1] -> linear light (IEC 61966-2-1). */
export function srgbToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

/** Inverse sRGB transfer function, linear light -> encoded component (IEC 61966-2-1); input clamped to [0, 1]. */
export function linearToSrgb(c: number): number {
  const v = c <= 0 ? 0 : c >= 1 ? 1 : c;
  return v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055;
}

/** Linear-light sRGB (components in [0, 1]) -> OKLab (Ottosson 2020, the published M1, M2 matrices). */
export function linearSrgbToOklab(r: number, g: number, b: number): Oklab {
  const l = Math.cbrt(0.4122214708 * r + 0.5363325363 * g + 0.0514459929 * b);
  const m = Math.cbrt(0.2119034982 * r + 0.6806995451 * g + 0.1073969566 * b);
  const s = Math.cbrt(0.0883024619 * r + 0.2817188376 * g + 0.6299787005 * b);
  return [
    0.2104542553 * l + 0.793617785 * m - 0.0040720468 * s,
    1.9779984951 * l - 2.428592205 * m + 0.4505937099 * s,
    0.0259040371 * l + 0.7827717662 * m - 0.808675766 * s,
  ];
}

/** OKLab -> linear-light sRGB, not clamped (values outside [0, 1] mean out of gamut) (Ottosson 2020). */
export function oklabToLinearSrgb(L: number, a: number, b: number): [number, number, number] {
  const l = (L + 0.3963377774 * a + 0.2158037573 * b) ** 3;
  const m = (L - 0.1055613458 * a - 0.0638541728 * b) ** 3;
  const s = (L - 0.0894841775 * a - 1.291485548 * b) ** 3;
  return [
    4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s,
    -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s,
    -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s,
  ];
}

/** Encoded sRGB components in [0, 1] -> OKLab. */
export function srgbToOklab(r: number, g: number, b: number): Oklab {
  return linearSrgbToOklab(srgbToLinear(r), srgbToLinear(g), srgbToLinear(b));
}

/** OKLCh (L, chroma, hue in degrees) -> OKLab. */
export function oklchToOklab(L: number, C: number, hDeg: number): Oklab {
  const h = (hDeg * Math.PI) / 180;
  return [L, C * Math.cos(h), C * Math.sin(h)];
}

const STOPS_LAB: Record<ColourScaleKind, { t: number; lab: Oklab }[]> = {
  sequential: SEQUENTIAL_STOPS.map((s) => ({ t: s.t, lab: oklchToOklab(s.L, s.C, s.hDeg) })),
  diverging: DIVERGING_STOPS.map((s) => ({ t: s.t, lab: oklchToOklab(s.L, s.C, s.hDeg) })),
};

/**
 * The palette's OKLab colour at position t in [0, 1] (clamped; NaN gives NaN components):
 * linear interpolation in OKLab between the neighbouring control points.
 */
export function paletteOklab(kind: ColourScaleKind, t: number): Oklab {
  const stops = STOPS_LAB[kind];
  if (!stops) throw new RangeError(`unknown colour scale: ${String(kind)}`);
  const u = t <= 0 ? 0 : t >= 1 ? 1 : t;
  let k = 0;
  while (k < stops.length - 2 && u > stops[k + 1].t) k++;
  const a = stops[k], b = stops[k + 1];
  const f = (u - a.t) / (b.t - a.t);
  return [a.lab[0] + f * (b.lab[0] - a.lab[0]), a.lab[1] + f * (b.lab[1] - a.lab[1]), a.lab[2] + f * (b.lab[2] - a.lab[2])];
}

/** The palette colour at t in [0, 1] as encoded sRGB components in [0, 1] (clamped to the gamut). */
export function paletteSrgb(kind: ColourScaleKind, t: number): [number, number, number] {
  const [L, a, b] = paletteOklab(kind, t);
  const lin = oklabToLinearSrgb(L, a, b);
  return [linearToSrgb(lin[0]), linearToSrgb(lin[1]), linearToSrgb(lin[2])];
}

/** CSS hex colour (#rrggbb) of the palette at t in [0, 1]. */
export function paletteHex(kind: ColourScaleKind, t: number): string {
  const c = paletteSrgb(kind, t);
  return `#${c.map((v) => Math.round(v * 255).toString(16).padStart(2, "0")).join("")}`;
}

/** A lookup table of `size` RGBA byte colours sampled evenly over t in [0, 1] (entry k at t = k / (size - 1)). */
export function paletteLut(kind: ColourScaleKind, size = 1024): Uint8ClampedArray {
  if (!(Number.isInteger(size) && size >= 2)) throw new RangeError(`LUT size must be an integer >= 2, got ${size}`);
  const lut = new Uint8ClampedArray(size * 4);
  for (let k = 0; k < size; k++) {
    const c = paletteSrgb(kind, k / (size - 1));
    lut[4 * k] = Math.round(c[0] * 255);
    lut[4 * k + 1] = Math.round(c[1] * 255);
    lut[4 * k + 2] = Math.round(c[2] * 255);
    lut[4 * k + 3] = 255;
  }
  return lut;
}

/** A colour scale ready for use: the kind, its value domain [lo, hi] (data units), and its LUT. */
export interface ColourScale {
  kind: ColourScaleKind;
  /** Value at t = 0 and t = 1 (lo < hi). For "diverging" always symmetric: lo = -hi. */
  domain: [number, number];
  /** RGBA bytes, lutSize entries. */
  lut: Uint8ClampedArray;
  lutSize: number;
}

/**
 * Builds a colour scale over a domain (linear). A diverging domain is made symmetric about 0
 * ([-m, m], m = max(|lo|, |hi|)) so that the neutral colour means 0. A degenerate domain
 * (lo = hi, or m = 0) is widened to width 1 (sequential [lo - 0.5, lo + 0.5]; diverging [-1, 1]).
 */
export function makeColourScale(kind: ColourScaleKind, domain: [number, number], lutSize = 1024): ColourScale {
  let [lo, hi] = domain;
  if (!(Number.isFinite(lo) && Number.isFinite(hi))) throw new RangeError(`domain must be finite, got [${lo}, ${hi}]`);
  if (kind === "diverging") {
    const m = Math.max(Math.abs(lo), Math.abs(hi));
    lo = m > 0 ? -m : -1; hi = m > 0 ? m : 1;
  } else {
    if (lo > hi) [lo, hi] = [hi, lo];
    if (lo === hi) { lo -= 0.5; hi += 0.5; }
  }
  return { kind, domain: [lo, hi], lut: paletteLut(kind, lutSize), lutSize };
}

/**
 * Writes the RGBA bytes of a value into out[offset..offset+3]: linear in the scale's domain,
 * clamped at both ends; NaN gives NO_DATA_RGBA. Returns out.
 */
export function valueToRgba(scale: ColourScale, value: number, out: Uint8ClampedArray | number[] = new Uint8ClampedArray(4), offset = 0): Uint8ClampedArray | number[] {
  if (Number.isNaN(value)) {
    out[offset] = NO_DATA_RGBA[0]; out[offset + 1] = NO_DATA_RGBA[1]; out[offset + 2] = NO_DATA_RGBA[2]; out[offset + 3] = NO_DATA_RGBA[3];
    return out;
  }
  const k = lutIndex(scale, value);
  out[offset] = scale.lut[4 * k]; out[offset + 1] = scale.lut[4 * k + 1]; out[offset + 2] = scale.lut[4 * k + 2]; out[offset + 3] = scale.lut[4 * k + 3];
  return out;
}

/** LUT entry (integer in [0, lutSize - 1]) of a finite value: nearest entry of the linear position in the domain. */
export function lutIndex(scale: ColourScale, value: number): number {
  const [lo, hi] = scale.domain;
  const t = (value - lo) / (hi - lo);
  const k = Math.round((t <= 0 ? 0 : t >= 1 ? 1 : t) * (scale.lutSize - 1));
  return k;
}

/**
 * A default domain for values (NaN and infinities ignored): sequential [min, max]; diverging
 * [-m, m] with m = max |v|. With no finite value, [0, 1] (sequential) or [-1, 1] (diverging).
 */
export function autoDomain(values: ArrayLike<number>, kind: ColourScaleKind): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v === v && v !== Infinity && v !== -Infinity) { if (v < lo) lo = v; if (v > hi) hi = v; }
  }
  if (lo > hi) return kind === "diverging" ? [-1, 1] : [0, 1];
  if (kind === "diverging") { const m = Math.max(Math.abs(lo), Math.abs(hi)) || 1; return [-m, m]; }
  return lo === hi ? [lo - 0.5, lo + 0.5] : [lo, hi];
}

/**
 * "Nice" tick values for a colour bar over [lo, hi]: the multiples of a step (1, 2, 2.5 or 5
 * x 10^k) inside the domain, the step chosen so that their number is closest to `target`
 * (ties: the larger step); the ends are ticks when they are multiples. A symmetric domain gets
 * 0 as a tick. Values are rounded to a decimal beyond the step's, to remove float noise.
 */
export function colourBarTicks(domain: [number, number], target = 5): number[] {
  const [lo, hi] = domain[0] <= domain[1] ? domain : [domain[1], domain[0]];
  if (!(Number.isFinite(lo) && Number.isFinite(hi))) return [];
  if (lo === hi) return [lo];
  const raw = (hi - lo) / Math.max(1, target - 1);
  const mag = 10 ** Math.floor(Math.log10(raw));
  let step = mag, bestMiss = Infinity;
  for (const m of [0.5, 1, 2, 2.5, 5, 10]) {
    const s = m * mag;
    const n = Math.floor(hi / s + 1e-9) - Math.ceil(lo / s - 1e-9) + 1;
    const miss = Math.abs(n - target);
    if (miss <= bestMiss) { bestMiss = miss; step = s; }
  }
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(step)));
  const ticks: number[] = [];
  const first = Math.ceil(lo / step - 1e-9);
  const last = Math.floor(hi / step + 1e-9);
  for (let k = first; k <= last; k++) ticks.push(Number((k * step).toFixed(decimals)) + 0);
  return ticks;
}

/** Formats a tick for display with the fewest decimals that separate the given ticks (at most 6). */
export function formatTick(value: number, ticks: readonly number[]): string {
  let decimals = 0;
  for (const t of ticks) {
    while (decimals < 6 && Math.abs(Number(t.toFixed(decimals)) - t) > 1e-9 * Math.max(1, Math.abs(t))) decimals++;
  }
  const s = value.toFixed(decimals);
  return s === "-0" || /^-0\.0*$/.test(s) ? s.slice(1) : s.replace("-", "\u2212");
}
