import { describe, expect, it } from "vitest";
import * as Astronomy from "astronomy-engine";
import {
  biasPrecessionMatrix, declinationOfDateRad, equationOfEquinoxesRad, meanObliquityRad, nutationAnglesRad,
  precessionNutationMatrix, trueOfDateToIcrsMatrix,
} from "@/lib/sky/precession";
import { jdTtFromUnixMs } from "@/lib/sky/time";
import { multiply3 } from "@/lib/sky/vectors";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const ARCSEC = Math.PI / 648000;

describe("precession-nutation", () => {
  it("gives the mean obliquity 84381.406 arcsec at J2000 (IAU 2006, Capitaine et al. 2003 eq. 39)", () => {
    expectClose(meanObliquityRad(2451545.0) / ARCSEC, 84381.406, 1e-9);
  });

  it("matches the IAU SOFA pnm06a test matrix at TT = MJD 50123.9999 within 0.1 arcsec (values from memory)", () => {
    // t_sofa_c.c, t_pnm06a: rbpn for date 2400000.5 + 50123.9999 (from memory). Our nutation is
    // truncated to ten terms, so agreement to ~0.05 arcsec (2.5e-7 rad) is expected, not 1e-12.
    const ref = [
      0.9999995832794205337, 0.8372382772630962111e-3, 0.3639684771140623099e-3,
      -0.8372533744743683605e-3, 0.9999996486492861646, 0.4132905944611019498e-4,
      -0.3639337469629464969e-3, -0.4163377605910663999e-4, 0.9999999329094260057,
    ];
    const m = precessionNutationMatrix(2400000.5 + 50123.9999);
    for (let i = 0; i < 9; i++) expectClose(m[i], ref[i], 0.1 * ARCSEC, `element ${i}`);
  });

  it("is a rotation: M M^T = I to 1e-15 and det = +1, and trueOfDateToIcrsMatrix is its inverse", () => {
    for (const jd of [2449000.5, 2451545.0, 2460000.5, 2464000.5]) {
      const m = precessionNutationMatrix(jd);
      const p = multiply3(m, trueOfDateToIcrsMatrix(jd));
      for (let i = 0; i < 9; i++) expectClose(p[i], i % 4 === 0 ? 1 : 0, 2e-15);
      const det = m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
      expectClose(det, 1, 1e-14);
    }
  });

  it("agrees with astronomy-engine Rotation_EQJ_EQD within 0.5 arcsec on random epochs 1995-2035", () => {
    const r = createRandom(21);
    let worst = 0;
    for (let k = 0; k < 60; k++) {
      const unixMs = Date.UTC(1995, 0, 1) + r.next() * 40 * 365.25 * 86400e3;
      const time = Astronomy.MakeTime(new Date(unixMs));
      const rot = Astronomy.Rotation_EQJ_EQD(time);
      const m = precessionNutationMatrix(jdTtFromUnixMs(unixMs));
      // astronomy-engine stores rot[column][row] (vector' = sum_i rot[i][j] v[i])
      for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) worst = Math.max(worst, Math.abs(m[3 * i + j] - rot.rot[j][i]));
    }
    expect(worst).toBeLessThan(0.5 * ARCSEC);
  });

  it("has a bias-precession part that moves the equinox by ~50.3 arcsec per year in longitude (IAU 2006 general precession 5028.796 arcsec/cy, from memory)", () => {
    // Over 10 years the mean equinox moves by p_A ~ 502.88 arcsec along the ecliptic; the ICRS x axis,
    // expressed in the mean frame of date, then has longitude ~ -p_A cos-projected: check the angle moved.
    const m = biasPrecessionMatrix(2451545.0 + 3652.5);
    const angle = Math.acos(m[0]); // angle between the ICRS x axis and the mean equinox of date
    expectClose(angle / ARCSEC, 502.88, 0.5);
  });

  it("has nutation in longitude within +-17.3 arcsec and in obliquity within +-9.3 arcsec (leading 18.6-yr term amplitudes, IERS 2003)", () => {
    let maxPsi = 0, maxEps = 0;
    for (let d = 0; d < 6800; d += 5) {
      const { dpsiRad, depsRad } = nutationAnglesRad(2451545.0 + d);
      maxPsi = Math.max(maxPsi, Math.abs(dpsiRad)); maxEps = Math.max(maxEps, Math.abs(depsRad));
    }
    expect(maxPsi / ARCSEC).toBeGreaterThan(16.5); expect(maxPsi / ARCSEC).toBeLessThan(19.5);
    expect(maxEps / ARCSEC).toBeGreaterThan(8.5); expect(maxEps / ARCSEC).toBeLessThan(10.5);
    expectClose(equationOfEquinoxesRad(2451545.0) / ARCSEC, nutationAnglesRad(2451545.0).dpsiRad / ARCSEC * Math.cos(meanObliquityRad(2451545.0)), 1e-12);
  });

  it("shifts the declination of (ra 0, dec 0) by n = 20.04 arcsec/yr of precession (IAU 2006 rate 2004.19 arcsec/cy, from memory) plus nutation <= 7 arcsec", () => {
    const jd = 2451545.0 + 20 * 365.25;
    const decArcsec = declinationOfDateRad(1, 0, 0, jd) / ARCSEC;
    expectClose(decArcsec, 20 * 20.0419, 8);
    // poles of the ICRS stay near dec +90 of date (within the precession angle theta ~ 20"/yr)
    const decPole = declinationOfDateRad(0, 0, 1, jd) / ARCSEC;
    expectClose(decPole, 90 * 3600 - 20 * 20.0419, 8);
  });
});
