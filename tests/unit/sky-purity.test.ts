import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

// lib/sky must stay pure so the browser can use it (map, coverage planner): no framework,
// database, file system or environment. The trials worker entry is the one Node-only file.
const FORBIDDEN = [/from\s+["']next(\/|["'])/, /from\s+["']react/, /from\s+["']sequelize/, /from\s+["'](node:)?fs/, /from\s+["']pg["']/, /process\.env/];
const NODE_ONLY = new Set(["trials.ts", "trials-worker.ts"]);

describe("lib/sky purity", () => {
  const files = readdirSync("lib/sky").filter((f) => f.endsWith(".ts"));

  it("has modules to check", () => {
    expect(files.length).toBeGreaterThan(0);
  });

  it.each(files)("%s imports nothing from Next.js, React, the database, the file system or the environment", (file) => {
    const source = readFileSync(join("lib/sky", file), "utf8");
    for (const pattern of FORBIDDEN) expect(source, `${file} matches ${pattern}`).not.toMatch(pattern);
    if (!NODE_ONLY.has(file)) expect(source).not.toMatch(/from\s+["'](node:)?worker_threads/);
  });
});
