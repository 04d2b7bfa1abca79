import { describe, expect, it } from "vitest";
import * as hp from "@hscmap/healpix";
import { assertNside, ringCentres, ringTable } from "@/lib/sky/ring-geometry";
import { expectClose } from "../helpers";

describe("HEALPix RING geometry", () => {
  it("has 4 Nside - 1 rings holding 12 Nside^2 pixels in total (Gorski et al. 2005)", () => {
    for (const nside of [1, 2, 4, 16, 64]) {
      const t = ringTable(nside);
      expect(t.nRings).toBe(4 * nside - 1);
      let sum = 0;
      for (let r = 0; r < t.nRings; r++) sum += t.nPixels[r];
      expect(sum).toBe(12 * nside * nside);
      // First pixels are the running sum of the ring sizes.
      for (let r = 1; r < t.nRings; r++) expect(t.firstPixel[r]).toBe(t.firstPixel[r - 1] + t.nPixels[r - 1]);
    }
  });

  it("puts the polar-cap boundary at |z| = 2/3 (ring Nside and ring 3 Nside)", () => {
    const t = ringTable(8);
    expectClose(t.z[8 - 1], 2 / 3, 1e-15, "ring Nside");
    expectClose(t.z[3 * 8 - 1], -2 / 3, 1e-15, "ring 3 Nside");
    expectClose(t.z[2 * 8 - 1], 0, 1e-15, "equator ring");
  });

  it("agrees with @hscmap/healpix pix2vec_ring for every pixel centre at Nside 1, 2, 8 and 32 (to 1e-12)", () => {
    for (const nside of [1, 2, 8, 32]) {
      const c = ringCentres(nside);
      let worst = 0;
      for (let p = 0; p < 12 * nside * nside; p++) {
        const v = hp.pix2vec_ring(nside, p);
        worst = Math.max(worst, Math.abs(v[0] - c.x[p]), Math.abs(v[1] - c.y[p]), Math.abs(v[2] - c.z[p]));
        // phi in [0, 2 pi) and the pixel containing the centre is the pixel itself.
        expect(c.phiRad[p]).toBeGreaterThanOrEqual(0);
        expect(c.phiRad[p]).toBeLessThan(2 * Math.PI);
      }
      expect(worst).toBeLessThan(1e-12);
      for (let p = 0; p < 12 * nside * nside; p += 7) {
        expect(hp.vec2pix_ring(nside, [c.x[p], c.y[p], c.z[p]])).toBe(p);
      }
    }
  });

  it("rejects an Nside that is not a power of two", () => {
    expect(() => assertNside(3)).toThrow(RangeError);
    expect(() => assertNside(0)).toThrow(RangeError);
    expect(() => assertNside(16384)).toThrow(RangeError);
  });
});
