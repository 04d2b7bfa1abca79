import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFile } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import * as Astronomy from "astronomy-engine";
import { createRandom } from "@/lib/sky/random";
import { gpsSecondsFromUnixMs } from "@/lib/sky/time";
import { formatFixed6, formatLongitude6, writeFixed6 } from "@/lib/cli/commands/convert";
import { expectClose } from "../helpers";

const ROOT = join(__dirname, "..", "..", "..");
const TSX = join(ROOT, "node_modules", ".bin", "tsx");

function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(TSX, ["lib/cli/main.ts", ...args], { cwd: ROOT, maxBuffer: 1 << 26 }, (err, stdout, stderr) => {
      resolve({ code: err ? (typeof err.code === "number" ? err.code : 1) : 0, stdout, stderr });
    });
  });
}

const SITE = { lat: -35.2, lon: -69.5, h: 1400 };
let dir = "";
const events: { id: string; unixMs: number; zen: number; az: number; e: number }[] = [];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "siderea-cli-"));
  const r = createRandom(17);
  for (let i = 0; i < 40; i++) {
    events.push({ id: i === 3 ? "ev,\"3\"" : `ev${i}`, unixMs: Math.round(Date.UTC(1998, 0, 1) + r.next() * 35 * 365.25 * 86400e3), zen: 79 * r.next(), az: 360 * r.next(), e: 1 + 50 * r.next() });
  }
  const q = (s: string) => (/[",]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  writeFileSync(join(dir, "events.csv"), "id,time,zenith,azimuth,energy\n" + events.map((e) => `${q(e.id)},${new Date(e.unixMs).toISOString()},${e.zen},${e.az},${e.e}`).join("\r\n") + "\r\n");
  writeFileSync(join(dir, "events-gps-ecc.csv"), "time,zenith,azimuth,energy\n" + events.map((e) => `${gpsSecondsFromUnixMs(e.unixMs)},${e.zen},${(90 - e.az + 360) % 360},${Math.log10(e.e * 1e18)}`).join("\n"));
  writeFileSync(join(dir, "utf8.csv"), "\uFEFFid,time,zenith,azimuth\nCórdoba-é,2020-01-01T00:00:00Z,10,10\n\"été, \"\"1\"\"\",2020-01-01T00:00:00Z,20,10\n", "utf8");
  // unquoted ASCII ids only: the parser keeps them as bytes and the cuts compact those bytes
  writeFileSync(join(dir, "events-plain.csv"), "id,time,zenith,azimuth,energy\n" + events.map((e, i) => `${i === 3 ? " ev3 " : e.id},${new Date(e.unixMs).toISOString()},${e.zen},${e.az},${e.e}`).join("\n") + "\n");
  writeFileSync(join(dir, "no-zenith.csv"), "id,time,azimuth\nx,2020-01-01T00:00:00Z,10\n");
  writeFileSync(join(dir, "bad-row.csv"), "id,time,zenith,azimuth,energy\na,2020-01-01T00:00:00Z,10,10,1\nb,2020-01-01T00:00:00Z,91,10,1\nc,2020-01-01T00:00:00Z,10,10,1\n");
});
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

function parseCsv(text: string): { header: string; rows: string[][] } {
  const lines = text.trimEnd().split("\n");
  const rows = lines.slice(1).map((l) => {
    const m = l.match(/^("(?:[^"]|"")*"|[^,]*),(.*)$/);
    if (!m) throw new Error(`bad line ${l}`);
    const id = m[1].startsWith('"') ? m[1].slice(1, -1).replace(/""/g, '"') : m[1];
    return [id, ...m[2].split(",")];
  });
  return { header: lines[0], rows };
}

