import { describe, expect, it } from "vitest";
import { decideAlerts, meetsThresholds, previousWindowNear, type RuleWindow } from "@/lib/alerts/rule";

const w = (raDeg: number, decDeg: number, localSignificance: number, extra: Partial<RuleWindow> = {}): RuleWindow => ({
  raDeg, decDeg, lDeg: 0, bDeg: 0, nOn: 10, nExpected: 5, localSignificance, postTrialSigma: 2, ...extra,
});
const OPTIONS = { localSigmaThreshold: 4, postTrialSigmaThreshold: null, dedupRadiusDeg: 10, updateStepSigma: 1 };

describe("the alert rule of watched analyses", () => {
  it("raises a new alert only when the local significance reaches the threshold (4 sigma by default)", () => {
    expect(decideAlerts([w(100, -30, 3.99)], [], OPTIONS)).toEqual([]);
    expect(decideAlerts([w(100, -30, 4)], [], OPTIONS)).toEqual([{ kind: "new", window: w(100, -30, 4) }]);
    expect(decideAlerts([w(100, -30, 6.5)], [], { ...OPTIONS, localSigmaThreshold: 7 })).toEqual([]);
  });

  it("applies the optional post-trial threshold, and a window whose post-trial figure is unknown fails it", () => {
    const opts = { ...OPTIONS, postTrialSigmaThreshold: 3 };
    expect(decideAlerts([w(100, -30, 5, { postTrialSigma: 2.9 })], [], opts)).toEqual([]);
    expect(decideAlerts([w(100, -30, 5, { postTrialSigma: 3.1 })], [], opts)).toHaveLength(1);
    expect(meetsThresholds({ localSignificance: 5, postTrialSigma: null }, 4, 3)).toBe(false);
    expect(meetsThresholds({ localSignificance: 5, postTrialSigma: null }, 4, null)).toBe(true);
  });

  it("deduplicates by true angular distance: 9.9 degrees from an alert is the same cluster, 10.1 degrees is a new one", () => {
    // At dec -60 deg, 20 deg of RA is only about 9.9 deg of arc: RA differences are not distances.
    const known = [{ id: 7, raDeg: 100, decDeg: -60, announcedLocalSigma: 5 }];
    // Separation of (100, -60) and (120, -60): 2 asin(cos 60 sin 10) = 9.9358 deg (haversine).
    expect(decideAlerts([w(120, -60, 5.5)], known, OPTIONS)).toEqual([]);
    // (100, -60) to (100, -70.1): 10.1 deg along the meridian.
    expect(decideAlerts([w(100, -70.1, 5.5)], known, OPTIONS)).toEqual([{ kind: "new", window: w(100, -70.1, 5.5) }]);
  });

  it("raises an update, not a new alert, when a known cluster rises by the step (1 sigma), and nothing when it rises less", () => {
    const known = [{ id: 7, raDeg: 200, decDeg: -40, announcedLocalSigma: 5 }];
    expect(decideAlerts([w(201, -40, 5.99)], known, OPTIONS)).toEqual([]);
    const [d] = decideAlerts([w(201, -40, 6)], known, OPTIONS);
    expect(d).toMatchObject({ kind: "update", alertId: 7, previousAnnouncedSigma: 5 });
    expect(d!.kind === "update" && d!.distanceDeg).toBeCloseTo(2 * Math.asin(Math.cos((40 * Math.PI) / 180) * Math.sin(Math.PI / 360)) * (180 / Math.PI), 9);
    // A smaller step of 0.5 sigma.
    expect(decideAlerts([w(201, -40, 5.6)], known, { ...OPTIONS, updateStepSigma: 0.5 })).toHaveLength(1);
  });

  it("announces two nearby windows of one run once, at the stronger; a flank window (not the peak of its neighbourhood) never", () => {
    const decisions = decideAlerts([w(10, 0, 5), w(14, 0, 7)], [], OPTIONS);
    expect(decisions).toEqual([{ kind: "new", window: w(14, 0, 7) }]);
    expect(decideAlerts([w(50, 0, 9, { peak: false })], [], OPTIONS)).toEqual([]);
    // Two windows far apart are two alerts, strongest first.
    expect(decideAlerts([w(10, 0, 5), w(100, 0, 8)], [], OPTIONS).map((d) => d.window.raDeg)).toEqual([100, 10]);
  });

  it("uses the nearest known alert within the distance and counts an update at the raised level for the next window", () => {
    const known = [{ id: 1, raDeg: 0, decDeg: 0, announcedLocalSigma: 4 }, { id: 2, raDeg: 6, decDeg: 0, announcedLocalSigma: 4 }];
    const d = decideAlerts([w(5, 0, 5.2), w(4, 0, 5.1)], known, OPTIONS);
    expect(d).toHaveLength(1);
    expect(d[0]).toMatchObject({ kind: "update", alertId: 2 });
  });

  it("refuses a negative distance or a non-positive step", () => {
    expect(() => decideAlerts([], [], { ...OPTIONS, dedupRadiusDeg: -1 })).toThrow(RangeError);
    expect(() => decideAlerts([], [], { ...OPTIONS, updateStepSigma: 0 })).toThrow(RangeError);
  });

  it("finds the strongest previous window near a position, or none", () => {
    const prev = [w(10, 0, 3), w(12, 0, 3.5), w(80, 0, 9)];
    expect(previousWindowNear(prev, 11, 0, 5)?.localSignificance).toBe(3.5);
    expect(previousWindowNear(prev, 40, 0, 5)).toBeNull();
  });
});
