import { describe, expect, it } from "vitest";
import { AngleBetween, MakeTime, Vector } from "astronomy-engine";
import { angularDistanceDeg } from "@/lib/alerts/angles";
import { expectClose } from "../helpers";

const time = MakeTime(new Date(Date.UTC(2025, 0, 1)));
const vec = (raDeg: number, decDeg: number) => {
  const r = Math.PI / 180;
  return new Vector(Math.cos(decDeg * r) * Math.cos(raDeg * r), Math.cos(decDeg * r) * Math.sin(raDeg * r), Math.sin(decDeg * r), time);
};

describe("angular distance (haversine, Sinnott 1984)", () => {
  it("agrees with astronomy-engine's AngleBetween to 1e-9 degrees over 2000 seeded random pairs", () => {
    // Reference: astronomy-engine AngleBetween (the angle between two vectors, degrees).
    let s = 12345;
    const rnd = () => ((s = (s * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    let checked = 0;
    for (let i = 0; i < 2000; i++) {
      const ra1 = 360 * rnd(), dec1 = (Math.asin(2 * rnd() - 1) * 180) / Math.PI;
      const ra2 = 360 * rnd(), dec2 = (Math.asin(2 * rnd() - 1) * 180) / Math.PI;
      const reference = AngleBetween(vec(ra1, dec1), vec(ra2, dec2));
      // AngleBetween goes through acos of a dot product: a few 1e-7 deg near 0 and 180 deg.
      expectClose(angularDistanceDeg(ra1, dec1, ra2, dec2), reference, 1e-6, `pair ${i}`);
      checked++;
    }
    expect(checked).toBe(2000);
  });

  it("keeps small separations accurate where the cosine formula loses digits: 1 arcsec along a meridian is 1/3600 degree", () => {
    // Exact by construction: along a meridian the distance is the difference of declinations.
    expectClose(angularDistanceDeg(10, 20, 10, 20 + 1 / 3600), 1 / 3600, 1e-12, "1 arcsec");
    expectClose(angularDistanceDeg(123, -45, 123, -45 - 1e-5), 1e-5, 1e-12, "1e-5 deg");
  });

  it("wraps right ascension at 0/360 degrees, is symmetric, and gives 180 degrees between antipodes and 90 from the pole to the equator", () => {
    expectClose(angularDistanceDeg(359.5, 0, 0.5, 0), 1, 1e-12, "RA wrap on the equator");
    expectClose(angularDistanceDeg(0, 90, 217, 0), 90, 1e-12, "pole to equator");
    expectClose(angularDistanceDeg(40, 30, 220, -30), 180, 1e-9, "antipodes");
    expect(angularDistanceDeg(10, 20, 30, 40)).toBe(angularDistanceDeg(30, 40, 10, 20));
    // At dec = 60 deg, one degree of RA is cos(60 deg) degrees of arc to first order (spherical geometry).
    expectClose(angularDistanceDeg(0, 60, 1, 60), 0.5, 1e-4, "RA step at dec 60");
  });
});
