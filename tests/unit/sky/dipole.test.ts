import { describe, expect, it } from "vitest";
import { reconstructDipole } from "@/lib/sky/dipole";
import { simulateLocalSky } from "./local-sky-fixture";
import { expectClose } from "../helpers";

describe("3-D dipole from the RA harmonic and the azimuthal asymmetry (Aublin & Parizot 2005)", () => {
  it("recovers an injected dipole (d = 0.15, RA 100 deg, dec -30 deg) within 3 sigma per component", () => {
    const inj = { amplitude: 0.15, raDeg: 100, decDeg: -30 };
    const sky = simulateLocalSky({ n: 80_000, seed: 11, latDeg: -35.2, zenithMaxDeg: 60, dipole: inj });
    const res = reconstructDipole({ ...sky, latitudeDeg: -35.2 });
    const D = Math.PI / 180;
    expectClose(res.dPerp, inj.amplitude * Math.cos(inj.decDeg * D), 3 * res.sigmaDPerp, "d_perp");
    expectClose(res.dZ, inj.amplitude * Math.sin(inj.decDeg * D), 3 * res.sigmaDZ, "d_z");
    expectClose(res.raDeg, inj.raDeg, 3 * res.sigmaRaDeg, "RA");
    expectClose(res.decDeg, inj.decDeg, 3 * res.sigmaDecDeg, "dec");
    expectClose(res.amplitude, inj.amplitude, 3 * res.sigmaAmplitude, "amplitude");
  });

  it("gives uniform Rayleigh p-values P = exp(-N r^2/4) on isotropic simulated skies (KS at 1%)", () => {
    const skies = 150, ps: number[] = [];
    for (let s = 0; s < skies; s++) {
      const sky = simulateLocalSky({ n: 400, seed: 1000 + s, latDeg: -35.2, zenithMaxDeg: 60 });
      ps.push(reconstructDipole({ ...sky, latitudeDeg: -35.2 }).rayleigh.p);
    }
    ps.sort((a, b) => a - b);
    let dmax = 0;
    ps.forEach((p, k) => { dmax = Math.max(dmax, Math.abs(p - k / skies), Math.abs(p - (k + 1) / skies)); });
    // KS one-sample critical value at 1%: 1.628 / sqrt(n) (asymptotic; Massey 1951, JASA 46, 68).
    expect(dmax).toBeLessThan(1.628 / Math.sqrt(skies));
  });

  it("reports the dipole RA in [0, 360) across the 0/360 wrap", () => {
    const sky = simulateLocalSky({ n: 40_000, seed: 4, latDeg: -35.2, zenithMaxDeg: 60, dipole: { amplitude: 0.3, raDeg: 358, decDeg: 0 } });
    const res = reconstructDipole({ ...sky, latitudeDeg: -35.2 });
    expect(res.raDeg).toBeGreaterThanOrEqual(0);
    expect(res.raDeg).toBeLessThan(360);
    const dRa = ((res.raDeg - 358 + 540) % 360) - 180;
    expect(Math.abs(dRa)).toBeLessThan(3 * res.sigmaRaDeg);
  });
});
