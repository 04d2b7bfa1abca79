import { describe, expect, it } from "vitest";
import { buildEventIndex, countEventsInWindows, declinationWindowFractions, precessedWindowFractions, scanWindows } from "@/lib/sky/scan";
import { capExposureIntegral, sommersBreakpointsDecRad, totalExposureIntegral } from "@/lib/sky/cap-exposure";
import { precessionNutationMatrix } from "@/lib/sky/precession";
import { jdTtFromUnixMs } from "@/lib/sky/time";
import { ringCentres } from "@/lib/sky/ring-geometry";
import { liMaSignificance } from "@/lib/sky/lima";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const D = Math.PI / 180;

/** Brute force O(windows x events): the definition of N_on (METHODS 5), same dot-product order as the scan. */
function bruteCounts(x: Float64Array, y: Float64Array, z: Float64Array, nside: number, psi: number): Int32Array {
  const c = ringCentres(nside);
  const cosPsi = Math.cos(psi);
  const out = new Int32Array(c.x.length);
  for (let p = 0; p < out.length; p++) {
    const qx = c.x[p], qy = c.y[p], qz = c.z[p];
    let k = 0;
    for (let e = 0; e < x.length; e++) if (x[e] * qx + y[e] * qy + z[e] * qz >= cosPsi) k++;
    out[p] = k;
  }
  return out;
}

/** Seeded directions: uniform on the sphere plus clusters at both poles, on RA 0/360 and on exact pixel centres. */
function testSky(n: number, seed: number) {
  const r = createRandom(seed);
  const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
  const c = ringCentres(4);
  for (let i = 0; i < n; i++) {
    let zi: number, phi: number;
    const kind = i % 6;
    if (kind === 0) { zi = 1 - 1e-4 * r.next(); phi = 2 * Math.PI * r.next(); }          // north pole cluster
    else if (kind === 1) { zi = -1 + 1e-4 * r.next(); phi = 2 * Math.PI * r.next(); }     // south pole cluster
    else if (kind === 2) { zi = 2 * r.next() - 1; phi = (r.next() - 0.5) * 0.02; }        // across RA 0/360
    else if (kind === 3 && i < 120) { const p = r.nextInt(c.x.length); x[i] = c.x[p]; y[i] = c.y[p]; z[i] = c.z[p]; continue; }
    else { zi = 2 * r.next() - 1; phi = 2 * Math.PI * r.next(); }
    if (i === 6) { zi = 1; phi = 0; }   // exactly at the poles
    if (i === 7) { zi = -1; phi = 0; }
    const rho = Math.sqrt(1 - zi * zi);
    x[i] = rho * Math.cos(phi); y[i] = rho * Math.sin(phi); z[i] = zi;
  }
  return { x, y, z };
}

