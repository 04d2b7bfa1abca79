import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import * as Astronomy from "astronomy-engine";
import * as hp from "@hscmap/healpix";
import { describe, expect, it } from "vitest";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

const ROOT = join(__dirname, "..", "..", "..");
const SITE = { lat: -35.2, lon: -69.5 };

function cli(args: string[]) {
  const r = spawnSync("npx", ["tsx", "lib/cli/main.ts", ...args], { cwd: ROOT, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Fixture: n events, ISO times over 2024, zenith density sin cos below 60 deg, plus a cluster. */
function fixture(dir: string, n: number, seed: number) {
  const rnd = createRandom(seed);
  const rows = ["id,time,zenith,azimuth,energy"];
  for (let i = 0; i < n; i++) {
    const t = Date.UTC(2024, 0, 1) + rnd.next() * 366 * 86_400_000;
    const zen = (Math.acos(Math.sqrt(0.25 + 0.75 * rnd.next())) * 180) / Math.PI;
    rows.push(`e${i},${new Date(t).toISOString()},${zen.toFixed(4)},${(360 * rnd.next()).toFixed(4)},${(3 + 10 * rnd.next()).toFixed(3)}`);
  }
  const path = join(dir, "events.csv");
  writeFileSync(path, rows.join("\n") + "\n");
  return { path, rows };
}

/** ICRS unit vector of a row by astronomy-engine (STACK.md recipe), the outside reference. */
function referenceVector(row: string): [number, number, number] {
  const [, iso, zen, az] = row.split(",");
  const time = Astronomy.MakeTime(new Date(iso));
  const obs = new Astronomy.Observer(SITE.lat, SITE.lon, 0);
  const v = Astronomy.RotateVector(Astronomy.Rotation_HOR_EQJ(time, obs), Astronomy.VectorFromHorizon(new Astronomy.Spherical(90 - Number(zen), Number(az), 1), time, ""));
  const r = Math.hypot(v.x, v.y, v.z);
  return [v.x / r, v.y / r, v.z / r];
}

describe("siderea scan (command line)", () => {
  const dir = mkdtempSync(join(tmpdir(), "siderea-scan-"));
  const { path, rows } = fixture(dir, 400, 12);

  it("prints the JSON contract and a RING-order map whose max and counts match an independent computation", () => {
    const map = join(dir, "map.csv");
    const r = cli(["scan", "--events", path, "--lat", String(SITE.lat), "--lon", String(SITE.lon), "--zenith-max", "60", "--nside", "8", "--radius", "20", "--map", map]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.n).toBe(400);
    expect(out.exposure).toBe("sommers-precessed");
    for (const k of ["significance", "ra", "dec", "l", "b", "nOn", "nExpected"]) expect(typeof out.max[k]).toBe("number");
    expect(out.caution).toMatch(/preliminary/);
    const lines = readFileSync(map, "utf8").trim().split("\n");
    expect(lines[0]).toBe("pixel,ra,dec,n_on,n_expected,significance");
    expect(lines.length).toBe(1 + 12 * 64);
    // Pixel centres against @hscmap/healpix (RING order), 1e-5 deg (6 decimals printed).
    for (const p of [0, 5, 300, 767]) {
      const [pix, ra, dec] = lines[1 + p].split(",").map(Number);
      expect(pix).toBe(p);
      const v = hp.pix2vec_ring(8, p);
      expectClose(dec, (Math.asin(v[2]) * 180) / Math.PI, 2e-6, "dec");
      expectClose(ra, ((Math.atan2(v[1], v[0]) * 180) / Math.PI + 360) % 360, 2e-6, "ra");
    }
    // The JSON max is the map row of largest significance; its N_on equals a brute-force count
    // of the events converted by astronomy-engine (30 arcsec agreement leaves no event on the edge here).
    const sig = lines.slice(1).map((l) => Number(l.split(",")[5]));
    const best = sig.indexOf(Math.max(...sig));
    expect(best).toBe(out.max.pixel);
    const c = hp.pix2vec_ring(8, best), cosPsi = Math.cos((20 * Math.PI) / 180);
    let k = 0;
    for (const row of rows.slice(1)) { const v = referenceVector(row); if (v[0] * c[0] + v[1] * c[1] + v[2] * c[2] >= cosPsi) k++; }
    expect(out.max.nOn).toBe(k);
    expect(Number(lines[1 + best].split(",")[3])).toBe(k);
  }, 60_000);

  it("accepts the sommers and scrambled expectations (positive expected counts at the maximum)", () => {
    for (const model of ["sommers", "scrambled"]) {
      const r = cli(["scan", "--events", path, "--lat", String(SITE.lat), "--lon", String(SITE.lon), "--zenith-max", "60", "--nside", "4", "--radius", "30", "--exposure", model, "--n-scramble", "3"]);
      expect(r.code, r.stderr).toBe(0);
      const out = JSON.parse(r.stdout);
      expect(out.exposure).toBe(model);
      expect(out.max.nExpected).toBeGreaterThan(0);
    }
  }, 60_000);

  it("fails with one line on stderr and exit code 2 for a bad option, 1 for a missing file", () => {
    const bad = cli(["scan", "--events", path, "--lat", "-35.2", "--lon", "-69.5", "--zenith-max", "60", "--nside", "3", "--radius", "20"]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/^siderea: --nside must be a power of 2/);
    expect(bad.stderr.trim().split("\n").length).toBe(1);
    const model = cli(["scan", "--events", path, "--lat", "-35.2", "--lon", "-69.5", "--zenith-max", "60", "--nside", "4", "--radius", "20", "--exposure", "flat"]);
    expect(model.code).toBe(2);
    expect(model.stderr).toMatch(/^siderea: --exposure must be one of/);
    const missing = cli(["scan", "--events", join(dir, "nope.csv"), "--lat", "-35.2", "--lon", "-69.5", "--zenith-max", "60", "--nside", "4", "--radius", "20"]);
    expect(missing.code).toBe(1);
    expect(missing.stderr).toMatch(/^siderea: cannot read events file/);
  }, 60_000);
});
