"use client";

import { useCallback, useEffect, useId, useMemo, useRef, useState, type KeyboardEvent, type MouseEvent, type PointerEvent } from "react";
import { autoDomain, colourBarTicks, formatTick, makeColourScale, NO_DATA_RGBA, paletteHex, type ColourScaleKind } from "@/lib/sky/colour-scales";
import { equatorialToGalactic } from "@/lib/sky/coordinates";
import { pixelSpacingDeg, vectorToPixel, type HealpixOrder } from "@/lib/sky/healpix";
import {
  colourise, declinationCurves, displayDegToIcrsVector, displayDegToPlane, displayLonToFrameLonDeg, frameLonToDisplayLonDeg,
  galacticPlaneCurves, icrsRaDecDegToPlane, mollweideInverseRad, mollweideLayout, pixelToPlane, planeToPixel, rasterIndex,
  scaleLayout, supergalacticPlaneCurves, windowCurves, type DisplayCurve, type LonDirection, type MapLayout, type SkyFrame, type SkyView,
} from "@/lib/sky/sky-projection";

/** What lies under the pointer or the keyboard cursor. */
export interface SkyPixelInfo {
  ipix: number;
  nside: number;
  order: HealpixOrder;
  /** ICRS, degrees: RA in [0, 360), Dec in [-90, 90]. */
  raDeg: number;
  decDeg: number;
  /** Galactic (Hipparcos), degrees: l in [0, 360), b in [-90, 90]. */
  lDeg: number;
  bDeg: number;
  /** The map's value in that pixel (NaN = no data), in the scale's unit. */
  value: number;
}

export interface SkyMapOverlays {
  galacticPlane?: boolean;
  supergalacticPlane?: boolean;
  /** Field of view in declination (ICRS, degrees); an edge at +-90 is not drawn. */
  decBand?: { minDeg: number; maxDeg: number };
  /** Windows (cap edges) in ICRS degrees. */
  circles?: { raDeg: number; decDeg: number; radiusDeg: number; label?: string }[];
  /** Marked directions in ICRS degrees, optionally with an error circle. */
  points?: { raDeg: number; decDeg: number; label?: string; errorRadiusDeg?: number }[];
}

export interface SkyMapProps {
  /** Values per HEALPix pixel in ICRS (length 12 nside^2), NaN = no data. */
  map: { nside: number; order: HealpixOrder; values: Float32Array };
  /** Colour scale: kind, what the values are and their unit; domain defaults to the data's range (symmetric for diverging). */
  scale: { kind: ColourScaleKind; label: string; unit: string; domain?: [number, number] };
  frame?: SkyFrame;
  centreLonDeg?: number;
  lonIncreases?: LonDirection;
  overlays?: SkyMapOverlays;
  onHoverPixel?: (info: SkyPixelInfo | null) => void;
  onClickPixel?: (info: SkyPixelInfo) => void;
  /** Width in CSS pixels; the map is width / 2 high plus the colour bar. Default: the container's width (at most 1200). */
  width?: number;
  /** Base name of exported files (without extension). */
  exportName?: string;
  className?: string;
}

const PAD_PX = 16;
const BAR_ROW_PX = 66;
const FONT = "Inter, ui-sans-serif, system-ui, sans-serif";
const INK = "#1e293b";
const HALO = "#ffffff";
const CORE = "#0b1020";

function curvesToPath(curves: DisplayCurve[], layout: MapLayout): string {
  const parts: string[] = [];
  for (const c of curves) {
    for (let k = 0; k < c.length; k += 2) {
      const [x, y] = displayDegToPlane(c[k], c[k + 1]);
      const [px, py] = planeToPixel(layout, x, y);
      parts.push(`${k === 0 ? "M" : "L"}${px.toFixed(1)},${py.toFixed(1)}`);
    }
  }
  return parts.join("");
}

function displayPolyline(layout: MapLayout, points: [number, number][]): string {
  return points.map(([l, p], i) => {
    const [px, py] = planeToPixel(layout, ...displayDegToPlane(l, p));
    return `${i === 0 ? "M" : "L"}${px.toFixed(1)},${py.toFixed(1)}`;
  }).join("");
}

