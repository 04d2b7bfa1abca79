import { describe, expect, it } from "vitest";
import * as Astronomy from "astronomy-engine";
import {
  NCP_GALACTIC_LON_DEG, NGP_DEC_DEG, NGP_RA_DEG, azimuthEastCcwToNorthCwDeg, equatorialToGalactic,
  equatorialToHorizontal, equatorialToSupergalactic, galacticToEquatorial, galacticToSupergalactic,
  horizontalToEquatorial, icrsToGalacticMatrix, supergalacticToEquatorial, supergalacticToGalactic,
} from "@/lib/sky/coordinates";
import { declinationOfDateRad } from "@/lib/sky/precession";
import { jdTtFromUnixMs } from "@/lib/sky/time";
import { angularDistanceDeg } from "@/lib/sky/vectors";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const DEG = Math.PI / 180;

function astronomyEngineIcrs(zenithDeg: number, azimuthDeg: number, unixMs: number, lat: number, lon: number, h: number): [number, number, number] {
  const time = Astronomy.MakeTime(new Date(unixMs));
  const observer = new Astronomy.Observer(lat, lon, h);
  const v = Astronomy.RotateVector(Astronomy.Rotation_HOR_EQJ(time, observer), Astronomy.VectorFromHorizon(new Astronomy.Spherical(90 - zenithDeg, azimuthDeg, 1), time, ""));
  const n = Math.hypot(v.x, v.y, v.z);
  return [v.x / n, v.y / n, v.z / n];
}

describe("horizontal <-> equatorial", () => {
  it("agrees with astronomy-engine (no refraction) within 30 arcsec over random sites, times 1995-2035 and directions", () => {
    const r = createRandom(2025);
    const nSites = 40, perSite = 50;
    let worstArcsec = 0;
    for (let s = 0; s < nSites; s++) {
      const site = { latitudeDeg: -89.9 + 179.8 * r.next(), longitudeDeg: -180 + 360 * r.next(), heightM: 3000 * r.next() };
      const zen = new Float64Array(perSite), az = new Float64Array(perSite), t = new Float64Array(perSite);
      for (let i = 0; i < perSite; i++) {
        zen[i] = 89.9 * r.next(); az[i] = 360 * r.next();
        t[i] = Date.UTC(1995, 0, 1) + r.next() * (Date.UTC(2035, 0, 1) - Date.UTC(1995, 0, 1));
      }
      zen[0] = 0; az[1] = 0; az[2] = 359.999999; // zenith, azimuth wrap
      const out = horizontalToEquatorial({ zenithDeg: zen, azimuthDeg: az, unixMs: t }, site);
      for (let i = 0; i < perSite; i++) {
        const [x, y, z] = astronomyEngineIcrs(zen[i], az[i], t[i], site.latitudeDeg, site.longitudeDeg, site.heightM);
        const sep = Math.atan2(Math.hypot(y * out.z[i] - z * out.y[i], z * out.x[i] - x * out.z[i], x * out.y[i] - y * out.x[i]), x * out.x[i] + y * out.y[i] + z * out.z[i]);
        worstArcsec = Math.max(worstArcsec, sep / DEG * 3600);
        expect(out.raDeg[i] >= 0 && out.raDeg[i] < 360).toBe(true);
        expectClose(Math.hypot(out.x[i], out.y[i], out.z[i]), 1, 1e-14);
      }
    }
    expect(worstArcsec).toBeLessThan(30);
    // measured ~0.1 arcsec; a regression to >2 arcsec would mean a real error (e.g. wrong nutation)
    expect(worstArcsec).toBeLessThan(2);
  });

  it("sends zenith 0 deg to declination of date = site latitude (vertical = celestial latitude)", () => {
    const t = Float64Array.of(Date.UTC(2030, 4, 17, 6, 30), Date.UTC(1999, 11, 31, 23, 59, 59));
    for (const lat of [-35.2, 0, 39.3, 89.99, -90]) {
      const out = horizontalToEquatorial({ zenithDeg: [0, 0], azimuthDeg: [123, 0], unixMs: t }, { latitudeDeg: lat, longitudeDeg: -69.3, heightM: 1400 });
      for (let i = 0; i < 2; i++) {
        expectClose(declinationOfDateRad(out.x[i], out.y[i], out.z[i], jdTtFromUnixMs(t[i])) / DEG, lat, 0.2 / 3600, `lat ${lat}`);
      }
    }
  });

  it("reads east-counterclockwise azimuths as (90 - az) mod 360 north-clockwise (METHODS section 1)", () => {
    expect(azimuthEastCcwToNorthCwDeg(0)).toBe(90);
    expect(azimuthEastCcwToNorthCwDeg(90)).toBe(0);
    expect(azimuthEastCcwToNorthCwDeg(180)).toBe(270);
    expect(azimuthEastCcwToNorthCwDeg(-270)).toBe(0);
    const site = { latitudeDeg: 39.3, longitudeDeg: -112.9, heightM: 1400 };
    const input = { zenithDeg: [30, 50, 10], azimuthDeg: [0, 135, 300], unixMs: [Date.UTC(2020, 1, 1), Date.UTC(2020, 1, 2), Date.UTC(2021, 6, 1)] };
    const a = horizontalToEquatorial(input, site, { azimuthConvention: "east-counterclockwise" });
    const b = horizontalToEquatorial({ ...input, azimuthDeg: input.azimuthDeg.map(azimuthEastCcwToNorthCwDeg) }, site);
    for (let i = 0; i < 3; i++) expectClose(angularDistanceDeg(a.raDeg[i], a.decDeg[i], b.raDeg[i], b.decDeg[i]), 0, 1e-9);
    expect(() => horizontalToEquatorial(input, site, { azimuthConvention: "south" as never })).toThrow(/azimuth convention/);
  });

  it("round-trips horizontal -> equatorial -> horizontal to 1e-8 deg, in both azimuth conventions", () => {
    const r = createRandom(8);
    const n = 2000;
    const zen = new Float64Array(n), az = new Float64Array(n), t = new Float64Array(n);
    for (let i = 0; i < n; i++) { zen[i] = 0.01 + 89.98 * r.next(); az[i] = 360 * r.next(); t[i] = Date.UTC(2004, 0, 1) + r.next() * 3e11; }
    const site = { latitudeDeg: -35.2, longitudeDeg: -69.5, heightM: 1400 };
    for (const conv of ["north-clockwise", "east-counterclockwise"] as const) {
      const eq = horizontalToEquatorial({ zenithDeg: zen, azimuthDeg: az, unixMs: t }, site, { azimuthConvention: conv });
      const back = equatorialToHorizontal({ raDeg: eq.raDeg, decDeg: eq.decDeg, unixMs: t }, site, { azimuthConvention: conv });
      for (let i = 0; i < n; i++) {
        expectClose(back.zenithDeg[i], zen[i], 1e-8);
        const d = Math.abs(back.azimuthDeg[i] - az[i]);
        expectClose(Math.min(d, 360 - d) * Math.sin(zen[i] * DEG), 0, 1e-8);
      }
    }
  });

  it("returns NaN for a non-finite time and rejects a latitude outside [-90, 90] deg", () => {
    const out = horizontalToEquatorial({ zenithDeg: [10, 10], azimuthDeg: [0, 0], unixMs: [NaN, Date.UTC(2020, 0, 1)] }, { latitudeDeg: 0, longitudeDeg: 0, heightM: 0 });
    expect(out.raDeg[0]).toBeNaN();
    expect(Number.isFinite(out.raDeg[1])).toBe(true);
    expect(() => horizontalToEquatorial({ zenithDeg: [], azimuthDeg: [], unixMs: [] }, { latitudeDeg: 91, longitudeDeg: 0, heightM: 0 })).toThrow(RangeError);
  });
});

