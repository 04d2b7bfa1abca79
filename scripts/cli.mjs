#!/usr/bin/env node
// Runs the command line (lib/cli/main.ts) from a JavaScript bundle made with esbuild, rebuilt
// whenever a source under lib/ is newer than the bundle. Starting from the bundle takes about
// 0.15 s instead of the ~0.8 s of compiling TypeScript on every run.
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const outdir = join(root, ".siderea", "cli");
const entry = join(outdir, "main.mjs");

function newestMtimeMs(dir) {
  let newest = 0;
  for (const name of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, name.name);
    if (name.isDirectory()) newest = Math.max(newest, newestMtimeMs(path));
    else if (name.name.endsWith(".ts")) newest = Math.max(newest, statSync(path).mtimeMs);
  }
  return newest;
}

const sourceMtime = Math.max(newestMtimeMs(join(root, "lib")), statSync(join(root, "package-lock.json")).mtimeMs, statSync(fileURLToPath(import.meta.url)).mtimeMs);
if (!existsSync(entry) || statSync(entry).mtimeMs < sourceMtime) {
  const { build } = await import("esbuild");
  // Build into a private folder, then move the files in, chunks first and main.mjs last, each
  // by an atomic rename: commands started at the same moment never read a half-written bundle.
  const tmp = `${outdir}.tmp-${process.pid}`;
  await build({
    entryPoints: { main: join(root, "lib/cli/main.ts") },
    outdir: tmp,
    bundle: true,
    splitting: true,
    format: "esm",
    platform: "node",
    target: "node20",
    outExtension: { ".js": ".mjs" },
    tsconfig: join(root, "tsconfig.json"),
    // Packages stay in node_modules (resolved at run time from the project root).
    packages: "external",
    logLevel: "error",
    sourcemap: "inline",
  });
  // The trials' worker thread is started from `./trials-worker.js` beside the bundle.
  await build({
    entryPoints: [join(root, "lib/sky/trials-worker.ts")],
    outfile: join(tmp, "trials-worker.js"),
    bundle: true,
    format: "esm",
    platform: "node",
    target: "node20",
    tsconfig: join(root, "tsconfig.json"),
    packages: "external",
    logLevel: "error",
  });
  mkdirSync(outdir, { recursive: true });
  const files = readdirSync(tmp).sort((a, b) => (a === "main.mjs" ? 1 : b === "main.mjs" ? -1 : 0));
  for (const file of files) renameSync(join(tmp, file), join(outdir, file));
  rmSync(tmp, { recursive: true, force: true });
}
await import(pathToFileURL(entry).href);
