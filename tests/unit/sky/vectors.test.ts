import { describe, expect, it } from "vitest";
import {
  angleBetweenVectorsRad, angularDistanceDeg, lonLatDegToVector, lonLatDegToVectors, multiply3, rotateVectors,
  transpose3, vectorLatRad, vectorLonRad, vectorsToLonLatDeg,
} from "@/lib/sky/vectors";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

describe("vectors", () => {
  it("maps (ra 0, dec 0), (90, 0) and dec +-90 deg to the x, y and +-z axes", () => {
    const a = lonLatDegToVector(0, 0), b = lonLatDegToVector(90, 0), n = lonLatDegToVector(123, 90), s = lonLatDegToVector(0, -90);
    expectClose(a[0], 1, 1e-15); expectClose(a[1], 0, 1e-15);
    expectClose(b[0], 0, 1e-15); expectClose(b[1], 1, 1e-15);
    expectClose(n[2], 1, 1e-15); expectClose(Math.hypot(n[0], n[1]), 0, 1e-15);
    expectClose(s[2], -1, 1e-15);
  });

  it("round-trips 10000 random directions through unit vectors to 1e-10 deg, with ra in [0, 360)", () => {
    const r = createRandom(3);
    const n = 10000;
    const ra = new Float64Array(n), dec = new Float64Array(n);
    for (let i = 0; i < n; i++) { ra[i] = 360 * r.next(); dec[i] = Math.asin(2 * r.next() - 1) * 180 / Math.PI; }
    ra[0] = 0; dec[0] = 0; ra[1] = 359.9999999; dec[1] = 10; ra[2] = 45; dec[2] = 89.9999;
    const v = lonLatDegToVectors(ra, dec);
    const back = vectorsToLonLatDeg(v.x, v.y, v.z);
    for (let i = 0; i < n; i++) {
      expect(back.lonDeg[i] >= 0 && back.lonDeg[i] < 360).toBe(true);
      const dra = Math.abs(back.lonDeg[i] - ra[i]);
      expectClose(Math.min(dra, 360 - dra) * Math.cos(dec[i] * Math.PI / 180), 0, 1e-10, `ra ${i}`);
      expectClose(back.latDeg[i], dec[i], 1e-10, `dec ${i}`);
      expectClose(Math.hypot(v.x[i], v.y[i], v.z[i]), 1, 1e-15);
    }
  });

  it("gives longitude 0 at the poles and reduces -0 longitude to [0, 2 pi) rad", () => {
    expect(vectorLonRad(0, 0)).toBe(0);
    expect(vectorLonRad(1, -0)).toBe(0);
    expect(vectorLonRad(1, -1e-300)).toBeLessThan(2 * Math.PI);
    expectClose(vectorLatRad(0, 0, 5), Math.PI / 2, 0);
  });

  it("measures angular distance in deg: 90 between axes, 180 antipodal, tiny separations accurately", () => {
    expectClose(angularDistanceDeg(0, 0, 90, 0), 90, 1e-12);
    expectClose(angularDistanceDeg(10, 20, 190, -20), 180, 1e-12);
    // across the RA wrap: (359.5, 0) to (0.5, 0) is 1 deg
    expectClose(angularDistanceDeg(359.5, 0, 0.5, 0), 1, 1e-12);
    // 1 milliarcsecond separation (acos would lose it entirely)
    const mas = 1 / 3.6e6;
    expectClose(angularDistanceDeg(0, 0, mas, 0), mas, 1e-18);
    // spherical law of cosines at a moderate angle (independent formula)
    const d = angularDistanceDeg(30, 40, 100, -10);
    const c = Math.sin(40 * Math.PI / 180) * Math.sin(-10 * Math.PI / 180) + Math.cos(40 * Math.PI / 180) * Math.cos(-10 * Math.PI / 180) * Math.cos(70 * Math.PI / 180);
    expectClose(d, Math.acos(c) * 180 / Math.PI, 1e-10);
    expectClose(angleBetweenVectorsRad(2, 0, 0, 0, 3, 0), Math.PI / 2, 1e-15);
  });

  it("rotates vectors with a matrix whose transpose undoes it", () => {
    const a = 0.3, c = Math.cos(a), s = Math.sin(a);
    const m = Float64Array.of(c, -s, 0, s, c, 0, 0, 0, 1);
    const id = multiply3(m, transpose3(m));
    for (let i = 0; i < 9; i++) expectClose(id[i], i % 4 === 0 ? 1 : 0, 1e-15);
    const v = { x: Float64Array.of(1), y: Float64Array.of(0), z: Float64Array.of(0) };
    const w = rotateVectors(m, v);
    expectClose(w.x[0], c, 1e-15); expectClose(w.y[0], s, 1e-15);
    const back = rotateVectors(transpose3(m), w);
    expectClose(back.x[0], 1, 1e-15); expectClose(back.y[0], 0, 1e-15);
  });
});
