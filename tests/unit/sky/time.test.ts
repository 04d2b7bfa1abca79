import { describe, expect, it } from "vitest";
import {
  LEAP_SECOND_TABLE, earthRotationAngleRad, earthRotationAngleRadFromUnixMs, formatIsoUtc, gpsMinusUtcS,
  gpsSecondsFromUnixMs, greenwichMeanSiderealTimeRad, jdTtFromUnixMs, jdUtcFromUnixMs, parseIsoUtc,
  parseTimeToUnixMs, taiMinusUtcS, ttMinusUtcS, unixMsFromGpsSeconds,
} from "@/lib/sky/time";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

describe("Earth rotation", () => {
  it("matches the IAU SOFA era00 test value: JD_UT1 2454388.5 -> 0.4022837240028158 rad", () => {
    expectClose(earthRotationAngleRad(2454388.5), 0.4022837240028158, 1e-12, "ERA (SOFA t_sofa_c, era00)");
  });

  it("gives the same ERA in rad from Unix ms as from the Julian Date", () => {
    const unixMs = (2454388.5 - 2440587.5) * 86400000;
    expectClose(earthRotationAngleRadFromUnixMs(unixMs), 0.4022837240028158, 1e-11);
    const r = createRandom(5);
    for (let i = 0; i < 1000; i++) {
      const t = Date.UTC(1990, 0, 1) + r.next() * 50 * 365.25 * 86400e3;
      const a = earthRotationAngleRadFromUnixMs(t), b = earthRotationAngleRad(jdUtcFromUnixMs(t));
      const d = Math.abs(a - b);
      expectClose(Math.min(d, 2 * Math.PI - d), 0, 2e-9, "ERA from ms vs JD");
    }
  });

  it("advances ERA by 2 pi x 1.00273781191135448 rad per UT1 day (Capitaine et al. 2000)", () => {
    const a = earthRotationAngleRad(2460000.5), b = earthRotationAngleRad(2460000.5 + 0.25);
    let d = b - a; if (d < 0) d += 2 * Math.PI;
    expectClose(d, (2 * Math.PI * 1.00273781191135448 * 0.25) % (2 * Math.PI), 1e-9);
  });

  it("matches the IAU SOFA gmst06 test value: UT1 = TT = MJD 53736.0 -> 1.754174971870091 rad (Capitaine et al. 2003 eq. 42)", () => {
    const jd = 2400000.5 + 53736.0;
    expectClose(greenwichMeanSiderealTimeRad(jd, jd), 1.754174971870091, 1e-12, "GMST (SOFA gmst06)");
  });
});

