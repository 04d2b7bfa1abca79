import { describe, expect, it } from "vitest";
import {
  autoDomain, colourBarTicks, DIVERGING_STOPS, formatTick, linearSrgbToOklab, linearToSrgb, makeColourScale, oklabToLinearSrgb,
  paletteHex, paletteLut, paletteOklab, SEQUENTIAL_STOPS, srgbToLinear, srgbToOklab, valueToRgba, type ColourScaleKind, type Oklab,
} from "@/lib/sky/colour-scales";
import { expectClose } from "../helpers";

/**
 * Dichromacy simulation matrices at severity 1.0, applied to linear-light sRGB (Machado,
 * Oliveira & Fernandes 2009, IEEE TVCG 15(6), 1291, supplementary table; values as widely
 * reproduced, from memory and matched against public copies).
 */
const MACHADO_2009: Record<"protanopia" | "deuteranopia", number[][]> = {
  protanopia: [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
  deuteranopia: [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]],
};

/**
 * Just-noticeable difference in OKLab, about 0.02 (common practice: OKLab distances are scaled
 * like CIELAB / 100 and ~2 CIELAB units is a JND).
 */
const OKLAB_JND = 0.02;

function simulate(lab: Oklab, kind: keyof typeof MACHADO_2009): Oklab {
  const lin = oklabToLinearSrgb(lab[0], lab[1], lab[2]).map((v) => Math.min(1, Math.max(0, v)));
  const m = MACHADO_2009[kind];
  const s = m.map((r) => Math.min(1, Math.max(0, r[0] * lin[0] + r[1] * lin[1] + r[2] * lin[2])));
  return linearSrgbToOklab(s[0], s[1], s[2]);
}
const deltaE = (a: Oklab, b: Oklab) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
const oklch = (L: number, C: number, hDeg: number): Oklab => [L, C * Math.cos((hDeg * Math.PI) / 180), C * Math.sin((hDeg * Math.PI) / 180)];

describe("OKLab conversion (Ottosson 2020, 'A perceptual color space for image processing')", () => {
  it("maps sRGB white to L = 1, a = b = 0 (the space is normalised so), to 1e-7", () => {
    const [L, a, b] = srgbToOklab(1, 1, 1);
    expectClose(L, 1, 1e-7); expectClose(a, 0, 1e-7); expectClose(b, 0, 1e-7);
  });

  it("maps sRGB red #ff0000 to oklab(0.62796, 0.22486, 0.12585) (CSS Color Module Level 4 worked conversion; from memory), to 1e-5", () => {
    const [L, a, b] = srgbToOklab(1, 0, 0);
    expectClose(L, 0.627955, 1e-5); expectClose(a, 0.224863, 1e-5); expectClose(b, 0.125846, 1e-5);
  });

  // the two published 10-digit matrix pairs are inverse to each other to ~1e-7, hence 1e-6
  it("round-trips linear sRGB -> OKLab -> linear sRGB to 1e-6 over a grid of colours", () => {
    for (let r = 0; r <= 1; r += 0.25) for (let g = 0; g <= 1; g += 0.25) for (let b = 0; b <= 1; b += 0.25) {
      const lab = linearSrgbToOklab(r, g, b);
      const back = oklabToLinearSrgb(lab[0], lab[1], lab[2]);
      expectClose(back[0], r, 1e-6); expectClose(back[1], g, 1e-6); expectClose(back[2], b, 1e-6);
    }
  });

  it("uses the IEC 61966-2-1 sRGB transfer function: 0.5 encoded is 0.21404 linear, and back", () => {
    expectClose(srgbToLinear(0.5), 0.214041, 1e-6);
    expectClose(linearToSrgb(srgbToLinear(0.5)), 0.5, 1e-12);
    expectClose(srgbToLinear(0.04045), 0.04045 / 12.92, 1e-12);
  });
});

