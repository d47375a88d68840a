'use client';

import { formatValue, type ValueFormat } from './format';

export interface StripPlotProps {
  values: readonly number[];
  /** One label per value (e.g. the unit's serial), shown on hover. */
  labels?: readonly string[];
  format?: ValueFormat;
  /** A reference value drawn as a hollow tick, e.g. the maker's nominal CWL. */
  nominal?: number;
  /** Accessible name, e.g. "CWL of the 6 units sharing this label". */
  label: string;
  width?: number;
  height?: number;
  className?: string;
}

const MAX_DOTS = 60;
const MAX_LANES = 4;

function mean(v: readonly number[]): number {
  return v.reduce((s, x) => s + x, 0) / v.length;
}

function sd(v: readonly number[], m: number): number {
  if (v.length < 2) return 0;
  return Math.sqrt(v.reduce((s, x) => s + (x - m) ** 2, 0) / (v.length - 1));
}

/**
 * The spread of one number across units that share a label: a dot per unit, the mean
 * as a rule with ±1 standard deviation shaded. Plain SVG in theme classes, so it costs
 * nothing and follows the night view.
 */
export function StripPlot({
  values,
  labels,
  format = 'nm',
  nominal,
  label,
  width = 280,
  height = 64,
  className = '',
}: StripPlotProps) {
  const items = values.map((v, i) => ({ v, label: labels?.[i] })).filter((d) => Number.isFinite(d.v));
  if (items.length === 0) {
    return (
      <p className={`text-xs text-muted ${className}`} role="note">
        {label}: no values.
      </p>
    );
  }
  const vs = items.map((d) => d.v);
  const m = mean(vs);
  const s = sd(vs, m);
  const lo = Math.min(...vs, nominal ?? Infinity, m - s);
  const hi = Math.max(...vs, nominal ?? -Infinity, m + s);
  const span = hi - lo || Math.max(Math.abs(m) * 1e-3, 0.5);
  const d0 = lo - span * 0.12;
  const d1 = hi + span * 0.12;

  const padX = 10;
  const axisY = height - 18;
  const r = 3.5;
  const sx = (v: number) => padX + ((v - d0) / (d1 - d0)) * (width - 2 * padX);

  // Dots that would overlap step upward into lanes (at most MAX_LANES, then they share the top one).
  // A popular label can have hundreds of units: past MAX_DOTS the dots stand at evenly spaced
  // quantiles of all of them, while the mean, spread and range above use every value.
  const all = items.map((d) => ({ ...d, px: sx(d.v) })).sort((a, b) => a.px - b.px);
  const sorted = all.length <= MAX_DOTS ? all : Array.from({ length: MAX_DOTS }, (_, k) => all[Math.round((k * (all.length - 1)) / (MAX_DOTS - 1))]);
  const laneEnds: number[] = [];
  const placed = sorted.map((d) => {
    let lane = laneEnds.findIndex((end) => d.px - end >= 2 * r + 1);
    if (lane === -1 && laneEnds.length < MAX_LANES) {
      lane = laneEnds.length;
      laneEnds.push(d.px);
    } else if (lane === -1) lane = MAX_LANES - 1;
    laneEnds[lane] = d.px;
    return { ...d, cy: axisY - 8 - lane * (2 * r + 1) };
  });

  const shown = sorted.length < all.length ? ` (dots for ${sorted.length} of them, at even quantiles)` : '';
  const summary = `${label}: ${items.length} value${items.length === 1 ? '' : 's'}${shown}, mean ${formatValue(m, format)}, range ${formatValue(Math.min(...vs), format)} to ${formatValue(Math.max(...vs), format)}${items.length > 1 ? `, standard deviation ${formatValue(s, format)}` : ''}${nominal != null ? `, nominal ${formatValue(nominal, format)}` : ''}.`;
  const mx = sx(m);

  return (
    <svg
      viewBox={`0 0 ${width} ${height}`}
      width={width}
      height={height}
      role="img"
      aria-label={summary}
      className={`figures max-w-full overflow-visible ${className}`}
    >
      <title>{summary}</title>
      {s > 0 ? <rect x={sx(m - s)} width={Math.max(1, sx(m + s) - sx(m - s))} y={8} height={axisY - 8} className="fill-muted" opacity={0.12} /> : null}
      <line x1={padX} x2={width - padX} y1={axisY} y2={axisY} className="stroke-rule" strokeWidth={1} />
      {nominal != null ? (
        <path
          d={`M${sx(nominal) - 4} ${axisY + 9}L${sx(nominal) + 4} ${axisY + 9}L${sx(nominal)} ${axisY + 2}Z`}
          className="fill-none stroke-muted"
          strokeWidth={1.25}
        >
          <title>{`nominal ${formatValue(nominal, format)}`}</title>
        </path>
      ) : null}
      <line x1={mx} x2={mx} y1={8} y2={axisY} className="stroke-ink" strokeWidth={1.25} />
      <text
        x={mx}
        y={6}
        textAnchor={mx < width * 0.25 ? 'start' : mx > width * 0.75 ? 'end' : 'middle'}
        className="fill-ink"
        fontSize={10}
      >
        mean {formatValue(m, format)}
      </text>
      {placed.map((d, i) => (
        <circle key={i} cx={d.px} cy={d.cy} r={r} className="fill-accent stroke-panel" strokeWidth={1}>
          <title>{`${d.label ? `${d.label}: ` : ''}${formatValue(d.v, format)}`}</title>
        </circle>
      ))}
      <text x={padX} y={height - 4} className="fill-muted" fontSize={9} textAnchor="start">
        lowest {formatValue(Math.min(...vs), format)}
      </text>
      <text x={width - padX} y={height - 4} className="fill-muted" fontSize={9} textAnchor="end">
        highest {formatValue(Math.max(...vs), format)}
      </text>
    </svg>
  );
}
