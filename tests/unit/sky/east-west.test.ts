import { describe, expect, it } from "vitest";
import { eastWestAnalysis } from "@/lib/sky/east-west";
import { rayleighAnalysis } from "@/lib/sky/rayleigh";
import { simulateLocalSky } from "./local-sky-fixture";
import { expectClose } from "../helpers";

describe("east-west differential method (Bonino et al. 2011)", () => {
  it("counts east (+) against west (-) in local sidereal time: a_EW = (2/N) sum s_i cos t_i", () => {
    // Two events: east at t = 0, west at t = pi -> both add +cos: a = (2/2)(1 + 1) = 2, b ~ 0.
    const r = eastWestAnalysis([90, 270], [0, Math.PI]);
    expectClose(r.aEW, 2, 1e-15, "a_EW");
    expectClose(r.bEW, 0, 1e-15, "b_EW");
    expect(r.nEast).toBe(1); expect(r.nWest).toBe(1);
    // Meridian events (azimuth 0 or 180 deg, and 360 = 0) are skipped.
    expect(eastWestAnalysis([0, 180, 360, 45], [1, 1, 1, 1]).n).toBe(1);
  });

  it("recovers an injected RA modulation: amplitude and phase of the converted harmonic agree with Rayleigh within 3 sigma", () => {
    const sky = simulateLocalSky({ n: 150_000, seed: 21, latDeg: -35.2, zenithMaxDeg: 60, dipole: { amplitude: 0.2, raDeg: 100, decDeg: 0 } });
    const ray = rayleighAnalysis(sky.raRad);
    const ew = eastWestAnalysis(sky.azimuthDeg, sky.lstRad, { zenithDeg: sky.zenithDeg, decRad: sky.decRad });
    expect(ew.amplitudeRA).not.toBeNull();
    expectClose(ew.amplitudeRA!, ray.amplitude, 3 * Math.hypot(ew.sigmaRA!, ray.sigma), "amplitude");
    const phaseErrDeg = (3 * ew.sigmaRA! / ew.amplitudeRA!) * 180 / Math.PI;
    expectClose(ew.phaseRADeg, ray.phaseDeg, phaseErrDeg, "phase");
    expect(ew.p).toBeLessThan(1e-6);
  });

  it("is insensitive to a sidereal-time modulation of the event rate that fakes a Rayleigh signal", () => {
    // Uptime varying as 0.8 + 0.2 cos(t) in local sidereal time, isotropic flux.
    const sky = simulateLocalSky({ n: 60_000, seed: 5, latDeg: -35.2, zenithMaxDeg: 60, rateModulation: (t) => 0.8 + 0.2 * Math.cos(t) });
    const ray = rayleighAnalysis(sky.raRad);
    const ew = eastWestAnalysis(sky.azimuthDeg, sky.lstRad);
    expect(ray.p).toBeLessThan(1e-10); // the rate drift shows as a spurious RA harmonic
    expect(ew.p).toBeGreaterThan(1e-3); // the differential method does not see it
  });
});
