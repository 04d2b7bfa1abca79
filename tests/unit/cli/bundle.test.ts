import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";

// `npm run --silent cli` runs scripts/cli.mjs, which runs an esbuild bundle of lib/cli/main.ts.
// The bundle must behave exactly like the TypeScript sources run by tsx.
function run(cmd: string, args: string[]) {
  return spawnSync(cmd, args, { encoding: "utf8", timeout: 60_000 });
}

describe("the bundled command line", () => {
  it("prints the same exposure curve as the sources run with tsx (lat -35.2 deg, zenith cut 60 deg)", () => {
    const args = ["exposure", "--lat", "-35.2", "--zenith-max", "60", "--dec-step", "5"];
    const bundled = run("node", ["scripts/cli.mjs", ...args]);
    const source = run("./node_modules/.bin/tsx", ["lib/cli/main.ts", ...args]);
    expect(bundled.status).toBe(0);
    expect(bundled.stdout).toBe(source.stdout);
    const curve = JSON.parse(bundled.stdout);
    // METHODS section 8 geometry: nothing is seen above dec = lat + zenith_max = +24.8 deg.
    const i = curve.declination.indexOf(30);
    expect(curve.exposure[i]).toBe(0);
  });

  it("exits 2 with one 'siderea:' line for an unknown command, like the sources", () => {
    const bundled = run("node", ["scripts/cli.mjs", "transmogrify"]);
    expect(bundled.status).toBe(2);
    expect(bundled.stderr.trim().split("\n")).toHaveLength(1);
    expect(bundled.stderr).toMatch(/^siderea: unknown command "transmogrify"/);
  });
});
