import { SERIES_STYLES } from "./series-style";

export interface CurveSeries {
  label: string;
  decDeg: ArrayLike<number>;
  value: ArrayLike<number>;
}

/**
 * Relative exposure against declination for one to four configurations: SVG lines with
 * distinct colours and dash patterns, a legend, labelled axes with units, and the covered
 * band of one configuration shaded with its edges written out.
 */
export function ExposureCurveChart({ series, band, bandLabel, width = 640, height = 300, title = "Relative exposure against declination" }: {
  series: CurveSeries[];
  band?: { decMinDeg: number; decMaxDeg: number };
  /** Whose band is shaded (default: the first series). */
  bandLabel?: string;
  width?: number;
  height?: number;
  title?: string;
}) {
  const m = { top: 14, right: 16, bottom: 44, left: 56 };
  const w = width - m.left - m.right, h = height - m.top - m.bottom;
  const x = (d: number) => m.left + ((d + 90) / 180) * w;
  const y = (v: number) => m.top + (1 - Math.max(0, Math.min(1.05, v)) / 1.05) * h;
  const path = (s: CurveSeries) => {
    let p = "";
    for (let k = 0; k < s.decDeg.length; k++) p += `${k === 0 ? "M" : "L"}${x(s.decDeg[k]).toFixed(1)},${y(s.value[k]).toFixed(1)}`;
    return p;
  };
  const fmt = (d: number) => `${d > 0 ? "+" : d < 0 ? "−" : ""}${Math.abs(d).toFixed(1)}°`;
  return (
    <figure className="space-y-2">
      <svg viewBox={`0 0 ${width} ${height}`} width="100%" role="img" aria-label={`${title}. ${series.map((s) => s.label).join("; ")}.${band ? ` Covered band of ${bandLabel ?? series[0]?.label}: ${fmt(band.decMinDeg)} to ${fmt(band.decMaxDeg)}.` : ""}`}
        className="max-w-full" data-testid="exposure-curve">
        {band ? (
          <g>
            <rect x={x(band.decMinDeg)} y={m.top} width={Math.max(0, x(band.decMaxDeg) - x(band.decMinDeg))} height={h} fill="#e9edf6" />
            <text x={x(band.decMinDeg) + 4} y={m.top + 12} fontSize="11" fill="#334155">{fmt(band.decMinDeg)}</text>
            <text x={x(band.decMaxDeg) - 4} y={m.top + 12} fontSize="11" fill="#334155" textAnchor="end">{fmt(band.decMaxDeg)}</text>
          </g>
        ) : null}
        {[0, 0.25, 0.5, 0.75, 1].map((t) => (
          <g key={t}>
            <line x1={m.left} x2={m.left + w} y1={y(t)} y2={y(t)} stroke="#cbd5e1" strokeWidth="0.5" />
            <text x={m.left - 6} y={y(t) + 4} fontSize="11" textAnchor="end" fill="#334155">{t.toFixed(2)}</text>
          </g>
        ))}
        {[-90, -60, -30, 0, 30, 60, 90].map((d) => (
          <g key={d}>
            <line x1={x(d)} x2={x(d)} y1={m.top + h} y2={m.top + h + 4} stroke="#334155" />
            <text x={x(d)} y={m.top + h + 17} fontSize="11" textAnchor="middle" fill="#334155">{d}</text>
          </g>
        ))}
        <line x1={m.left} x2={m.left + w} y1={m.top + h} y2={m.top + h} stroke="#334155" />
        <line x1={m.left} x2={m.left} y1={m.top} y2={m.top + h} stroke="#334155" />
        <text x={m.left + w / 2} y={height - 6} fontSize="12" textAnchor="middle" fill="#0f172a">declination (°, ICRS)</text>
        <text transform={`translate(14 ${m.top + h / 2}) rotate(-90)`} fontSize="12" textAnchor="middle" fill="#0f172a">relative exposure (max 1)</text>
        {series.map((s, i) => (
          <path key={i} d={path(s)} fill="none" stroke={SERIES_STYLES[i % 4]!.colour} strokeWidth="2.2" strokeDasharray={SERIES_STYLES[i % 4]!.dash} />
        ))}
      </svg>
      <figcaption>
        <ul className="flex flex-wrap gap-x-5 gap-y-1 text-sm" aria-label="Legend">
          {series.map((s, i) => (
            <li key={i} className="flex items-center gap-2">
              <svg width="36" height="10" aria-hidden="true"><line x1="0" x2="36" y1="5" y2="5" stroke={SERIES_STYLES[i % 4]!.colour} strokeWidth="2.5" strokeDasharray={SERIES_STYLES[i % 4]!.dash} /></svg>
              <span>{s.label} <span className="text-slate-500">({SERIES_STYLES[i % 4]!.dashLabel})</span></span>
            </li>
          ))}
        </ul>
      </figcaption>
    </figure>
  );
}