function formatValue(v: number, unit: string): string {
  if (Number.isNaN(v)) return "no data";
  const s = Number.isInteger(v) ? String(v) : Math.abs(v) >= 1000 || Math.abs(v) < 0.01 ? v.toExponential(3) : v.toPrecision(4);
  return `${s.replace("-", "\u2212")}${unit ? ` ${unit}` : ""}`;
}

const fmtDeg = (v: number) => `${v.toFixed(2).replace("-", "\u2212")}°`;

function readoutText(info: SkyPixelInfo, unit: string): string {
  return `RA ${fmtDeg(info.raDeg)}, Dec ${fmtDeg(info.decDeg)}; l ${fmtDeg(info.lDeg)}, b ${fmtDeg(info.bDeg)}; pixel ${info.ipix} (Nside ${info.nside}, ${info.order.toUpperCase()}); ${formatValue(info.value, unit)}`;
}

function download(blob: Blob, fileName: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/**
 * An interactive Mollweide sky map of a HEALPix layer. The raster is drawn on a canvas by
 * inverse projection (one HEALPix look-up per device pixel, cached while the view and size stay
 * the same; a new layer or scale only recolours); an SVG layer on top carries the graticule,
 * the outline, the overlays and the colour bar. Hover or move the keyboard cursor for a readout.
 */
export function SkyMap({
  map, scale, frame = "equatorial", centreLonDeg = 0, lonIncreases = "left", overlays = {}, onHoverPixel, onClickPixel,
  width: widthProp, exportName = "sky-map", className = "",
}: SkyMapProps) {
  const outerRef = useRef<HTMLDivElement>(null);
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const svgRef = useRef<SVGSVGElement>(null);
  const gradientId = `sky-bar-${useId().replace(/[^A-Za-z0-9_-]/g, "")}`;
  const [measured, setMeasured] = useState(800);
  // 0 until mounted: no raster on the server, and only one raster at the real devicePixelRatio
  const [dpr, setDpr] = useState(0);
  const [hover, setHover] = useState<SkyPixelInfo | null>(null);
  const [cursor, setCursor] = useState<{ lambdaDeg: number; phiDeg: number } | null>(null);
  const [announcement, setAnnouncement] = useState("");
  const [exportError, setExportError] = useState<string | null>(null);

  // size: the width prop, or the container's width
  useEffect(() => {
    setDpr(Math.min(2, Math.max(1, window.devicePixelRatio || 1)));
    if (widthProp !== undefined || !outerRef.current) return;
    const el = outerRef.current;
    const ro = new ResizeObserver((entries) => {
      const w = Math.floor(entries[0]?.contentRect.width ?? 800);
      if (w > 0) setMeasured(Math.max(320, Math.min(1200, w)));
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [widthProp]);
  const width = Math.round(widthProp ?? measured);
  const mapHeight = Math.round(width / 2);
  const totalHeight = mapHeight + BAR_ROW_PX;

  const view: SkyView = useMemo(() => ({ frame, centreLonDeg, lonIncreases }), [frame, centreLonDeg, lonIncreases]);
  const layout = useMemo(() => mollweideLayout(width, mapHeight, PAD_PX), [width, mapHeight]);
  const deviceLayout = useMemo(() => scaleLayout(layout, Math.max(1, dpr)), [layout, dpr]);

  const npixExpected = 12 * map.nside * map.nside;
  const valid = map.values.length === npixExpected;

  // the expensive part: HEALPix pixel per device pixel, only when view / size / pixelisation change
  const index = useMemo(() => (valid && dpr > 0 ? rasterIndex(deviceLayout, view, map.nside, map.order) : null), [valid, dpr, deviceLayout, view, map.nside, map.order]);

  const dataDomain = useMemo(() => autoDomain(map.values, scale.kind), [map.values, scale.kind]);
  const [d0, d1] = scale.domain ?? dataDomain;
  const colourScale = useMemo(() => makeColourScale(scale.kind, [d0, d1]), [scale.kind, d0, d1]);
  const hasNoData = useMemo(() => { for (let i = 0; i < map.values.length; i++) if (Number.isNaN(map.values[i])) return true; return false; }, [map.values]);

  // the cheap part: recolour into one ImageData
  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas || !index) return;
    canvas.width = deviceLayout.widthPx;
    canvas.height = deviceLayout.heightPx;
    const ctx = canvas.getContext("2d");
    if (!ctx) return;
    const image = ctx.createImageData(deviceLayout.widthPx, deviceLayout.heightPx);
    colourise(index, map.values, colourScale, image.data);
    ctx.putImageData(image, 0, 0);
  }, [index, map.values, colourScale, deviceLayout]);

  // ---- SVG geometry
  const lonName = frame === "equatorial" ? "RA" : "l";
  const graticule = useMemo(() => {
    const meridians: { d: string; label: string; x: number; y: number }[] = [];
    for (let lon = 0; lon < 360; lon += 30) {
      const lam = frameLonToDisplayLonDeg(view, lon);
      if (Math.abs(lam) > 179.999) continue; // the edge is the outline
      const pts: [number, number][] = [];
      for (let p = -90; p <= 90; p += 3) pts.push([lam, p]);
      const [x, y] = planeToPixel(layout, ...displayDegToPlane(lam, 0));
      meridians.push({ d: displayPolyline(layout, pts), label: frame === "equatorial" ? `${lon / 15}h` : `${lon}°`, x, y });
    }
    const parallels: { d: string; label: string; x: number; y: number }[] = [];
    for (let lat = -60; lat <= 60; lat += 30) {
      const pts: [number, number][] = [];
      for (let l = -180; l <= 180; l += 3) pts.push([l, lat]);
      const [x, y] = planeToPixel(layout, ...displayDegToPlane(-180, lat));
      parallels.push({ d: displayPolyline(layout, pts), label: `${lat > 0 ? "+" : lat < 0 ? "\u2212" : ""}${Math.abs(lat)}°`, x, y });
    }
    const outline: [number, number][] = [];
    for (let p = -90; p <= 90; p += 1) outline.push([180, p]);
    for (let p = 90; p >= -90; p -= 1) outline.push([-180, p]);
    return { meridians, parallels, outline: `${displayPolyline(layout, outline)}Z` };
  }, [view, layout, frame]);

  const { galacticPlane, supergalacticPlane, decBand, circles, points } = overlays;
  const overlayPaths = useMemo(() => {
    const lines: { key: string; d: string; dash?: string; width: number; title: string }[] = [];
    if (galacticPlane) lines.push({ key: "gp", d: curvesToPath(galacticPlaneCurves(view), layout), width: 1.5, title: "Galactic plane" });
    if (supergalacticPlane) lines.push({ key: "sgp", d: curvesToPath(supergalacticPlaneCurves(view), layout), dash: "7 4", width: 1.5, title: "Supergalactic plane" });
    if (decBand) {
      for (const [k, dec] of [["min", decBand.minDeg], ["max", decBand.maxDeg]] as const) {
        if (dec > -90 && dec < 90) lines.push({ key: `dec-${k}`, d: curvesToPath(declinationCurves(view, dec), layout), dash: "2 3", width: 1.5, title: `Field-of-view edge, Dec ${fmtDeg(dec)}` });
      }
    }
    (circles ?? []).forEach((c, i) => {
      if (c.radiusDeg > 0 && c.radiusDeg <= 180) lines.push({ key: `c${i}`, d: curvesToPath(windowCurves(view, c.raDeg, c.decDeg, c.radiusDeg), layout), width: 1.2, title: c.label ?? `Window of ${c.radiusDeg}° at RA ${fmtDeg(c.raDeg)}, Dec ${fmtDeg(c.decDeg)}` });
    });
    (points ?? []).forEach((p, i) => {
      if (p.errorRadiusDeg && p.errorRadiusDeg > 0 && p.errorRadiusDeg <= 180) lines.push({ key: `e${i}`, d: curvesToPath(windowCurves(view, p.raDeg, p.decDeg, p.errorRadiusDeg, 72), layout), dash: "3 2", width: 1, title: `${p.label ?? "point"} error circle ${p.errorRadiusDeg}°` });
    });
    const labels: { key: string; x: number; y: number; text: string }[] = [];
    (circles ?? []).forEach((c, i) => {
      if (!c.label) return;
      const [x, y] = planeToPixel(layout, ...icrsRaDecDegToPlane(view, c.raDeg, c.decDeg));
      labels.push({ key: `cl${i}`, x, y, text: c.label });
    });
    const marks = (points ?? []).map((p, i) => {
      const [x, y] = planeToPixel(layout, ...icrsRaDecDegToPlane(view, p.raDeg, p.decDeg));
      return { key: `p${i}`, x, y, label: p.label };
    });
    return { lines, labels, marks };
  }, [view, layout, galacticPlane, supergalacticPlane, decBand, circles, points]);

  // ---- readout
  const infoAtDisplay = useCallback((lambdaDeg: number, phiDeg: number): SkyPixelInfo | null => {
    if (!valid) return null;
    const u = displayDegToIcrsVector(view, lambdaDeg, phiDeg);
    const ipix = vectorToPixel(map.nside, map.order, u[0], u[1], u[2]);
    if (ipix < 0) return null;
    let raDeg = (Math.atan2(u[1], u[0]) * 180) / Math.PI;
    if (raDeg < 0) raDeg += 360;
    const decDeg = (Math.asin(Math.max(-1, Math.min(1, u[2]))) * 180) / Math.PI;
    const g = equatorialToGalactic([raDeg], [decDeg]);
    return { ipix, nside: map.nside, order: map.order, raDeg, decDeg, lDeg: g.lDeg[0], bDeg: g.bDeg[0], value: map.values[ipix] };
  }, [valid, view, map.nside, map.order, map.values]);

  const displayAtEvent = (e: { clientX: number; clientY: number }): { lambdaDeg: number; phiDeg: number } | null => {
    const rect = canvasRef.current?.getBoundingClientRect();
    if (!rect) return null;
    const [x, y] = pixelToPlane(layout, e.clientX - rect.left, e.clientY - rect.top);
    const ll = mollweideInverseRad(x, y);
    return ll ? { lambdaDeg: (ll[0] * 180) / Math.PI, phiDeg: (ll[1] * 180) / Math.PI } : null;
  };

  const setHoverInfo = (info: SkyPixelInfo | null) => {
    setHover(info);
    onHoverPixel?.(info);
  };

  function onPointerMove(e: PointerEvent<HTMLDivElement>) {
    const d = displayAtEvent(e);
    setHoverInfo(d ? infoAtDisplay(d.lambdaDeg, d.phiDeg) : null);
  }

  function onClick(e: MouseEvent<HTMLDivElement>) {
    const d = displayAtEvent(e);
    if (!d) return;
    const info = infoAtDisplay(d.lambdaDeg, d.phiDeg);
    setCursor(d);
    if (info) onClickPixel?.(info);
  }

  const cursorInfo = cursor ? infoAtDisplay(cursor.lambdaDeg, cursor.phiDeg) : null;

  function onKeyDown(e: KeyboardEvent<HTMLDivElement>) {
    const stepDeg = Math.max(0.1, pixelSpacingDeg(map.nside)) * (e.shiftKey ? 10 : 1);
    const c = cursor ?? { lambdaDeg: 0, phiDeg: 0 };
    const cosPhi = Math.max(0.05, Math.cos((c.phiDeg * Math.PI) / 180));
    let { lambdaDeg, phiDeg } = c;
    switch (e.key) {
      case "ArrowLeft": lambdaDeg -= stepDeg / cosPhi; break;
      case "ArrowRight": lambdaDeg += stepDeg / cosPhi; break;
      case "ArrowUp": phiDeg = Math.min(89.5, phiDeg + stepDeg); break;
      case "ArrowDown": phiDeg = Math.max(-89.5, phiDeg - stepDeg); break;
      case "Enter":
      case " ": {
        e.preventDefault();
        const info = infoAtDisplay(c.lambdaDeg, c.phiDeg);
        if (!cursor) setCursor(c);
        if (info) { onClickPixel?.(info); setAnnouncement(`Selected: ${readoutText(info, scale.unit)}`); }
        return;
      }
      case "Escape": setCursor(null); setAnnouncement("Cursor removed."); return;
      default: return;
    }
    e.preventDefault();
    if (lambdaDeg > 180) lambdaDeg -= 360; else if (lambdaDeg < -180) lambdaDeg += 360;
    setCursor({ lambdaDeg, phiDeg });
    // the live region speaks for keyboard moves only, not for every pointer move
    const info = infoAtDisplay(lambdaDeg, phiDeg);
    setAnnouncement(info ? readoutText(info, scale.unit) : "");
  }

  // ---- colour bar
  const ticks = useMemo(() => colourBarTicks(colourScale.domain, 5), [colourScale]);
  const barW = Math.min(340, Math.round(width * 0.42));
  const barX = Math.round((width - barW) / 2);
  const barY = mapHeight + 22;
  const barH = 10;
  const barScale = (v: number) => barX + ((v - colourScale.domain[0]) / (colourScale.domain[1] - colourScale.domain[0])) * barW;
  const gradientStops = useMemo(() => Array.from({ length: 17 }, (_, k) => ({ offset: k / 16, colour: paletteHex(scale.kind, k / 16) })), [scale.kind]);
  const unitSuffix = scale.unit ? ` (${scale.unit})` : "";

  const cursorPx = cursor ? planeToPixel(layout, ...displayDegToPlane(cursor.lambdaDeg, cursor.phiDeg)) : null;
  const rangeText = `${formatTick(colourScale.domain[0], ticks)} to ${formatTick(colourScale.domain[1], ticks)}${scale.unit ? ` ${scale.unit}` : ""}`;
  const ariaLabel = `Sky map in ${frame} coordinates, Mollweide projection, centre ${lonName} ${fmtDeg(centreLonDeg)}, ${lonName} increasing to the ${lonIncreases}. `
    + `Layer: ${scale.label}, colour range ${rangeText}, Nside ${map.nside}. Arrow keys move a cursor by one pixel (Shift: ten), Enter selects, Escape clears.`;

  // ---- export
  function svgForExport(withRaster: boolean): string | null {
    const svg = svgRef.current, canvas = canvasRef.current;
    if (!svg || !canvas) return null;
    const clone = svg.cloneNode(true) as SVGSVGElement;
    clone.querySelectorAll("[data-export-skip]").forEach((n) => n.remove());
    clone.setAttribute("xmlns", "http://www.w3.org/2000/svg");
    clone.setAttribute("width", String(width));
    clone.setAttribute("height", String(totalHeight));
    const ns = "http://www.w3.org/2000/svg";
    const bg = document.createElementNS(ns, "rect");
    bg.setAttribute("width", String(width)); bg.setAttribute("height", String(totalHeight)); bg.setAttribute("fill", "#ffffff");
    if (withRaster) {
      const img = document.createElementNS(ns, "image");
      img.setAttribute("href", canvas.toDataURL("image/png"));
      img.setAttribute("x", "0"); img.setAttribute("y", "0");
      img.setAttribute("width", String(width)); img.setAttribute("height", String(mapHeight));
      img.setAttribute("preserveAspectRatio", "none");
      clone.insertBefore(img, clone.firstChild);
      clone.insertBefore(bg, clone.firstChild);
    }
    return new XMLSerializer().serializeToString(clone);
  }

  async function exportPng() {
    setExportError(null);
    try {
      const canvas = canvasRef.current;
      const text = svgForExport(false);
      if (!canvas || !text) return;
      const img = new Image();
      img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(text)}`;
      await img.decode();
      const out = document.createElement("canvas");
      const k = Math.max(1, dpr);
      out.width = Math.round(width * k);
      out.height = Math.round(totalHeight * k);
      const ctx = out.getContext("2d");
      if (!ctx) throw new Error("no 2D canvas");
      ctx.fillStyle = "#ffffff";
      ctx.fillRect(0, 0, out.width, out.height);
      ctx.drawImage(canvas, 0, 0, Math.round(width * k), Math.round(mapHeight * k));
      ctx.drawImage(img, 0, 0, out.width, out.height);
      const blob = await new Promise<Blob | null>((resolve) => out.toBlob(resolve, "image/png"));
      if (!blob) throw new Error("PNG encoding failed");
      download(blob, `${exportName}.png`);
    } catch {
      setExportError("The PNG could not be made in this browser; try the SVG export.");
    }
  }

  function exportSvg() {
    setExportError(null);
    const text = svgForExport(true);
    if (text) download(new Blob([text], { type: "image/svg+xml" }), `${exportName}.svg`);
  }

  if (!valid) {
    return (
      <p role="alert" className="rounded-md border border-red-200 bg-red-50 p-3 text-sm text-red-800">
        This map cannot be drawn: it has {map.values.length} values, but Nside {map.nside} needs {npixExpected}.
      </p>
    );
  }

  const shown = hover ?? cursorInfo;
  const legend = overlayPaths.lines.filter((l) => ["gp", "sgp", "dec-min"].includes(l.key) || (l.key === "dec-max" && !overlayPaths.lines.some((m) => m.key === "dec-min")));

  return (
    <figure className={`m-0 ${className}`}>
      <div ref={outerRef} className="w-full">
        <div
          className="relative cursor-crosshair select-none rounded-md"
          style={{ width, height: totalHeight }}
          tabIndex={0}
          role="application"
          aria-roledescription="sky map"
          aria-label={ariaLabel}
          onPointerMove={onPointerMove}
          onPointerLeave={() => setHoverInfo(null)}
          onClick={onClick}
          onKeyDown={onKeyDown}
          onFocus={() => { if (!cursor) setCursor({ lambdaDeg: 0, phiDeg: 0 }); }}
        >
          <canvas ref={canvasRef} className="absolute left-0 top-0" style={{ width, height: mapHeight }} aria-hidden="true" />
          <svg ref={svgRef} xmlns="http://www.w3.org/2000/svg" width={width} height={totalHeight} className="pointer-events-none absolute left-0 top-0"
            fontFamily={FONT} aria-hidden="true">
            <defs>
              <linearGradient id={gradientId} x1="0" x2="1" y1="0" y2="0">
                {gradientStops.map((s) => <stop key={s.offset} offset={s.offset} stopColor={s.colour} />)}
              </linearGradient>
            </defs>
            <g fill="none" stroke="#6b7894" strokeOpacity={0.55} strokeWidth={0.6}>
              {graticule.meridians.map((m) => <path key={`m${m.label}`} d={m.d} />)}
              {graticule.parallels.map((p) => <path key={`p${p.label}`} d={p.d} />)}
            </g>
            <path d={graticule.outline} fill="none" stroke={INK} strokeWidth={1} />
            <g fontSize={10} fill={INK} stroke={HALO} strokeWidth={2.5} paintOrder="stroke" strokeLinejoin="round">
              {graticule.meridians.map((m) => <text key={`ml${m.label}`} x={m.x + 2} y={m.y + 11}>{m.label}</text>)}
              {graticule.parallels.map((p) => <text key={`pl${p.label}`} x={p.x - 4} y={p.y + 3.5} textAnchor="end">{p.label}</text>)}
            </g>
            <g fill="none" strokeLinejoin="round">
              {overlayPaths.lines.map((l) => (
                <g key={l.key}>
                  <title>{l.title}</title>
                  <path d={l.d} stroke={HALO} strokeOpacity={0.8} strokeWidth={l.width + 2} strokeDasharray={l.dash} />
                  <path d={l.d} stroke={CORE} strokeWidth={l.width} strokeDasharray={l.dash} />
                </g>
              ))}
            </g>
            {overlayPaths.marks.map((m) => (
              <g key={m.key}>
                <circle cx={m.x} cy={m.y} r={3.5} fill={HALO} stroke={CORE} strokeWidth={1.5} />
                {m.label ? <text x={m.x + 6} y={m.y - 5} fontSize={10.5} fill={CORE} stroke={HALO} strokeWidth={2.5} paintOrder="stroke">{m.label}</text> : null}
              </g>
            ))}
            {overlayPaths.labels.map((l) => (
              <text key={l.key} x={l.x} y={l.y + 3.5} textAnchor="middle" fontSize={10.5} fill={CORE} stroke={HALO} strokeWidth={2.5} paintOrder="stroke">{l.text}</text>
            ))}
            {cursorPx ? (
              <g data-export-skip="" transform={`translate(${cursorPx[0]},${cursorPx[1]})`} fill="none">
                <circle r={7} stroke={HALO} strokeWidth={3.5} />
                <circle r={7} stroke="#c98621" strokeWidth={2} />
              </g>
            ) : null}
            {/* colour bar */}
            <text x={barX + barW / 2} y={barY - 7} textAnchor="middle" fontSize={11} fill={INK}>{scale.label}{unitSuffix}</text>
            <rect x={barX} y={barY} width={barW} height={barH} fill={`url(#${gradientId})`} stroke={INK} strokeWidth={0.5} />
            {ticks.map((t) => (
              <g key={t} transform={`translate(${barScale(t)},${barY + barH})`}>
                <line y2={4} stroke={INK} strokeWidth={0.8} />
                <text y={15} textAnchor="middle" fontSize={10} fill="#475569">{formatTick(t, ticks)}</text>
              </g>
            ))}
            {hasNoData ? (
              <g transform={`translate(${barX + barW + 18},${barY})`}>
                <rect width={barH} height={barH} fill={`rgb(${NO_DATA_RGBA[0]},${NO_DATA_RGBA[1]},${NO_DATA_RGBA[2]})`} stroke={INK} strokeWidth={0.5} />
                <text x={barH + 4} y={barH - 1} fontSize={10} fill="#475569">no data</text>
              </g>
            ) : null}
            <g transform={`translate(${8},${barY - 4})`} fontSize={10} fill="#475569">
              {legend.map((l, i) => (
                <g key={l.key} transform={`translate(0,${i * 14})`}>
                  <line x2={22} y1={4} y2={4} stroke={CORE} strokeWidth={1.5} strokeDasharray={l.dash} />
                  <text x={28} y={7.5}>{l.key.startsWith("dec") ? "Field-of-view edge" : l.title}</text>
                </g>
              ))}
            </g>
          </svg>
          <div aria-hidden="true" className="pointer-events-none absolute left-2 top-1.5 max-w-[46%] rounded bg-white/85 px-2 py-1 text-xs leading-snug text-slate-800 shadow-sm"
            style={{ visibility: shown ? "visible" : "hidden" }}>
            {shown ? (
              <>
                <div className="tabular-nums">RA {fmtDeg(shown.raDeg)} · Dec {fmtDeg(shown.decDeg)}</div>
                <div className="tabular-nums">l {fmtDeg(shown.lDeg)} · b {fmtDeg(shown.bDeg)}</div>
                <div className="tabular-nums">pixel {shown.ipix} · <span className="font-medium">{formatValue(shown.value, scale.unit)}</span></div>
              </>
            ) : "\u00a0"}
          </div>
        </div>
      </div>
      <p className="sr-only" aria-live="polite">{announcement}</p>
      <figcaption className="mt-1 flex flex-wrap items-center gap-2 text-xs text-slate-600">
        <span>
          Mollweide, {frame} frame, {lonName} {fmtDeg(displayLonToFrameLonDeg(view, 0))} at the centre, increasing to the {lonIncreases}; Nside {map.nside}.
        </span>
        <span className="ml-auto flex gap-2">
          <button type="button" aria-label={`Download the map as PNG (${exportName}.png)`} onClick={() => void exportPng()} className="rounded-md border border-slate-300 bg-white px-2 py-1 text-xs font-medium text-slate-800 hover:bg-mist-100">PNG</button>
          <button type="button" aria-label={`Download the map as SVG (${exportName}.svg)`} onClick={exportSvg} className="rounded-md border border-slate-300 bg-white px-2 py-1 text-xs font-medium text-slate-800 hover:bg-mist-100">SVG</button>
        </span>
        {exportError ? <span role="alert" className="w-full text-red-700">{exportError}</span> : null}
      </figcaption>
    </figure>
  );
}
