'use client';

import { useCallback, useId, useMemo, type ReactNode } from 'react';
import type { LegendItem } from './chart-frame';
import { ControlledChart } from './controlled-chart';
import { rowsToCsv, type CsvCell } from './csv';
import { formatPercent } from './format';
import { axisOption, baseOption, gridOption, tooltipHeader, tooltipOption, tooltipRow } from './options';
import { useChartControls } from './use-chart-controls';
import { useChartTheme } from './use-chart-theme';

export interface BarChartProps {
  title: string;
  /** Category labels along x, e.g. sky lines. */
  categories: readonly string[];
  /** One series per curve; values are fractions 0–1 (drawn as %), null where unknown. */
  series: readonly { name: string; values: readonly (number | null)[] }[];
  yName?: string;
  aspect?: number;
  summary?: ReactNode;
  fileName?: string;
  titleAs?: 'h2' | 'h3' | 'h4' | 'p';
}

/** Grouped bars of a fraction by category (e.g. each sky line's leakage for each curve). Unknown values draw no bar. */
export function BarChart({ title, categories, series, yName = 'Share passed (%)', aspect = 16 / 9, summary, fileName, titleAs = 'h3' }: BarChartProps) {
  const theme = useChartTheme();
  const summaryId = useId();
  const legend = useMemo<LegendItem[]>(
    () => series.map((s, i) => ({ key: String(i), name: s.name, color: theme.series(i).color, dash: 'solid', width: 0, block: 'solid' })),
    [series, theme],
  );
  const csv = useCallback(() => {
    const rows: CsvCell[][] = [['category', ...series.map((s) => `${s.name} (%)`)]];
    categories.forEach((c, j) => rows.push([c, ...series.map((s) => (s.values[j] == null ? null : s.values[j]! * 100))]));
    return rowsToCsv(rows);
  }, [categories, series]);
  const controls = useChartControls({ title, fileName, theme, legend, csv });
  const { hidden } = controls;

  const option = useMemo(() => {
    const formatter = (raw: unknown) => {
      const ps = (Array.isArray(raw) ? raw : [raw]) as { seriesName?: string; color?: string; value?: number | null; name?: string }[];
      if (!ps.length) return '';
      let html = tooltipHeader(ps[0].name ?? '');
      for (const p of ps) html += tooltipRow(p.color ?? theme.text, p.seriesName ?? '', p.value == null ? 'not measured there' : formatPercent(p.value, 2));
      return html;
    };
    return {
      ...baseOption(theme),
      grid: gridOption({ top: 14, right: 14, bottom: 56 }),
      xAxis: { ...axisOption(theme, { name: '', type: 'category', data: [...categories] }), axisLabel: { color: theme.muted, fontSize: 10, rotate: 30, interval: 0 } },
      yAxis: axisOption(theme, { name: yName, format: 'percent', min: 0, vertical: true }),
      tooltip: tooltipOption(theme, 'axis', formatter),
      series: series
        .map((s, i) => ({ s, i }))
        .filter(({ i }) => !hidden.has(String(i)))
        .map(({ s, i }) => ({
          type: 'bar',
          id: `b-${i}`,
          name: s.name,
          data: s.values.map((v) => (v == null ? null : v * 100)),
          itemStyle: { color: theme.series(i).color },
          emphasis: { disabled: true },
        })),
    };
  }, [categories, series, hidden, theme, yName]);

  return (
    <ControlledChart
      title={title}
      titleAs={titleAs}
      summary={summary}
      summaryId={summaryId}
      controls={controls}
      option={option}
      ready={theme.ready}
      label={`${title}: ${yName} by category`}
      aspect={aspect}
      narrowAspect={1}
      legendSeries={series.length}
    />
  );
}