describe("exact top-hat window scan", () => {
  it("counts exactly like the brute-force definition, pixel for pixel, for radii 1-120 deg, at the poles and across RA 0/360, with both methods", () => {
    const { x, y, z } = testSky(3000, 99);
    // Coarse index cells so that strips meet poles and the RA wrap often.
    const index = buildEventIndex(x, y, z, { stripHeightDeg: 1.5, cellWidthDeg: 0.7 });
    const fine = buildEventIndex(x, y, z);
    for (const [nside, radiusDeg] of [[8, 1], [8, 5], [4, 20], [8, 20], [4, 45], [2, 60], [4, 89], [2, 120]]) {
      const brute = bruteCounts(x, y, z, nside, radiusDeg * D);
      for (const [ix, method] of [[index, "strips"], [index, "scatter"], [fine, "strips"]] as const) {
        const fast = countEventsInWindows(ix, nside, radiusDeg * D, method);
        let diffs = 0;
        for (let p = 0; p < brute.length; p++) if (fast[p] !== brute[p]) diffs++;
        expect(diffs, `${method} nside ${nside} radius ${radiusDeg}`).toBe(0);
      }
    }
  });

  it("counts exactly like the brute-force definition with the default index for 20,000 events at Nside 16 (radii 3, 20, 70 deg)", () => {
    // Default strips and cells with many events per cell: every window's RA runs cross 0/360
    // somewhere on its ring, so the shifted cell tables and the whole-circle path are both used.
    const { x, y, z } = testSky(20000, 7);
    const index = buildEventIndex(x, y, z);
    for (const radiusDeg of [3, 20, 70]) {
      const brute = bruteCounts(x, y, z, 16, radiusDeg * D);
      const fast = countEventsInWindows(index, 16, radiusDeg * D, "strips");
      let diffs = 0;
      for (let p = 0; p < brute.length; p++) if (fast[p] !== brute[p]) diffs++;
      expect(diffs, `radius ${radiusDeg}`).toBe(0);
    }
  });

  it("counts windows whose radius equals the distance to an event at a pixel centre (ties at cos psi) like the brute force", () => {
    // Events placed on the Nside 4 centres; at radius = the centre spacing, dot products land on the boundary.
    const c = ringCentres(4);
    const x = Float64Array.from(c.x), y = Float64Array.from(c.y), z = Float64Array.from(c.z);
    const psi = Math.acos(x[0] * x[1] + y[0] * y[1] + z[0] * z[1]);
    for (const method of ["strips", "scatter"] as const) {
      const fast = countEventsInWindows(buildEventIndex(x, y, z, { stripHeightDeg: 2, cellWidthDeg: 1 }), 4, psi, method);
      expect(Array.from(fast)).toEqual(Array.from(bruteCounts(x, y, z, 4, psi)));
    }
  });

  it("gives N_exp = f N with f the cap share of the exposure and signed Li-Ma eq. 17 per window", () => {
    const { x, y, z } = testSky(2000, 3);
    const index = buildEventIndex(x, y, z);
    const omega = (d: number) => 1 + 0.5 * Math.sin(d); // smooth declination-only exposure
    const res = scanWindows(index, { nside: 4, radiusDeg: 25, expectation: { model: "declination", exposure: omega } });
    const c = ringCentres(4);
    const total = totalExposureIntegral(omega);
    for (const p of [0, 17, 100, 191]) {
      const f = capExposureIntegral(omega, Math.asin(c.z[p]), 25 * D) / total;
      expectClose(res.nExpected[p], f * 2000, 1e-9 * 2000, `N_exp pixel ${p}`);
      expectClose(res.significance[p], liMaSignificance(res.nOn[p], 2000 - res.nOn[p], f / (1 - f)), 1e-12, `S pixel ${p}`);
    }
    let best = 0;
    for (let p = 0; p < res.significance.length; p++) if (res.significance[p] > res.significance[best]) best = p;
    expect(res.max.pixel).toBe(best);
    expect(res.max.raDeg).toBeGreaterThanOrEqual(0);
    expect(res.max.raDeg).toBeLessThan(360);
  });

  it("uses a reference set with weight 1/nScramble as the expectation", () => {
    const a = testSky(1500, 1), b = testSky(4500, 2);
    const res = scanWindows(buildEventIndex(a.x, a.y, a.z), {
      nside: 4, radiusDeg: 15, expectation: { model: "reference", reference: buildEventIndex(b.x, b.y, b.z), weight: 1 / 3 },
    });
    const ref = bruteCounts(b.x, b.y, b.z, 4, 15 * D);
    for (let p = 0; p < ref.length; p += 11) expectClose(res.nExpected[p], ref[p] / 3, 1e-12, `reference pixel ${p}`);
  });

  it("reduces the precessed fractions to the declination-only ones for the identity rotation", () => {
    const omega = (d: number) => Math.max(0, Math.cos(d - 0.3));
    const id = [1, 0, 0, 0, 1, 0, 0, 0, 1];
    const a = declinationWindowFractions(8, 20 * D, omega);
    const b = precessedWindowFractions(8, 20 * D, omega, [{ weight: 2, icrsToDate: id }, { weight: 1, icrsToDate: id }]);
    for (let p = 0; p < a.length; p += 37) expect(Math.abs(a[p] - b[p])).toBeLessThanOrEqual(1e-6 * a[p] + 1e-9);
    // A rotation about z (a pure RA shift) leaves declinations, hence fractions, unchanged.
    const q = 0.3, rz = [Math.cos(q), Math.sin(q), 0, -Math.sin(q), Math.cos(q), 0, 0, 0, 1];
    const c = precessedWindowFractions(8, 20 * D, omega, [{ weight: 1, icrsToDate: rz }]);
    for (let p = 0; p < a.length; p += 37) expect(Math.abs(a[p] - c[p])).toBeLessThanOrEqual(1e-6 * a[p] + 1e-9);
  });

  it("matches, per window, the epoch mean of direct cap integrals at the declinations of date (sommers-precessed, 1995-2035)", () => {
    // Independent route: for each epoch rotate the centre with the ICRS -> of-date matrix of
    // precession.ts (IAU 2006 + nutation), integrate the Sommers cap there, average.
    const lat = -35.2 * D, zmax = 60 * D;
    const omega = (d: number) => {
      const xi = (Math.cos(zmax) - Math.sin(lat) * Math.sin(d)) / (Math.cos(lat) * Math.cos(d));
      const am = xi > 1 ? 0 : xi < -1 ? Math.PI : Math.acos(xi);
      return Math.cos(lat) * Math.cos(d) * Math.sin(am) + am * Math.sin(lat) * Math.sin(d);
    };
    const brk = sommersBreakpointsDecRad(lat, zmax);
    const epochs = [Date.UTC(1995, 0, 1), Date.UTC(2015, 6, 1), Date.UTC(2035, 0, 1)].map((t, k) => ({ weight: k + 1, icrsToDate: precessionNutationMatrix(jdTtFromUnixMs(t)) }));
    const f = precessedWindowFractions(8, 20 * D, omega, epochs, { breakpointsDecRad: brk });
    const c = ringCentres(8);
    const total = totalExposureIntegral(omega, { breakpointsDecRad: brk });
    let maxShift = 0;
    for (const p of [3, 200, 400, 500, 600, 700]) {
      let ref = 0;
      for (const ep of epochs) {
        const m = ep.icrsToDate;
        const dDate = Math.asin(m[6] * c.x[p] + m[7] * c.y[p] + m[8] * c.z[p]);
        maxShift = Math.max(maxShift, Math.abs(dDate - Math.asin(c.z[p])));
        ref += (ep.weight / 6) * capExposureIntegral(omega, dDate, 20 * D, { breakpointsDecRad: brk, relTol: 1e-11 }) / total;
      }
      expect(Math.abs(f[p] - ref)).toBeLessThanOrEqual(1e-6 * ref + 1e-10);
    }
    // Precession over 1995-2035 moves declinations by up to ~0.2 deg (20 arcsec/yr from memory).
    expect(maxShift).toBeGreaterThan(0.05 * D);
    expect(maxShift).toBeLessThan(0.3 * D);
  });

  it("rejects a radius outside (0, 180) deg", () => {
    const { x, y, z } = testSky(10, 1);
    expect(() => countEventsInWindows(buildEventIndex(x, y, z), 4, 0)).toThrow(RangeError);
    expect(() => countEventsInWindows(buildEventIndex(x, y, z), 4, Math.PI)).toThrow(RangeError);
  });
});