describe("time scales", () => {
  it("has TAI - UTC = 37 s and GPS - UTC = 18 s since 2017-01-01, 36 s / 17 s just before (IERS Bulletin C)", () => {
    const t2017 = Date.UTC(2017, 0, 1);
    expect(taiMinusUtcS(t2017)).toBe(37);
    expect(gpsMinusUtcS(t2017)).toBe(18);
    expect(taiMinusUtcS(t2017 - 1)).toBe(36);
    expect(gpsMinusUtcS(t2017 - 1)).toBe(17);
    expect(gpsMinusUtcS(Date.UTC(1980, 0, 6))).toBe(0);
    expect(LEAP_SECOND_TABLE.length).toBe(28);
    expect(LEAP_SECOND_TABLE[LEAP_SECOND_TABLE.length - 1].taiMinusUtcS).toBe(37);
    expectClose(ttMinusUtcS(t2017), 69.184, 1e-12, "TT - UTC = TAI - UTC + 32.184 s");
  });

  it("puts GPS second 0 at 1980-01-06T00:00:00 UTC", () => {
    expect(unixMsFromGpsSeconds(0)).toBe(Date.UTC(1980, 0, 6));
    expect(gpsSecondsFromUnixMs(Date.UTC(1980, 0, 6))).toBe(0);
  });

  it("agrees across the leap second 2016-12-31T23:59:60 in ISO, Unix and GPS seconds", () => {
    // GPS week 1930 began at 2017-01-01T00:00:00 GPS = 1930 * 604800 s; UTC midnight was 18 s later in GPS.
    const midnight = Date.UTC(2017, 0, 1);
    expect(gpsSecondsFromUnixMs(midnight)).toBe(1930 * 604800 + 18);
    expect(unixMsFromGpsSeconds(1930 * 604800 + 18)).toBe(midnight);
    // 23:59:59 UTC is 2 GPS seconds earlier (the inserted second lies between)
    expect(parseIsoUtc("2016-12-31T23:59:59Z")).toBe(midnight - 1000);
    expect(unixMsFromGpsSeconds(1930 * 604800 + 16)).toBe(midnight - 1000);
    expect(parseTimeToUnixMs(String(1930 * 604800 + 16), "gps")).toBe(midnight - 1000);
    expect(parseTimeToUnixMs(String((midnight - 1000) / 1000), "unix")).toBe(midnight - 1000);
    // the leap second itself: documented choice, maps to the next midnight
    expect(unixMsFromGpsSeconds(1930 * 604800 + 17)).toBe(midnight);
    expect(unixMsFromGpsSeconds(1930 * 604800 + 17.5)).toBe(midnight);
    expect(parseIsoUtc("2016-12-31T23:59:60Z")).toBe(midnight);
    expect(parseIsoUtc("2016-12-31T23:59:60.500Z")).toBe(midnight);
    // one GPS second later than midnight
    expect(unixMsFromGpsSeconds(1930 * 604800 + 19.25)).toBe(midnight + 1250);
  });

  it("rejects a :60 second on a day without a leap second, and impossible dates", () => {
    expect(parseIsoUtc("2015-06-30T23:59:60Z")).toBe(Date.UTC(2015, 6, 1));
    expect(parseIsoUtc("2015-12-31T23:59:60Z")).toBeNaN();
    expect(parseIsoUtc("2016-12-31T23:58:60Z")).toBeNaN();
    expect(parseIsoUtc("2025-02-29T00:00:00Z")).toBeNaN();
    expect(parseIsoUtc("2024-02-29T00:00:00Z")).toBe(Date.UTC(2024, 1, 29));
    expect(parseIsoUtc("2025-13-01T00:00:00Z")).toBeNaN();
    expect(parseIsoUtc("2025-03-01T24:00:00Z")).toBeNaN();
    expect(parseIsoUtc("yesterday")).toBeNaN();
    expect(parseIsoUtc("2025-03-01T12:34:56.Z")).toBeNaN();
    expect(parseIsoUtc("2025-03-01T12:34:56Zjunk")).toBeNaN();
    expect(parseTimeToUnixMs("", "unix")).toBeNaN();
    expect(parseTimeToUnixMs("abc", "gps")).toBeNaN();
  });

  it("parses ISO 8601 like the ECMAScript Date parser for 2000 random instants and zone offsets", () => {
    const r = createRandom(9);
    for (let i = 0; i < 2000; i++) {
      const t = Math.round(Date.UTC(1975, 0, 1) + r.next() * 60 * 365.25 * 86400e3);
      const iso = new Date(t).toISOString();
      expect(parseIsoUtc(iso)).toBe(t);
    }
    expect(parseIsoUtc("2025-03-01T14:34:56.789+02:00")).toBe(Date.parse("2025-03-01T12:34:56.789Z"));
    expect(parseIsoUtc("2025-03-01T10:04:56.789-0230")).toBe(Date.parse("2025-03-01T12:34:56.789Z"));
    expect(parseIsoUtc("2025-03-01 12:34:56")).toBe(Date.parse("2025-03-01T12:34:56Z"));
    expect(parseIsoUtc("  2025-03-01T12:34Z ")).toBe(Date.parse("2025-03-01T12:34:00Z"));
    expect(parseIsoUtc("2025-03-01")).toBe(Date.UTC(2025, 2, 1));
    expectClose(parseIsoUtc("2025-03-01T12:34:56.7891Z"), Date.parse("2025-03-01T12:34:56.789Z") + 0.1, 1e-6);
    expect(formatIsoUtc(parseIsoUtc("2025-03-01T12:34:56.789Z"))).toBe("2025-03-01T12:34:56.789Z");
  });

  it("gives JD_UTC 2440587.5 at the Unix epoch and JD_TT 2451545.0 at 2000-01-01T11:58:55.816 UTC (J2000.0)", () => {
    expect(jdUtcFromUnixMs(0)).toBe(2440587.5);
    // J2000.0 = 2000-01-01T12:00:00 TT = 11:58:55.816 UTC (TT - UTC = 32 + 32.184 s); astronomical almanac value
    expectClose(jdTtFromUnixMs(Date.UTC(2000, 0, 1, 11, 58, 55, 816)), 2451545.0, 1e-8, "JD_TT at J2000");
  });
});
