/**
 * Benchmark: the result page's Mollweide sky map (components/sky-map/sky-map.tsx) drawn in
 * Debian's Chromium (headless, software rendering), from the moment its data has arrived until
 * the raster is painted: React mount, the inverse projection (one HEALPix look-up per device
 * pixel), colouring, the SVG overlays. The component is bundled with esbuild exactly as written
 * (React production build) into a local page; no server and no network.
 *
 *   npx tsx bench/map-draw.ts [--repeat 9]        (or: npm run bench -- map-draw)
 *
 * Prints one JSON line per case: Nside, frame, device pixel ratio, median / max milliseconds.
 */
import { build } from "esbuild";
import { parseArgs } from "node:util";
import { chromium } from "playwright-core";

const { values } = parseArgs({ options: { repeat: { type: "string", default: "9" } } });
const repeat = Number(values.repeat);

const bundle = await build({
  entryPoints: ["bench/map-draw/entry.tsx"],
  bundle: true,
  write: false,
  format: "iife",
  minify: true,
  jsx: "automatic",
  platform: "browser",
  define: { "process.env.NODE_ENV": '"production"' },
  alias: { "@": "." },
  logLevel: "error",
});
const script = bundle.outputFiles[0]!.text;
const html = `<!doctype html><html><head><meta charset="utf-8"></head><body style="margin:0;font-family:sans-serif"><div id="host" style="width:1100px"></div></body></html>`;

const browser = await chromium.launch({
  executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
  headless: true,
  args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--no-first-run"],
});
try {
  for (const dpr of [1, 2]) {
    const context = await browser.newContext({ deviceScaleFactor: dpr, viewport: { width: 1200, height: 900 } });
    const page = await context.newPage();
    await page.setContent(html);
    await page.addScriptTag({ content: script });
    for (const nside of [128, 256]) {
      for (const frame of ["equatorial", "galactic"] as const) {
        await page.evaluate(([n, f]) => window.drawOnce(n, f), [nside, frame] as const); // warm-up: JIT, fonts
        const times: number[] = [];
        for (let r = 0; r < repeat; r++) times.push(await page.evaluate(([n, f]) => window.drawOnce(n, f), [nside, frame] as const));
        times.sort((a, b) => a - b);
        console.log(JSON.stringify({
          name: "map-draw", nside, frame, devicePixelRatio: dpr, widthCssPx: 1100, repeat,
          medianMs: +times[Math.floor(times.length / 2)]!.toFixed(1), maxMs: +times[times.length - 1]!.toFixed(1),
        }));
      }
    }
    await context.close();
  }
} finally {
  await browser.close();
}
