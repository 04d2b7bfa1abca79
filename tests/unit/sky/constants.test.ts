import { describe, expect, it } from "vitest";
import {
  ARCSEC_PER_RAD, DEG_PER_RAD, JD_J2000, JD_UNIX_EPOCH, MS_PER_DAY, RAD_PER_DEG, TWO_PI, UNIX_MS_AT_JD_J2000,
  acosClamped, asinClamped, wrapDeg, wrapRad,
} from "@/lib/sky/constants";
import { expectClose } from "../helpers";

describe("constants", () => {
  it("converts 180 deg to pi rad and back (definition of the degree)", () => {
    expectClose(180 * RAD_PER_DEG, Math.PI, 1e-15);
    expectClose(Math.PI * DEG_PER_RAD, 180, 1e-12);
    expectClose(ARCSEC_PER_RAD, 206264.80624709636, 1e-8, "arcsec per rad (IAU handbook value)");
  });

  it("places J2000 (JD 2451545.0) 10957.5 days after the Unix epoch (JD 2440587.5)", () => {
    expect(JD_J2000 - JD_UNIX_EPOCH).toBe(10957.5);
    expect(UNIX_MS_AT_JD_J2000).toBe(Date.UTC(2000, 0, 1, 12));
    expect(MS_PER_DAY).toBe(86400 * 1000);
  });

  it("clamps asin/acos at |x| slightly above 1 instead of returning NaN (radians)", () => {
    expect(asinClamped(1 + 1e-15)).toBe(Math.PI / 2);
    expect(asinClamped(-1 - 1e-15)).toBe(-Math.PI / 2);
    expect(acosClamped(1 + 1e-15)).toBe(0);
    expect(acosClamped(-1 - 1e-15)).toBe(Math.PI);
    expectClose(asinClamped(0.5), Math.PI / 6, 1e-15);
  });

  it("wraps angles into [0, 360) deg and [0, 2 pi) rad, including the wrap at 0/360", () => {
    expect(wrapDeg(360)).toBe(0);
    expect(wrapDeg(-1e-20)).toBe(0);
    expectClose(wrapDeg(-90), 270, 1e-12);
    expectClose(wrapDeg(725), 5, 1e-12);
    expect(wrapRad(TWO_PI)).toBe(0);
    expectClose(wrapRad(-Math.PI / 2), 1.5 * Math.PI, 1e-15);
  });
});