describe("palettes", () => {
  const N = 256;
  const L = (kind: ColourScaleKind, t: number) => paletteOklab(kind, t)[0];

  it("has a sequential scale whose OKLab lightness rises strictly from below 0.25 to above 0.95", () => {
    for (let k = 1; k <= N; k++) expect(L("sequential", k / N)).toBeGreaterThan(L("sequential", (k - 1) / N));
    expect(L("sequential", 0)).toBeLessThan(0.25);
    expect(L("sequential", 1)).toBeGreaterThan(0.95);
  });

  it("has a diverging scale with lightness symmetric about t = 0.5 (to 1e-12), rising to its neutral mid-point", () => {
    for (let k = 0; k <= N; k++) expectClose(L("diverging", k / N), L("diverging", 1 - k / N), 1e-12, `t ${k / N}`);
    for (let k = 1; k <= N / 2; k++) expect(L("diverging", k / N)).toBeGreaterThan(L("diverging", (k - 1) / N));
    const mid = paletteOklab("diverging", 0.5);
    expect(Math.hypot(mid[1], mid[2])).toBeLessThan(0.01); // near-neutral: chroma below half a JND
  });

  it("has control points at symmetric positions and lightness (diverging) and strictly rising lightness (sequential)", () => {
    const n = DIVERGING_STOPS.length;
    for (let i = 0; i < n; i++) {
      expectClose(DIVERGING_STOPS[i].t, 1 - DIVERGING_STOPS[n - 1 - i].t, 1e-15);
      expectClose(DIVERGING_STOPS[i].L, DIVERGING_STOPS[n - 1 - i].L, 1e-15);
    }
    for (let i = 1; i < SEQUENTIAL_STOPS.length; i++) expect(SEQUENTIAL_STOPS[i].L).toBeGreaterThan(SEQUENTIAL_STOPS[i - 1].L);
  });

  it.each(["sequential", "diverging"] as const)("is perceptually even: OKLab steps over 64 equal t steps differ by less than 25%% (%s)", (kind) => {
    const steps: number[] = [];
    for (let k = 0; k < 64; k++) steps.push(deltaE(paletteOklab(kind, k / 64), paletteOklab(kind, (k + 1) / 64)));
    expect(Math.max(...steps) / Math.min(...steps)).toBeLessThan(1.25);
  });

  it.each(["sequential", "diverging"] as const)("stays inside the sRGB gamut (linear components in [-1e-6, 1 + 1e-6]) so that no colour is clipped (%s)", (kind) => {
    for (let k = 0; k <= N; k++) {
      const [l, a, b] = paletteOklab(kind, k / N);
      for (const c of oklabToLinearSrgb(l, a, b)) { expect(c).toBeGreaterThanOrEqual(-1e-6); expect(c).toBeLessThanOrEqual(1 + 1e-6); }
    }
  });

  it("keeps the diverging arms apart under protanopia and deuteranopia (Machado et al. 2009, severity 1.0): Delta E_OK > 5 JND and > 75% of normal vision", () => {
    for (const kind of ["protanopia", "deuteranopia"] as const) {
      for (const [t0, t1] of [[0, 1], [0.1, 0.9], [0.25, 0.75], [0.4, 0.6]]) {
        const a = paletteOklab("diverging", t0), b = paletteOklab("diverging", t1);
        const seen = deltaE(simulate(a, kind), simulate(b, kind));
        // the inner pair (0.4, 0.6) is close to neutral for everyone: only the ratio applies there
        if (t0 < 0.4) expect(seen, `${kind} ${t0}/${t1}`).toBeGreaterThan(5 * OKLAB_JND);
        expect(seen / deltaE(a, b), `${kind} ${t0}/${t1}`).toBeGreaterThan(0.75);
      }
    }
  });

  it("would fail that check for a red-green pair of equal lightness (control: oklch(0.6 0.15 30) vs oklch(0.6 0.15 140) under deuteranopia)", () => {
    const red = oklch(0.6, 0.15, 30), green = oklch(0.6, 0.15, 140);
    const seen = deltaE(simulate(red, "deuteranopia"), simulate(green, "deuteranopia"));
    expect(seen).toBeLessThan(5 * OKLAB_JND);
    expect(seen / deltaE(red, green)).toBeLessThan(0.75);
  });

  it("fills a LUT whose first and last entries are the palette ends, opaque", () => {
    const lut = paletteLut("diverging", 16);
    expect(lut.length).toBe(64);
    expect(`#${[lut[0], lut[1], lut[2]].map((v) => v.toString(16).padStart(2, "0")).join("")}`).toBe(paletteHex("diverging", 0));
    expect(`#${[lut[60], lut[61], lut[62]].map((v) => v.toString(16).padStart(2, "0")).join("")}`).toBe(paletteHex("diverging", 1));
    for (let k = 3; k < 64; k += 4) expect(lut[k]).toBe(255);
  });
});

describe("scales, domains and ticks", () => {
  it("makes a diverging domain symmetric about 0 and maps 0 to the neutral mid-point", () => {
    const s = makeColourScale("diverging", [-2, 5]);
    expect(s.domain).toEqual([-5, 5]);
    const mid = valueToRgba(s, 0);
    const want = paletteHex("diverging", 0.5);
    expect(`#${Array.from(mid).slice(0, 3).map((v) => v.toString(16).padStart(2, "0")).join("")}`).toBe(want);
  });

  it("widens a degenerate sequential domain and ignores NaN and infinities in autoDomain", () => {
    expect(makeColourScale("sequential", [3, 3]).domain).toEqual([2.5, 3.5]);
    expect(autoDomain(Float32Array.of(NaN, 2, Infinity, 7, -Infinity), "sequential")).toEqual([2, 7]);
    expect(autoDomain(Float32Array.of(NaN, -3, 1), "diverging")).toEqual([-3, 3]);
    expect(autoDomain(Float32Array.of(NaN), "sequential")).toEqual([0, 1]);
  });

  it("gives evenly spaced 1-2-2.5-5 ticks inside the domain, with 0 for a symmetric one", () => {
    for (const d of [[0, 137], [-4.2, 4.2], [0, 1], [0.001, 0.0137], [-5, 5], [12, 13]] as [number, number][]) {
      const t = colourBarTicks(d);
      expect(t.length).toBeGreaterThanOrEqual(3);
      expect(t.length).toBeLessThanOrEqual(8);
      for (const v of t) { expect(v).toBeGreaterThanOrEqual(d[0] - 1e-12); expect(v).toBeLessThanOrEqual(d[1] + 1e-12); }
      const step = t[1] - t[0];
      const mant = step / 10 ** Math.floor(Math.log10(step) + 1e-9);
      expect([1, 2, 2.5, 5].some((m) => Math.abs(mant - m) < 1e-9), `step ${step}`).toBe(true);
      for (let i = 2; i < t.length; i++) expectClose(t[i] - t[i - 1], step, 1e-9 * step);
      if (d[0] === -d[1]) expect(t).toContain(0);
    }
    expect(colourBarTicks([0, 137])).toEqual([0, 25, 50, 75, 100, 125]);
  });

  it("formats ticks with a common number of decimals and a true minus sign", () => {
    const t = [-5, -2.5, 0, 2.5, 5];
    expect(t.map((v) => formatTick(v, t))).toEqual(["\u22125.0", "\u22122.5", "0.0", "2.5", "5.0"]);
    expect(formatTick(100, [0, 50, 100])).toBe("100");
  });
});
