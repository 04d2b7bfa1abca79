import { describe, expect, it } from "vitest";
import * as hp from "@hscmap/healpix";
import {
  countMap, degradeMap, degradeNestedPixels, nestedToRing, nestedToRingTable, nside2npix, pixelAreaSr, pixelCentres,
  pixelCorners, pixelSpacingDeg, queryDiscCentres, reorderMap, ringToNested, ringToNestedTable, validateNside,
  vectorToPixel, vectorsToPixels, type HealpixOrder,
} from "@/lib/sky/healpix";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

function randomVectors(n: number, seed: number) {
  const r = createRandom(seed);
  const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const zz = 2 * r.next() - 1, ph = 2 * Math.PI * r.next(), s = Math.sqrt(1 - zz * zz);
    x[i] = s * Math.cos(ph); y[i] = s * Math.sin(ph); z[i] = zz;
  }
  return { x, y, z };
}

function reference(nside: number, order: HealpixOrder, v: [number, number, number]): number {
  return order === "ring" ? hp.vec2pix_ring(nside, v) : hp.vec2pix_nest(nside, v);
}

describe("HEALPix counts and areas (Gorski et al. 2005)", () => {
  it("has Npix = 12 Nside^2 pixels of pi / (3 Nside^2) sr, summing to 4 pi sr", () => {
    for (const nside of [1, 2, 64, 1024, 8192]) {
      expect(nside2npix(nside)).toBe(12 * nside * nside);
      expectClose(pixelAreaSr(nside) * nside2npix(nside), 4 * Math.PI, 1e-12);
    }
  });

  it("has mean spacings 0.916, 0.458 and 0.229 deg at Nside 64, 128, 256 (METHODS section 8)", () => {
    expectClose(pixelSpacingDeg(64), 0.916, 0.0005);
    expectClose(pixelSpacingDeg(128), 0.458, 0.0005);
    expectClose(pixelSpacingDeg(256), 0.229, 0.0005);
  });

  it("accepts only powers of 2 from 1 to 8192 as Nside", () => {
    for (const bad of [0, 3, 12, 16384, 1.5, -2, NaN]) expect(() => validateNside(bad)).toThrow(RangeError);
    for (const ok of [1, 2, 4, 1024, 8192]) expect(() => validateNside(ok)).not.toThrow();
  });

  it("has 4 Nside - 1 iso-latitude rings of pixel centres, polar caps where |z| > 2/3", () => {
    for (const nside of [1, 2, 8, 32]) {
      const c = pixelCentres(nside, "ring");
      const zs = new Set(Array.from(c.z, (v) => v.toFixed(12)));
      expect(zs.size).toBe(4 * nside - 1);
      let cap = 0;
      for (let p = 0; p < c.z.length; p++) if (Math.abs(c.z[p]) > 2 / 3 + 1e-12) cap++;
      expect(cap).toBe(2 * 2 * nside * (nside - 1)); // 2 Nside (Nside - 1) pixels per cap
    }
  });

  it("spreads 1,200,000 uniform directions equally over the 768 pixels at Nside 8 (chi-square, 767 dof)", () => {
    const v = randomVectors(1_200_000, 77);
    const m = countMap(8, "nested", v);
    const expected = 1_200_000 / 768;
    let chi2 = 0;
    for (let p = 0; p < 768; p++) chi2 += (m.data[p] - expected) ** 2 / expected;
    // 0.1% upper critical value of chi-square with 767 dof ~ 888 (Wilson-Hilferty approximation)
    expect(chi2).toBeLessThan(888);
    expect(chi2).toBeGreaterThan(650); // 0.1% lower critical value ~ 653: not suspiciously flat
  });
});