// each test spawns the CLI (tsx start-up ~1-2 s, several at once): a generous timeout for a loaded machine
describe.concurrent("siderea convert", { timeout: 30_000 }, () => {
  it("writes id,ra,dec,l,b in degrees within 30 arcsec of astronomy-engine (ICRS) and 40 arcsec (galactic)", async ({ expect }) => {
    const res = await cli(["convert", "--events", join(dir, "events.csv"), "--lat", String(SITE.lat), "--lon", String(SITE.lon), "--height", String(SITE.h)]);
    expect(res.stderr).toBe("");
    expect(res.code).toBe(0);
    const { header, rows } = parseCsv(res.stdout);
    expect(header).toBe("id,ra,dec,l,b");
    expect(rows.length).toBe(events.length);
    const observer = new Astronomy.Observer(SITE.lat, SITE.lon, SITE.h);
    const gal = Astronomy.Rotation_EQJ_GAL();
    for (let i = 0; i < rows.length; i++) {
      const ev = events[i];
      expect(rows[i][0]).toBe(ev.id);
      for (const v of rows[i].slice(1)) expect(v).toMatch(/^-?\d+\.\d{6}$/);
      const [ra, dec, l, b] = rows[i].slice(1).map(Number);
      const time = Astronomy.MakeTime(new Date(ev.unixMs));
      const v = Astronomy.RotateVector(Astronomy.Rotation_HOR_EQJ(time, observer), Astronomy.VectorFromHorizon(new Astronomy.Spherical(90 - ev.zen, ev.az, 1), time, ""));
      const eq = Astronomy.EquatorFromVector(v);
      const g = Astronomy.SphereFromVector(Astronomy.RotateVector(gal, v));
      const sep = (a1: number, d1: number, a2: number, d2: number) => {
        const r = Math.PI / 180;
        return Math.acos(Math.min(1, Math.sin(d1 * r) * Math.sin(d2 * r) + Math.cos(d1 * r) * Math.cos(d2 * r) * Math.cos((a1 - a2) * r))) / r * 3600;
      };
      expect(sep(ra, dec, eq.ra * 15, eq.dec)).toBeLessThan(30);
      expect(sep(l, b, g.lon, g.lat)).toBeLessThan(40);
      expect(ra >= 0 && ra < 360 && l >= 0 && l < 360).toBe(true);
    }
  });

  it("gives the same directions from GPS seconds, east-counterclockwise azimuths and log10(E/eV) energies", async ({ expect }) => {
    const [a, b] = await Promise.all([
      cli(["convert", "--events", join(dir, "events.csv"), "--lat", "-35.2", "--lon", "-69.5"]),
      cli(["convert", "--events", join(dir, "events-gps-ecc.csv"), "--lat", "-35.2", "--lon", "-69.5", "--time-format", "gps", "--azimuth-convention", "east-counterclockwise", "--energy-unit", "log10eV"]),
    ]);
    expect(b.code).toBe(0);
    const ra = parseCsv(a.stdout).rows, rb = parseCsv(b.stdout).rows;
    expect(rb.length).toBe(ra.length);
    expect(rb[0][0]).toBe("1"); // generated ids: data row numbers
    for (let i = 0; i < ra.length; i++) for (let k = 1; k < 5; k++) {
      const d = Math.abs(Number(ra[i][k]) - Number(rb[i][k]));
      expectClose(Math.min(d, 360 - d), 0, 2e-6, `row ${i} col ${k}`);
    }
  });

  it("keeps UTF-8 ids (BOM, accents, quoted commas) intact from input to output", async ({ expect }) => {
    const res = await cli(["convert", "--events", join(dir, "utf8.csv"), "--lat", "-35.2", "--lon", "-69.5"]);
    expect(res.code).toBe(0);
    expect(parseCsv(res.stdout).rows.map((r) => r[0])).toEqual(["Córdoba-é", 'été, "1"']);
    expect(res.stdout.split("\n")[2].startsWith('"été, ""1""",')).toBe(true);
  });

  it("formats 6 decimals like toFixed(6) (to 1 in the last digit on ties), without -0 and 360.000000", ({ expect }) => {
    const r = createRandom(5);
    for (let i = 0; i < 20000; i++) {
      const v = (r.next() - 0.5) * 720;
      const a = formatFixed6(v), b = v.toFixed(6);
      if (a !== b) expectClose(Number(a), Number(b), 1.0000001e-6, `${v}`);
    }
    expect(formatFixed6(-0.0000004)).toBe("0.000000");
    expect(formatFixed6(-12.5)).toBe("-12.500000");
    expect(formatFixed6(NaN)).toBe("nan");
    expect(formatLongitude6(359.9999996)).toBe("0.000000");
    expect(formatLongitude6(359.999999)).toBe("359.999999");
  });

  it("writes in bytes exactly the text of formatFixed6 / formatLongitude6 (themselves checked against toFixed(6) above)", ({ expect }) => {
    const r = createRandom(11);
    const buf = new Uint8Array(32);
    const dec = new TextDecoder();
    const values = [0, -0, 1e-7, -4e-7, 5e-7, -5e-7, 0.5, 89.9999995, -90, 90, 359.9999995, 359.9999994, 360, 1234.5678905, -1999.9999994, 1999.9999996, NaN];
    for (let i = 0; i < 20000; i++) values.push((r.next() - 0.5) * 720, Math.round((r.next() - 0.5) * 2e9) / 2e6, (r.next() - 0.5) * 3999.99);
    for (const v of values) for (const lon of [false, true]) {
      const n = writeFixed6(buf, 3, v, lon);
      expect(dec.decode(buf.subarray(3, n)), `${v}`).toBe(lon ? formatLongitude6(v) : formatFixed6(v));
    }
    expect(() => writeFixed6(buf, 0, 2000, false)).toThrow(RangeError);
  });

  it("applies the cuts to ids read as bytes (unquoted ASCII file) exactly as to ids read as text", async ({ expect }) => {
    const res = await cli(["convert", "--events", join(dir, "events-plain.csv"), "--lat", "-35.2", "--lon", "-69.5", "--zenith-max", "40", "--energy-min", "20"]);
    expect(res.code).toBe(0);
    const ids = parseCsv(res.stdout).rows.map((r) => r[0]);
    expect(ids).toEqual(events.map((e, i) => ({ ...e, id: i === 3 ? "ev3" : e.id })).filter((e) => e.zen <= 40 && e.e >= 20).map((e) => e.id));
    expect(ids.length).toBeGreaterThan(0);
    const all = await cli(["convert", "--events", join(dir, "events-plain.csv"), "--lat", "-35.2", "--lon", "-69.5"]);
    expect(parseCsv(all.stdout).rows.map((r) => r[0])).toEqual(events.map((e, i) => (i === 3 ? "ev3" : e.id)));
  });

  it("applies --zenith-max and --energy-min cuts", async ({ expect }) => {
    const res = await cli(["convert", "--events", join(dir, "events.csv"), "--lat", "-35.2", "--lon", "-69.5", "--zenith-max", "40", "--energy-min", "20"]);
    expect(res.code).toBe(0);
    const ids = parseCsv(res.stdout).rows.map((r) => r[0]);
    expect(ids).toEqual(events.filter((e) => e.zen <= 40 && e.e >= 20).map((e) => e.id));
    expect(ids.length).toBeGreaterThan(0);
  });

  it("fails with one 'siderea:' line and exit 1 for a missing file, a missing column, or a bad row (naming its line)", async ({ expect }) => {
    const [missing, column, row, drop] = await Promise.all([
      cli(["convert", "--events", join(dir, "nope.csv"), "--lat", "0", "--lon", "0"]),
      cli(["convert", "--events", join(dir, "no-zenith.csv"), "--lat", "0", "--lon", "0"]),
      cli(["convert", "--events", join(dir, "bad-row.csv"), "--lat", "0", "--lon", "0"]),
      cli(["convert", "--events", join(dir, "bad-row.csv"), "--lat", "0", "--lon", "0", "--drop-bad-rows"]),
    ]);
    for (const r of [missing, column, row]) {
      expect(r.code).toBe(1);
      expect(r.stdout).toBe("");
      expect(r.stderr.trimEnd().split("\n").length).toBe(1);
      expect(r.stderr.startsWith("siderea: ")).toBe(true);
    }
    expect(missing.stderr).toMatch(/no such file/);
    expect(column.stderr).toMatch(/line 1: missing required column "zenith"/);
    expect(row.stderr).toMatch(/line 3: zenith outside \[0, 90\)/);
    expect(drop.code).toBe(0);
    expect(parseCsv(drop.stdout).rows.map((r) => r[0])).toEqual(["a", "c"]);
  });

  it("fails with exit 2 on a bad or unknown option, a missing --lat, or an unknown command", async ({ expect }) => {
    const [badLat, unknown, missingLat, badConv, command] = await Promise.all([
      cli(["convert", "--events", join(dir, "events.csv"), "--lat", "-95", "--lon", "0"]),
      cli(["convert", "--events", join(dir, "events.csv"), "--lat", "0", "--lon", "0", "--colour", "red"]),
      cli(["convert", "--events", join(dir, "events.csv"), "--lon", "0"]),
      cli(["convert", "--events", join(dir, "events.csv"), "--lat", "0", "--lon", "0", "--azimuth-convention", "south"]),
      cli(["transmogrify"]),
    ]);
    for (const r of [badLat, unknown, missingLat, badConv, command]) {
      expect(r.code).toBe(2);
      expect(r.stderr.trimEnd().split("\n").length).toBe(1);
      expect(r.stderr.startsWith("siderea: ")).toBe(true);
    }
    expect(badLat.stderr).toMatch(/--lat must be >= -90/);
    expect(unknown.stderr).toMatch(/--colour/);
    expect(missingLat.stderr).toMatch(/--lat/);
    expect(command.stderr).toMatch(/unknown command "transmogrify".*usage: siderea/);
  });
});
