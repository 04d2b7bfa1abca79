/**
 * A histogram drawn as SVG on the server: bars for observed counts, an optional line for an
 * expectation, labelled axes with units, optional logarithmic axes. No client JavaScript.
 */
export interface HistogramProps {
  title: string;
  edges: number[];
  counts: number[];
  expected?: number[];
  xLabel: string;
  yLabel?: string;
  logX?: boolean;
  logY?: boolean;
  xTicks?: number[];
  formatX?: (x: number) => string;
  width?: number;
  height?: number;
}

const M = { top: 12, right: 12, bottom: 40, left: 52 };

function niceTicks(max: number, count = 4): number[] {
  if (max <= 0) return [0];
  const step0 = max / count;
  const mag = 10 ** Math.floor(Math.log10(step0));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= step0) ?? mag * 10;
  return Array.from({ length: Math.floor(max / step) + 1 }, (_, i) => i * step);
}

export function Histogram({ title, edges, counts, expected, xLabel, yLabel = "events", logX = false, logY = false, xTicks, formatX = (x) => String(Math.round(x * 100) / 100), width = 420, height = 220 }: HistogramProps) {
  const w = width - M.left - M.right;
  const h = height - M.top - M.bottom;
  const x0 = edges[0]!, x1 = edges[edges.length - 1]!;
  const sx = (x: number) => ((x - x0) / (x1 - x0 || 1)) * w;
  const positive = [...counts, ...(expected ?? [])].filter((c) => c > 0);
  const yMax = Math.max(1, ...counts, ...(expected ?? []));
  const yMin = logY ? Math.max(0.5, Math.min(...positive, 1) / 2) : 0;
  const sy = logY
    ? (y: number) => h - ((Math.log10(Math.max(y, yMin)) - Math.log10(yMin)) / (Math.log10(yMax * 1.5) - Math.log10(yMin))) * h
    : (y: number) => h - (y / (yMax * 1.08)) * h;
  const yTicks = logY
    ? Array.from({ length: Math.ceil(Math.log10(yMax * 1.5)) - Math.floor(Math.log10(yMin)) + 1 }, (_, i) => 10 ** (Math.floor(Math.log10(yMin)) + i)).filter((v) => v >= yMin && v <= yMax * 1.5)
    : niceTicks(yMax);
  const ticksX = xTicks ?? [x0, (x0 + x1) / 2, x1];
  const total = counts.reduce((a, b) => a + b, 0);
  return (
    <figure className="m-0">
      <svg width={width} height={height} role="img" aria-label={`${title}: histogram of ${total} events against ${xLabel}${expected ? ", with the expectation as a line" : ""}`}>
        <g transform={`translate(${M.left},${M.top})`}>
          {yTicks.map((t) => (
            <g key={t} transform={`translate(0,${sy(t)})`}>
              <line x2={w} stroke="#e2e8f0" />
              <text x={-6} dy="0.32em" textAnchor="end" fontSize={10} fill="#475569">{t >= 1000 ? `${t / 1000}k` : t}</text>
            </g>
          ))}
          {counts.map((c, i) => {
            const xa = sx(edges[i]!), xb = sx(edges[i + 1]!);
            return c > 0 ? <rect key={i} x={xa + 0.5} width={Math.max(0.5, xb - xa - 1)} y={sy(c)} height={h - sy(c)} fill="#2a3670" /> : null;
          })}
          {expected ? (
            <polyline fill="none" stroke="#e8a33d" strokeWidth={2}
              points={expected.map((e, i) => `${sx((edges[i]! + edges[i + 1]!) / 2)},${sy(e)}`).join(" ")} />
          ) : null}
          <line y1={h} y2={h} x2={w} stroke="#64748b" />
          {ticksX.map((t) => (
            <text key={t} x={sx(t)} y={h + 14} textAnchor="middle" fontSize={10} fill="#475569">{formatX(t)}</text>
          ))}
          <text x={w / 2} y={h + 32} textAnchor="middle" fontSize={11} fill="#1e293b">{xLabel}{logX ? " (log scale)" : ""}</text>
          <text transform={`translate(${-40},${h / 2}) rotate(-90)`} textAnchor="middle" fontSize={11} fill="#1e293b">{yLabel}{logY ? " (log)" : ""}</text>
        </g>
      </svg>
      <figcaption className="text-sm font-medium text-slate-700">{title}{expected ? <span className="ml-2 text-xs text-amber-700">— line: analytic expectation</span> : null}</figcaption>
    </figure>
  );
}