describe("galactic and supergalactic", () => {
  it("puts the north galactic pole (RA 192.85948, Dec +27.12825 deg) at b = +90 and the NCP at l = 122.93192 deg (Hipparcos, ESA SP-1200)", () => {
    const g = equatorialToGalactic([NGP_RA_DEG, 0], [NGP_DEC_DEG, 90]);
    expectClose(g.bDeg[0], 90, 1e-9);
    expectClose(g.lDeg[1], NCP_GALACTIC_LON_DEG, 1e-9);
    expectClose(g.bDeg[1], NGP_DEC_DEG, 1e-9);
  });

  it("puts the galactic centre (RA 266.405, Dec -28.936 deg, ESA SP-1200) at l = 0, b = 0 within 0.002 deg", () => {
    const g = equatorialToGalactic([266.405], [-28.936]);
    const l = g.lDeg[0] > 180 ? g.lDeg[0] - 360 : g.lDeg[0];
    expectClose(l, 0, 0.002); expectClose(g.bDeg[0], 0, 0.002);
  });

  it("agrees with astronomy-engine Rotation_EQJ_GAL within 10 arcsec (it uses an older B1950-derived pole)", () => {
    const ours = icrsToGalacticMatrix();
    const rot = Astronomy.Rotation_EQJ_GAL().rot;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expectClose(ours[3 * i + j], rot[j][i], 10 / 206265);
  });

  it("round-trips equatorial <-> galactic <-> supergalactic to 1e-9 deg, including RA 0/360 and the poles", () => {
    const ra = [0, 359.9999999, 180, 45, 12.3, 266.405], dec = [0, -10, 90, -90, 45.6, -28.936];
    const g = equatorialToGalactic(ra, dec);
    const e = galacticToEquatorial(g.lDeg, g.bDeg);
    const sg = galacticToSupergalactic(g.lDeg, g.bDeg);
    const g2 = supergalacticToGalactic(sg.sglDeg, sg.sgbDeg);
    const sg2 = equatorialToSupergalactic(ra, dec);
    const e2 = supergalacticToEquatorial(sg2.sglDeg, sg2.sgbDeg);
    for (let i = 0; i < ra.length; i++) {
      expectClose(angularDistanceDeg(e.raDeg[i], e.decDeg[i], ra[i], dec[i]), 0, 1e-9);
      expectClose(angularDistanceDeg(g2.lDeg[i], g2.bDeg[i], g.lDeg[i], g.bDeg[i]), 0, 1e-9);
      expectClose(angularDistanceDeg(sg.sglDeg[i], sg.sgbDeg[i], sg2.sglDeg[i], sg2.sgbDeg[i]), 0, 1e-9);
      expectClose(angularDistanceDeg(e2.raDeg[i], e2.decDeg[i], ra[i], dec[i]), 0, 1e-9);
      expect(e.raDeg[i] >= 0 && e.raDeg[i] < 360).toBe(true);
    }
  });

  it("puts the supergalactic pole at l = 47.37, b = +6.32 deg and its origin at l = 137.37, b = 0 (RC3); the pole is near ICRS RA 283.75, Dec +15.71 deg (general-purpose libraries, from memory)", () => {
    const g = supergalacticToGalactic([0, 0], [90, 0]);
    expectClose(g.lDeg[0], 47.37, 1e-9); expectClose(g.bDeg[0], 6.32, 1e-9);
    expectClose(g.lDeg[1], 137.37, 1e-9); expectClose(g.bDeg[1], 0, 1e-9);
    const e = supergalacticToEquatorial([0], [90]);
    expectClose(e.raDeg[0], 283.75, 0.05); expectClose(e.decDeg[0], 15.71, 0.05);
  });
});
