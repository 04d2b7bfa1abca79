import { inflateSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { renderWindowImage } from "@/lib/mail/window-image";
import { queryDiscCentres } from "@/lib/sky/healpix";
import { DIVERGING_STOPS } from "@/lib/sky/colour-scales";

function pixelsOf(png: Buffer, size: number): Uint8Array {
  let o = 8;
  const idat: Buffer[] = [];
  while (o < png.length) {
    const len = png.readUInt32BE(o);
    if (png.toString("ascii", o + 4, o + 8) === "IDAT") idat.push(png.subarray(o + 8, o + 8 + len));
    o += 12 + len;
  }
  const raw = inflateSync(Buffer.concat(idat));
  const out = new Uint8Array(size * size * 4);
  for (let y = 0; y < size; y++) out.set(raw.subarray(y * (size * 4 + 1) + 1, (y + 1) * (size * 4 + 1)), y * size * 4);
  return out;
}

describe("the static map of an alert's window", () => {
  it("centres the window: inside the circle the map's excess (red), outside the background (blue), the circle drawn at the radius", () => {
    expect(DIVERGING_STOPS.length).toBeGreaterThan(2);
    const nside = 64;
    const sig = new Float32Array(12 * nside * nside).fill(-3);
    const raDeg = 203.9, decDeg = -39.5, radiusDeg = 10;
    const r = Math.PI / 180;
    // Exact disc of pixel centres within 10 deg (lib/sky/healpix, checked against @hscmap/healpix).
    for (const p of queryDiscCentres(nside, "ring", Math.cos(decDeg * r) * Math.cos(raDeg * r), Math.cos(decDeg * r) * Math.sin(raDeg * r), Math.sin(decDeg * r), radiusDeg * r)) sig[p] = 3;
    const size = 120;
    const img = renderWindowImage({ nside, significance: sig, centreRaDeg: raDeg, centreDecDeg: decDeg, radiusDeg, sizePx: size });
    expect(img.halfWidthDeg).toBe(30);
    expect(img.maxSigma).toBe(3);
    const px = pixelsOf(img.png, size);
    const at = (i: number, j: number) => [...px.subarray(4 * (j * size + i), 4 * (j * size + i) + 4)];
    // Inside, 5 deg from the centre (gnomonic: tan(5°)/tan(30°) of the half-width): red dominates.
    const off = Math.round((size / 2) * (Math.tan(5 * r) / Math.tan(30 * r)));
    const inside = at(size / 2 + off, size / 2);
    expect(inside[0]!).toBeGreaterThan(inside[2]!);
    // A corner, about 39 deg away: blue dominates.
    const corner = at(2, 2);
    expect(corner[2]!).toBeGreaterThan(corner[0]!);
    // The circle: a dark pixel where the radius meets the row through the centre.
    const ring = Math.round((size / 2) * (Math.tan(radiusDeg * r) / Math.tan(30 * r)));
    const row = [-1, 0, 1].map((d) => at(size / 2 + ring + d, size / 2));
    expect(row.some((c) => c[0]! < 40 && c[1]! < 40 && c[2]! < 40)).toBe(true);
  });
});
