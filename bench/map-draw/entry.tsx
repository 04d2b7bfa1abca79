/**
 * Browser side of the map-draw benchmark (bundled by bench/map-draw.ts, never by the app): renders
 * the product's SkyMap component with a synthetic Nside map, as the result page does once the
 * map's bytes have arrived, and reports how long until the raster is on the canvas and painted.
 */
import { createRoot } from "react-dom/client";
import { flushSync } from "react-dom";
import { SkyMap } from "@/components/sky-map/sky-map";

declare global {
  interface Window {
    drawOnce: (nside: number, frame: "equatorial" | "galactic") => Promise<number>;
  }
}

const host = document.getElementById("host")!;
let root: ReturnType<typeof createRoot> | null = null;

function nextFrame(): Promise<void> {
  return new Promise((resolve) => requestAnimationFrame(() => resolve()));
}

/** Mounts a fresh map (new data) and resolves with the milliseconds until its raster is painted. */
window.drawOnce = async (nside, frame) => {
  root?.unmount();
  host.replaceChildren();
  const npix = 12 * nside * nside;
  const values = new Float32Array(npix);
  for (let i = 0; i < npix; i++) values[i] = 3 * Math.sin(i * 0.001) * Math.cos(i * 0.37);
  const t0 = performance.now();
  root = createRoot(host);
  flushSync(() => {
    root!.render(
      <SkyMap
        map={{ nside, order: "ring", values }}
        scale={{ kind: "diverging", label: "Li-Ma significance", unit: "σ" }}
        frame={frame}
        width={1100}
        overlays={{ galacticPlane: true, supergalacticPlane: true, decBand: { minDeg: -90, maxDeg: 25 } }}
      />,
    );
  });
  // Wait until the canvas holds the raster (its size set and a pixel at the map's centre drawn),
  // then for the frame that paints it.
  for (;;) {
    await nextFrame();
    const canvas = host.querySelector("canvas");
    if (canvas && canvas.width > 0) {
      const ctx = canvas.getContext("2d");
      const alpha = ctx?.getImageData(Math.floor(canvas.width / 2), Math.floor(canvas.height / 2), 1, 1).data[3] ?? 0;
      if (alpha > 0) break;
    }
    if (performance.now() - t0 > 30_000) throw new Error("the map was not drawn within 30 s");
  }
  await nextFrame();
  return performance.now() - t0;
};
