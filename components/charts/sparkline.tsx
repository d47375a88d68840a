'use client';

import { lineColor } from '@/lib/engine/lines';
import { ensureContrast, parseHex, toHex } from './colour';
import { downsampleLttb } from './downsample';
import { ascending, passbandWindow } from './passband';

export interface SparklineProps {
  wavelengthNm: readonly number[];
  /** Fraction 0–1. */
  transmission: readonly number[];
  width?: number;
  height?: number;
  /** Wavelength window (nm). Give every row of a table the same one so their passbands compare; defaults to this curve's passband. */
  xRange?: readonly [number, number];
  /** Top of the scale as a fraction (default 1 = 100 %), so rows share a scale. */
  yMax?: number;
  /** A catalogued line to mark, e.g. the filter's target line (nm). */
  lineNm?: number;
  /** Accessible description; without it the sparkline is decorative (the row already states the numbers). */
  label?: string;
  /** Samples kept after downsampling. */
  points?: number;
  className?: string;
}

/**
 * A passband thumbnail for table rows: plain SVG, about 60 points, no chart library,
 * so a page of fifty rows stays cheap. Drawn in currentColor so it follows the text
 * colour of its cell, and with it the night view.
 */
export function Sparkline({
  wavelengthNm,
  transmission,
  width = 120,
  height = 28,
  xRange,
  yMax = 1,
  lineNm,
  label,
  points = 60,
  className = 'text-accent',
}: SparklineProps) {
  const all = ascending(wavelengthNm, transmission);
  const n = all.x.length;
  const full: [number, number] = n ? [all.x[0], all.x[n - 1]] : [0, 1];
  const [x0, x1] = xRange ?? passbandWindow([all], full) ?? full;

  // Keep one sample beyond each edge so the trace runs to the frame.
  let a = 0;
  while (a < n - 1 && all.x[a + 1] < x0) a++;
  let b = n - 1;
  while (b > 0 && all.x[b - 1] > x1) b--;
  const slice = downsampleLttb(all.x.slice(a, b + 1), all.y.slice(a, b + 1), points);

  const pad = 1.5;
  const sx = (v: number) => pad + ((v - x0) / (x1 - x0 || 1)) * (width - 2 * pad);
  const sy = (v: number) => height - pad - (Math.max(0, Math.min(v, yMax)) / (yMax || 1)) * (height - 2 * pad);
  const trace = slice.x.map((v, i) => `${sx(v).toFixed(1)},${sy(slice.y[i]).toFixed(1)}`).join(' ');
  const base = (height - pad).toFixed(1);
  const area = slice.x.length ? `${sx(slice.x[0]).toFixed(1)},${base} ${trace} ${sx(slice.x[slice.x.length - 1]).toFixed(1)},${base}` : '';
  const markX = lineNm != null && lineNm >= x0 && lineNm <= x1 ? sx(lineNm) : null;
  const hue = lineNm != null ? toHex(ensureContrast(parseHex(lineColor(lineNm)), [255, 255, 252], 3)) : undefined;

  return (
    <svg
      width={width}
      height={height}
      viewBox={`0 0 ${width} ${height}`}
      role={label ? 'img' : undefined}
      aria-label={label}
      aria-hidden={label ? undefined : true}
      className={`inline-block shrink-0 overflow-hidden align-middle ${className}`}
    >
      <line x1={0} x2={width} y1={base} y2={base} className="stroke-rule" strokeWidth={1} />
      {markX != null ? (
        <line
          x1={markX}
          x2={markX}
          y1={0}
          y2={height}
          strokeWidth={1}
          style={{ ['--spark-line' as string]: hue }}
          className="stroke-[var(--spark-line)] [[data-view=night]_&]:stroke-muted"
        />
      ) : null}
      {area ? <polygon points={area} fill="currentColor" opacity={0.14} /> : null}
      {trace ? (
        <polyline points={trace} fill="none" stroke="currentColor" strokeWidth={1.25} strokeLinejoin="round" strokeLinecap="round" />
      ) : null}
    </svg>
  );
}
