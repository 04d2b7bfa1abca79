import { describe, expect, it } from "vitest";
import { execFile } from "node:child_process";
import { join } from "node:path";
import { expectClose } from "../helpers";

const ROOT = join(__dirname, "..", "..", "..");
const TSX = join(ROOT, "node_modules", ".bin", "tsx");

function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(TSX, ["lib/cli/main.ts", ...args], { cwd: ROOT }, (err, stdout, stderr) => {
      resolve({ code: err ? (typeof err.code === "number" ? err.code : 1) : 0, stdout, stderr });
    });
  });
}

/** Sommers 2001 eq. 3, written out independently of lib/sky for the check. */
function sommers(decDeg: number, latDeg: number, zmDeg: number): number {
  const r = Math.PI / 180, d = decDeg * r, l = latDeg * r;
  const xi = (Math.cos(zmDeg * r) - Math.sin(l) * Math.sin(d)) / (Math.cos(l) * Math.cos(d));
  const am = xi > 1 ? 0 : xi < -1 ? Math.PI : Math.acos(xi);
  return Math.max(0, Math.cos(l) * Math.cos(d) * Math.sin(am) + am * Math.sin(l) * Math.sin(d));
}

describe.concurrent("siderea exposure", () => {
  it("prints {declination, exposure} from -90 to 90 deg inclusive, relative to a maximum of 1 (Sommers 2001)", async ({ expect }) => {
    const [one, half] = await Promise.all([
      cli(["exposure", "--lat", "-35.2", "--zenith-max", "60"]),
      cli(["exposure", "--lat", "39.3", "--zenith-max", "55", "--dec-step", "0.5"]),
    ]);
    expect(one.code).toBe(0);
    const j = JSON.parse(one.stdout);
    expect(Object.keys(j)).toEqual(["declination", "exposure"]);
    expect(j.declination.length).toBe(181);
    expect(j.declination[0]).toBe(-90); expect(j.declination[180]).toBe(90);
    // normalise the independent formula by its maximum on a fine grid
    let max = 0; for (let d = -90; d <= 90; d += 0.001) max = Math.max(max, sommers(d, -35.2, 60));
    for (let k = 0; k < 181; k++) expectClose(j.exposure[k], sommers(j.declination[k], -35.2, 60) / max, 1e-6, `dec ${j.declination[k]}`);
    // covered band: dec < lat + zenith_max = 24.8 deg (METHODS section 8)
    expect(j.exposure[90 + 24]).toBeGreaterThan(0);
    expect(j.exposure[90 + 25]).toBe(0);
    const h = JSON.parse(half.stdout);
    expect(h.declination.length).toBe(361);
    expect(Math.max(...h.exposure)).toBeLessThanOrEqual(1);
    expect(h.exposure[0]).toBe(0); // dec -90 not seen from lat 39.3 with zenith < 55 (|-90 - 39.3| > 55)
  });

  it("rejects a missing --zenith-max, a bad --dec-step and a latitude outside [-90, 90] with exit 2", async ({ expect }) => {
    const res = await Promise.all([
      cli(["exposure", "--lat", "-35.2"]),
      cli(["exposure", "--lat", "-35.2", "--zenith-max", "60", "--dec-step", "0"]),
      cli(["exposure", "--lat", "-135", "--zenith-max", "60"]),
      cli(["exposure", "--lat", "-35.2", "--zenith-max", "95"]),
    ]);
    for (const r of res) { expect(r.code).toBe(2); expect(r.stderr).toMatch(/^siderea: .+\n$/); }
    expect(res[0].stderr).toMatch(/--zenith-max/);
    expect(res[1].stderr).toMatch(/--dec-step must be > 0/);
  });
});
