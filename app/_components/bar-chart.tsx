import { formatNumber } from "./format";

export interface BarSegment {
  key: string;
  label: string;
  value: number;
  colour: string;
}

export interface BarDatum {
  label: string;
  /** Where the bar's label links to (e.g. the records table filtered to it). */
  href?: string;
  segments: BarSegment[];
}

const ROW = 26;
const BAR = 16;
const LABEL_WIDTH = 118;
const VALUE_WIDTH = 64;

/**
 * Horizontal (optionally stacked) bars drawn from data as SVG. Every bar carries its total as
 * text and the description lists each value, so nothing depends on reading colours.
 */
export function BarChart({ data, title, unit, width = 560 }: { data: readonly BarDatum[]; title: string; unit: string; width?: number }) {
  const totals = data.map((d) => d.segments.reduce((s, x) => s + x.value, 0));
  const max = Math.max(1, ...totals);
  const plot = width - LABEL_WIDTH - VALUE_WIDTH;
  const height = data.length * ROW + 4;
  const legend = new Map<string, BarSegment>();
  for (const d of data) for (const s of d.segments) if (s.value > 0 && !legend.has(s.key)) legend.set(s.key, s);
  const description = data
    .map((d, i) => `${d.label}: ${formatNumber(totals[i] ?? 0, 0)} ${unit}${d.segments.length > 1 ? ` (${d.segments.filter((s) => s.value > 0).map((s) => `${s.label} ${formatNumber(s.value, 0)}`).join(", ")})` : ""}`)
    .join("; ");
  const titleId = `chart-${title.replace(/\W+/g, "-").toLowerCase()}`;
  return (
    <figure style={{ margin: 0 }}>
      <svg className="bar-chart" viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby={`${titleId}-title ${titleId}-desc`}>
        <title id={`${titleId}-title`}>{title}</title>
        <desc id={`${titleId}-desc`}>{description}</desc>
        {data.map((d, i) => {
          const y = i * ROW + 2;
          let x = LABEL_WIDTH;
          const total = totals[i] ?? 0;
          const label = (
            <text x={LABEL_WIDTH - 8} y={y + BAR / 2 + 1} textAnchor="end" dominantBaseline="middle" fontSize="12.5">
              {d.label.length > 16 ? `${d.label.slice(0, 15)}…` : d.label}
            </text>
          );
          return (
            <g key={d.label}>
              {d.href ? <a href={d.href}>{label}</a> : label}
              <rect x={LABEL_WIDTH} y={y} width={plot} height={BAR} fill="#eef0f3" rx="2" />
              {d.segments.map((s) => {
                const w = (s.value / max) * plot;
                const rect = w > 0 ? <rect key={s.key} x={x} y={y} width={w} height={BAR} fill={s.colour} stroke="#1b2128" strokeOpacity="0.45" strokeWidth="0.75" /> : null;
                x += w;
                return rect;
              })}
              <text className="bar-chart__value" x={x + 6} y={y + BAR / 2 + 1} dominantBaseline="middle" fontSize="12">
                {formatNumber(total, 0)}
              </text>
            </g>
          );
        })}
      </svg>
      {legend.size > 1 ? (
        <ul className="legend" aria-hidden="true">
          {[...legend.values()].map((s) => (
            <li key={s.key}>
              <span className="swatch" style={{ background: s.colour }} />
              {s.label}
            </li>
          ))}
        </ul>
      ) : null}
    </figure>
  );
}