describe("HEALPix binning", () => {
  it("bins random directions exactly like @hscmap/healpix vec2pix at Nside 1 to 8192, ring and nested", () => {
    const v = randomVectors(20000, 5);
    for (const nside of [1, 2, 16, 64, 1024, 8192]) for (const order of ["ring", "nested"] as const) {
      const pix = vectorsToPixels(nside, order, v);
      for (let i = 0; i < v.x.length; i++) {
        const ref = reference(nside, order, [v.x[i], v.y[i], v.z[i]]);
        if (pix[i] !== ref) expect.fail(`nside ${nside} ${order} direction ${i}: ${pix[i]} vs ${ref}`);
      }
    }
  });

  it("bins edge directions (poles, z = +-2/3, phi = 0 and 2 pi, pixel corners and centres) like @hscmap/healpix", () => {
    const edge: [number, number, number][] = [[0, 0, 1], [0, 0, -1], [1, 0, 0], [1, -0, 0], [-1, 0, 0], [0, 1, 0], [0, -1, 0], [1, -1e-17, 0], [1, 1e-17, 0], [1e-300, 0, 1], [3, 4, 0]];
    for (const zz of [2 / 3, -2 / 3, 2 / 3 + 1e-16, 2 / 3 - 1e-16, 1 - 1e-16, -1 + 1e-16, 0]) {
      for (const ph of [0, Math.PI / 4, Math.PI / 2, Math.PI, 2 * Math.PI - 1e-15, 2 * Math.PI, -1e-15, 1e-15]) {
        const s = Math.sqrt(1 - zz * zz);
        edge.push([s * Math.cos(ph), s * Math.sin(ph), zz]);
      }
    }
    for (const nside of [1, 4, 64, 1024]) {
      const list = edge.slice();
      for (let p = 0; p < Math.min(12 * nside * nside, 3000); p += 7) {
        list.push(hp.pix2vec_nest(nside, p));
        for (const c of hp.corners_nest(nside, p)) list.push(c);
      }
      const x = Float64Array.from(list, (q) => q[0]), y = Float64Array.from(list, (q) => q[1]), z = Float64Array.from(list, (q) => q[2]);
      for (const order of ["ring", "nested"] as const) {
        const pix = vectorsToPixels(nside, order, { x, y, z });
        for (let i = 0; i < list.length; i++) {
          const ref = reference(nside, order, list[i]);
          if (pix[i] !== ref) expect.fail(`nside ${nside} ${order} edge ${i} (${list[i].join(",")}): ${pix[i]} vs ${ref}`);
        }
      }
    }
    expect(vectorToPixel(4, "ring", 0, 0, 1)).toBe(hp.vec2pix_ring(4, [0, 0, 1]));
    expect(vectorsToPixels(4, "ring", { x: Float64Array.of(NaN), y: Float64Array.of(0), z: Float64Array.of(0) })[0]).toBe(-1);
  });

  it("maps every pixel centre back to its own pixel (round trip), both orders, Nside 1 to 128", () => {
    for (const nside of [1, 2, 8, 128]) for (const order of ["ring", "nested"] as const) {
      const c = pixelCentres(nside, order);
      const pix = vectorsToPixels(nside, order, c);
      for (let p = 0; p < pix.length; p++) if (pix[p] !== p) expect.fail(`nside ${nside} ${order}: centre of ${p} -> ${pix[p]}`);
    }
  });

  it("computes pixel centres equal to @hscmap/healpix pix2vec to 1e-14, with ra in [0, 360) deg", () => {
    for (const nside of [1, 4, 32]) for (const order of ["ring", "nested"] as const) {
      const c = pixelCentres(nside, order);
      for (let p = 0; p < c.x.length; p++) {
        const v = order === "ring" ? hp.pix2vec_ring(nside, p) : hp.pix2vec_nest(nside, p);
        const worst = Math.max(Math.abs(c.x[p] - v[0]), Math.abs(c.y[p] - v[1]), Math.abs(c.z[p] - v[2]), Math.abs(Math.sin(c.decDeg[p] * Math.PI / 180) - v[2]));
        if (!(worst <= 1e-14 && c.raDeg[p] >= 0 && c.raDeg[p] < 360)) expect.fail(`nside ${nside} ${order} pixel ${p}: off by ${worst}, ra ${c.raDeg[p]}`);
      }
    }
    // pixel 0 (ring) at Nside 64 has phi = 45 deg (pi / (2i) (j - 1/2), i = j = 1), not 405 deg
    expectClose(pixelCentres(64, "ring").raDeg[0], 45, 1e-12);
  });
});

