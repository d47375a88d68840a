'use client';

import { useCallback, useId, useMemo, type ReactNode } from 'react';
import type { LegendItem } from './chart-frame';
import { ControlledChart } from './controlled-chart';
import { columnsToCsv } from './csv';
import { formatDeg, formatPercent } from './format';
import { axisOption, baseOption, gridOption, tooltipHeader, tooltipOption, tooltipRow } from './options';
import { useChartControls } from './use-chart-controls';
import { useChartTheme } from './use-chart-theme';

export interface AngleBin {
  /** Bin centre, degrees of incidence. */
  deg: number;
  /** Share of the light in this bin: a fraction, or any weight when `normalize` is on. */
  weight: number;
}

export interface HistogramSeries {
  name: string;
  bins: readonly AngleBin[];
}

export interface HistogramChartProps {
  title: string;
  /** One or two distributions, e.g. on axis and at the field edge. */
  series: readonly HistogramSeries[];
  /** Scale each series so its bars add up to 100 % (default). Off: weights are taken as fractions already. */
  normalize?: boolean;
  xName?: string;
  yName?: string;
  /** Vertical markers in degrees, e.g. the mean angle. */
  markers?: readonly { deg: number; label: string }[];
  aspect?: number;
  height?: number;
  summary?: ReactNode;
  summaryPlacement?: 'below' | 'side';
  fileName?: string;
  titleAs?: 'h2' | 'h3' | 'h4' | 'p';
  className?: string;
}

/** At most two distributions side by side; more would not read as bars. */
const MAX_HISTOGRAMS = 2;

/** How the light reaching the filter spreads over angles of incidence, as bars. */
export function HistogramChart({
  title,
  series,
  normalize = true,
  xName = 'Angle of incidence (°)',
  yName = 'Share of light (%)',
  markers = [],
  aspect = 16 / 9,
  height,
  summary,
  summaryPlacement,
  fileName,
  titleAs,
  className,
}: HistogramChartProps) {
  const theme = useChartTheme();
  const summaryId = useId();

  const prepared = useMemo(
    () =>
      series.slice(0, MAX_HISTOGRAMS).map((s, i) => {
        const bins = s.bins.filter((b) => Number.isFinite(b.deg) && Number.isFinite(b.weight)).slice().sort((a, b) => a.deg - b.deg);
        const total = bins.reduce((t, b) => t + b.weight, 0);
        const k = normalize && total > 0 ? 100 / total : 100;
        return { key: String(i), name: s.name, deg: bins.map((b) => b.deg), pct: bins.map((b) => b.weight * k) };
      }),
    [series, normalize],
  );

  const binWidth = useMemo(() => {
    let w = Infinity;
    for (const p of prepared) for (let i = 1; i < p.deg.length; i++) w = Math.min(w, p.deg[i] - p.deg[i - 1]);
    return Number.isFinite(w) && w > 0 ? w : 1;
  }, [prepared]);

  const legend = useMemo<LegendItem[]>(
    () =>
      prepared.map((p, i) => ({
        key: p.key,
        name: p.name,
        color: theme.series(i).color,
        dash: 'solid',
        width: 0,
        // The second distribution is hatched, so the two differ without colour.
        block: i === 0 ? 'solid' : 'hatched',
      })),
    [prepared, theme],
  );

  const csv = useCallback(() => {
    const degs = [...new Set(prepared.flatMap((p) => p.deg))].sort((a, b) => a - b);
    return columnsToCsv([
      { header: 'angle of incidence (deg)', values: degs },
      ...prepared.map((p) => {
        const at = new Map(p.deg.map((d, i) => [d, p.pct[i]]));
        return { header: `${p.name} share of light (%)`, values: degs.map((d) => at.get(d) ?? null) };
      }),
    ]);
  }, [prepared]);

  const controls = useChartControls({ title, fileName, theme, legend, csv });
  const { hidden } = controls;

  const option = useMemo(() => {
    const shown = prepared.filter((p) => !hidden.has(p.key));
    const byName = new Map(prepared.map((p, i) => [p.key, { p, colour: theme.series(i).color }]));
    const degs = prepared.flatMap((p) => p.deg);
    const maxDeg = degs.length ? Math.max(...degs) : 1;
    const minDeg = degs.length ? Math.min(...degs) : 0;
    const bars = shown.map((p) => {
      const i = Number(p.key);
      const colour = theme.series(i).color;
      return {
        type: 'bar',
        id: `h-${p.key}`,
        name: p.name,
        data: p.deg.map((d, j) => [d, p.pct[j]]),
        barGap: '0%',
        barCategoryGap: '12%',
        itemStyle:
          i === 0
            ? { color: colour }
            : {
                color: colour,
                opacity: 0.9,
                decal: { symbol: 'rect', dashArrayX: [1, 0], dashArrayY: [2, 3], rotation: Math.PI / 4, color: theme.panel },
              },
        emphasis: { disabled: true },
      };
    });

    const annotations = {
      type: 'line',
      id: 'annotations',
      data: [] as number[][],
      silent: true,
      tooltip: { show: false },
      markLine: markers.length
        ? {
            silent: true,
            symbol: ['none', 'none'],
            animation: false,
            data: markers.map((m) => ({
              name: m.label,
              xAxis: m.deg,
              lineStyle: { color: theme.accent, width: 1.25, type: [4, 3] },
              label: {
                show: true,
                formatter: m.label,
                position: 'insideEndTop',
                color: theme.accent,
                fontSize: 10,
                fontFamily: theme.fontText,
                backgroundColor: theme.panel,
                padding: [2, 1],
                borderRadius: 2,
              },
            })),
          }
        : undefined,
    };

    const formatter = (raw: unknown) => {
      const params = (Array.isArray(raw) ? raw : [raw]) as { seriesId?: string; value?: [number, number] }[];
      const rows = params.filter((q) => q.seriesId?.startsWith('h-') && q.value);
      const at = rows[0]?.value?.[0];
      if (at == null) return '';
      const half = binWidth / 2;
      let html = tooltipHeader(`${formatDeg(at - half)} – ${formatDeg(at + half)}`);
      for (const r of rows) {
        const e = byName.get(r.seriesId!.slice(2));
        if (e) html += tooltipRow(e.colour, e.p.name, formatPercent(r.value![1]));
      }
      return html;
    };

    return {
      ...baseOption(theme),
      grid: gridOption({ top: 14, right: 14 }),
      xAxis: axisOption(theme, { name: xName, format: 'deg', min: minDeg - binWidth / 2, max: maxDeg + binWidth / 2 }),
      yAxis: axisOption(theme, { name: yName, format: 'percent', min: 0, vertical: true }),
      tooltip: { ...tooltipOption(theme, 'axis', formatter), axisPointer: { type: 'line', lineStyle: { color: theme.muted, type: 'dashed', width: 1 } } },
      series: [annotations, ...bars],
    };
  }, [prepared, hidden, theme, markers, binWidth, xName, yName]);

  return (
    <ControlledChart
      title={title}
      titleAs={titleAs}
      summary={summary}
      summaryId={summaryId}
      summaryPlacement={summaryPlacement}
      className={className}
      controls={controls}
      option={option}
      ready={theme.ready}
      label={`${title}: ${yName} against ${xName}`}
      aspect={aspect}
      height={height}
      legendSeries={prepared.length}
    />
  );
}
