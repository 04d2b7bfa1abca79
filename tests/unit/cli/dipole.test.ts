import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import * as Astronomy from "astronomy-engine";
import { describe, expect, it } from "vitest";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const ROOT = join(__dirname, "..", "..", "..");
const SITE = { lat: -35.2, lon: -69.5 };

function cli(args: string[]) {
  const r = spawnSync("npx", ["tsx", "lib/cli/main.ts", ...args], { cwd: ROOT, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("siderea dipole (command line)", () => {
  const dir = mkdtempSync(join(tmpdir(), "siderea-dipole-"));
  const rnd = createRandom(3);
  const rows = ["id,time,zenith,azimuth,energy"];
  for (let i = 0; i < 500; i++) {
    const t = Date.UTC(2023, 5, 1) + rnd.next() * 365 * 86_400_000;
    const zen = (Math.acos(Math.sqrt(0.25 + 0.75 * rnd.next())) * 180) / Math.PI;
    rows.push(`e${i},${new Date(t).toISOString()},${zen.toFixed(4)},${(360 * rnd.next()).toFixed(4)},`);
  }
  const path = join(dir, "events.csv");
  writeFileSync(path, rows.join("\n") + "\n");

  it("prints Rayleigh a, b, amplitude, phase, p matching a recomputation from astronomy-engine right ascensions (Linsley 1975)", () => {
    const r = cli(["dipole", "--events", path, "--lat", String(SITE.lat), "--lon", String(SITE.lon)]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.n).toBe(500);
    let sc = 0, ss = 0;
    const obs = new Astronomy.Observer(SITE.lat, SITE.lon, 0);
    for (const row of rows.slice(1)) {
      const [, iso, zen, az] = row.split(",");
      const time = Astronomy.MakeTime(new Date(iso));
      const v = Astronomy.RotateVector(Astronomy.Rotation_HOR_EQJ(time, obs), Astronomy.VectorFromHorizon(new Astronomy.Spherical(90 - Number(zen), Number(az), 1), time, ""));
      const ra = Math.atan2(v.y, v.x);
      sc += Math.cos(ra); ss += Math.sin(ra);
    }
    const a = (2 / 500) * sc, b = (2 / 500) * ss, amp = Math.hypot(a, b);
    // 30 arcsec agreement of the conversion moves each cos/sin by < 1.5e-4.
    expectClose(out.rayleigh.a, a, 2e-4, "a");
    expectClose(out.rayleigh.b, b, 2e-4, "b");
    expectClose(out.rayleigh.amplitude, amp, 2e-4, "amplitude");
    expectClose(out.rayleigh.p, Math.exp((-500 * amp * amp) / 4), 1e-3, "p = exp(-N r^2/4)");
    expect(out.rayleigh.phase).toBeGreaterThanOrEqual(0);
    expect(out.rayleigh.phase).toBeLessThan(360);
    expect(out.rayleigh.weighted).toBe(false);
    for (const k of ["amplitude", "ra", "dec"]) expect(typeof out.dipole[k]).toBe("number");
    expect(typeof out.eastWest.amplitude).toBe("number");
  }, 60_000);

  it("weights by sidereal-time coverage with --weighted and rejects an unknown option with exit code 2", () => {
    const w = cli(["dipole", "--events", path, "--lat", String(SITE.lat), "--lon", String(SITE.lon), "--weighted"]);
    expect(w.code, w.stderr).toBe(0);
    const out = JSON.parse(w.stdout);
    expect(out.rayleigh.weighted).toBe(true);
    expect(out.rayleigh.nEffective).toBeLessThanOrEqual(500);
    const bad = cli(["dipole", "--events", path, "--lat", "-35.2", "--lon", "-69.5", "--bogus"]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/^siderea: /);
  }, 60_000);
});