describe("HEALPix orderings and degrading", () => {
  it("converts nested <-> ring like @hscmap/healpix, and the two tables are inverse permutations", () => {
    for (const nside of [1, 2, 16, 64]) {
      const n2r = nestedToRingTable(nside), r2n = ringToNestedTable(nside);
      for (let p = 0; p < n2r.length; p++) {
        if (n2r[p] !== hp.nest2ring(nside, p) || r2n[n2r[p]] !== p) expect.fail(`nside ${nside} nested pixel ${p}`);
      }
      expect(nestedToRing(nside, n2r.length - 1)).toBe(n2r[n2r.length - 1]);
      expect(ringToNested(nside, 5 % n2r.length)).toBe(r2n[5 % n2r.length]);
    }
  });

  it("degrades a nested index at Nside 1024 by >> 2k to the nested index at 64, 8 and 1 (METHODS section 3)", () => {
    const v = randomVectors(50000, 6);
    const fine = vectorsToPixels(1024, "nested", v);
    for (const coarse of [1024, 64, 8, 1]) {
      const direct = vectorsToPixels(coarse, "nested", v);
      const shifted = degradeNestedPixels(fine, 1024, coarse);
      for (let i = 0; i < fine.length; i++) if (direct[i] !== shifted[i]) expect.fail(`coarse ${coarse}, direction ${i}`);
    }
    expect(() => degradeNestedPixels(fine, 64, 128)).toThrow(RangeError);
  });

  it("degrades maps keeping the total (sum) or the mean, and reorders maps reversibly", () => {
    const v = randomVectors(100000, 12);
    const ring64 = countMap(64, "ring", v);
    const coarse = degradeMap(ring64, 16, "sum");
    const direct = countMap(16, "ring", v);
    for (let p = 0; p < coarse.data.length; p++) expect(coarse.data[p]).toBe(direct.data[p]);
    const mean = degradeMap(ring64, 16, "mean");
    expectClose(mean.data[10], direct.data[10] / 16, 1e-12);
    const nested = reorderMap(ring64, "nested");
    expect(nested.data).toBeInstanceOf(Int32Array);
    const back = reorderMap(nested, "ring");
    expect(Array.from(back.data)).toEqual(Array.from(ring64.data));
    const nestedDirect = countMap(64, "nested", v);
    expect(Array.from(nested.data)).toEqual(Array.from(nestedDirect.data));
  });
});

describe("HEALPix geometry queries", () => {
  it("finds exactly the pixel centres within the radius (brute force), incl. poles, RA 0/360 and radii > 90 deg", () => {
    const r = createRandom(31);
    const nside = 16;
    for (const order of ["ring", "nested"] as const) {
      const c = pixelCentres(nside, order);
      const cases: [number, number, number][] = [[0, 90, 10], [0, -90, 25], [359.9, 0, 5], [0.1, 30, 12], [123, -45, 100], [200, 10, 0]];
      for (let k = 0; k < 10; k++) cases.push([360 * r.next(), Math.asin(2 * r.next() - 1) * 180 / Math.PI, 1 + 60 * r.next()]);
      for (const [ra, dec, radDeg] of cases) {
        const cd = Math.cos(dec * Math.PI / 180);
        const ux = cd * Math.cos(ra * Math.PI / 180), uy = cd * Math.sin(ra * Math.PI / 180), uz = Math.sin(dec * Math.PI / 180);
        const got = Array.from(queryDiscCentres(nside, order, ux, uy, uz, radDeg * Math.PI / 180));
        const want: number[] = [];
        for (let p = 0; p < c.x.length; p++) {
          const ang = Math.atan2(Math.hypot(c.y[p] * uz - c.z[p] * uy, c.z[p] * ux - c.x[p] * uz, c.x[p] * uy - c.y[p] * ux), c.x[p] * ux + c.y[p] * uy + c.z[p] * uz);
          if (ang <= radDeg * Math.PI / 180) want.push(p);
        }
        expect(got).toEqual(want);
      }
    }
  });

  it("gives four pixel corners within the maximum pixel radius of the centre, each binning near the pixel", () => {
    for (const order of ["ring", "nested"] as const) {
      for (const ipix of [0, 17, 100, 767]) {
        const corners = pixelCorners(8, order, ipix);
        const c = order === "ring" ? hp.pix2vec_ring(8, ipix) : hp.pix2vec_nest(8, ipix);
        for (let k = 0; k < 4; k++) {
          const px = corners[3 * k], py = corners[3 * k + 1], pz = corners[3 * k + 2];
          expectClose(Math.hypot(px, py, pz), 1, 1e-12);
          const ang = Math.acos(Math.min(1, px * c[0] + py * c[1] + pz * c[2]));
          expect(ang).toBeLessThanOrEqual(hp.max_pixrad(8) + 1e-12);
          // a point 1% of the way from the corner to the centre lies inside the pixel
          const qx = 0.99 * px + 0.01 * c[0], qy = 0.99 * py + 0.01 * c[1], qz = 0.99 * pz + 0.01 * c[2];
          expect(vectorToPixel(8, order, qx, qy, qz)).toBe(ipix);
        }
      }
    }
  });
});
