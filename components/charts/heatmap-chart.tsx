'use client';

import { useCallback, useId, useMemo, type ReactNode } from 'react';
import { ControlledChart } from './controlled-chart';
import { rowsToCsv, type CsvCell } from './csv';
import { formatPercent, formatValue, type ValueFormat } from './format';
import { axisOption, baseOption, tooltipHeader, tooltipOption, tooltipRow } from './options';
import { useChartControls } from './use-chart-controls';
import { useChartTheme } from './use-chart-theme';

export interface HeatmapPoint {
  /** Shown beside the point, e.g. the curve's label. */
  name: string;
  x: number;
  y: number;
  /** The point's own value (fraction 0–1), for its tooltip. */
  value?: number;
}

export interface HeatmapChartProps {
  title: string;
  /** Column centres, evenly spaced, ascending (e.g. passband FWHM, nm). */
  x: readonly number[];
  /** Row centres, evenly spaced, ascending (e.g. pre-shift, nm). */
  y: readonly number[];
  /** values[row][column], fractions 0–1, drawn as %. */
  values: readonly (readonly number[])[];
  xName?: string;
  yName?: string;
  /** What a cell's value is, e.g. "Line throughput". */
  valueName?: string;
  xFormat?: ValueFormat;
  yFormat?: ValueFormat;
  /** Named points drawn over the map (chosen curves). */
  points?: readonly HeatmapPoint[];
  /** Fractions the colour ramp spans; defaults to the data's range, rounded out to 5 %. */
  range?: readonly [number, number];
  aspect?: number;
  height?: number;
  summary?: ReactNode;
  summaryPlacement?: 'below' | 'side';
  fileName?: string;
  titleAs?: 'h2' | 'h3' | 'h4' | 'p';
  className?: string;
}

// Both grids must sit on exactly the same rectangle, so margins are fixed rather than fitted to labels.
const GRID = { left: 64, right: 16, top: 12, bottom: 78 };

function step(v: readonly number[]): number {
  return v.length > 1 ? (v[v.length - 1] - v[0]) / (v.length - 1) : 1;
}

/**
 * A value over two parameters (throughput over FWHM × pre-shift) with named points on
 * top. Cells are drawn on a hidden category grid; a value grid on the same rectangle
 * carries the visible axes and places the points at their true coordinates.
 */
export function HeatmapChart({
  title,
  x,
  y,
  values,
  xName = 'Passband FWHM (nm)',
  yName = 'Pre-shift (nm)',
  valueName = 'Line throughput',
  xFormat = 'nm',
  yFormat = 'nm-signed',
  points = [],
  range,
  aspect = 4 / 3,
  height,
  summary,
  summaryPlacement,
  fileName,
  titleAs,
  className,
}: HeatmapChartProps) {
  const theme = useChartTheme();
  const summaryId = useId();

  const [lo, hi] = useMemo<[number, number]>(() => {
    if (range) return [range[0] * 100, range[1] * 100];
    let a = Infinity;
    let b = -Infinity;
    for (const row of values) for (const v of row) if (Number.isFinite(v)) ((a = Math.min(a, v)), (b = Math.max(b, v)));
    if (!Number.isFinite(a)) return [0, 100];
    const low = Math.floor((a * 100) / 5) * 5;
    const high = Math.ceil((b * 100) / 5) * 5;
    return [low, high > low ? high : low + 5];
  }, [values, range]);

  const csv = useCallback(() => {
    const rows: CsvCell[][] = [[xName, yName, `${valueName} (%)`]];
    y.forEach((yv, r) => x.forEach((xv, c) => rows.push([xv, yv, Number.isFinite(values[r]?.[c]) ? values[r][c] * 100 : null])));
    return rowsToCsv(rows);
  }, [x, y, values, xName, yName, valueName]);

  const controls = useChartControls({ title, fileName, theme, legend: [], csv });

  const option = useMemo(() => {
    const dx = step(x);
    const dy = step(y);
    const cells: [number, number, number][] = [];
    y.forEach((_, r) =>
      x.forEach((_, c) => {
        const v = values[r]?.[c];
        if (Number.isFinite(v)) cells.push([c, r, v * 100]);
      }),
    );
    const grid = { ...GRID, outerBoundsMode: 'none' as const };
    const hiddenAxis = (n: number) => ({
      type: 'category' as const,
      gridIndex: 0,
      show: false,
      data: Array.from({ length: n }, (_, i) => i),
    });

    const xShort = xName.replace(/\s*\(.*\)\s*$/, '');
    const yShort = yName.replace(/\s*\(.*\)\s*$/, '');
    const formatter = (raw: unknown) => {
      const p = raw as { seriesId?: string; value?: number[]; name?: string; dataIndex?: number };
      if (!p.value) return '';
      if (p.seriesId === 'cells') {
        const [c, r, v] = p.value;
        return (
          tooltipHeader(`${xShort} ${formatValue(x[c], xFormat)} · ${yShort} ${formatValue(y[r], yFormat)}`) +
          tooltipRow(theme.accent, valueName, formatPercent(v))
        );
      }
      const pt = points[p.dataIndex ?? -1];
      if (!pt) return '';
      return (
        tooltipHeader(pt.name) +
        tooltipRow(theme.text, xShort, formatValue(pt.x, xFormat)) +
        tooltipRow(theme.text, yShort, formatValue(pt.y, yFormat)) +
        (pt.value != null ? tooltipRow(theme.accent, valueName, formatPercent(pt.value * 100)) : '')
      );
    };

    return {
      ...baseOption(theme),
      grid: [grid, grid],
      xAxis: [
        hiddenAxis(x.length),
        {
          ...axisOption(theme, { name: xName, format: xFormat, min: x[0] - dx / 2, max: x[x.length - 1] + dx / 2, gridIndex: 1, splitLine: false, nameGap: 24, endLabels: false }),
          z: 10,
        },
      ],
      yAxis: [
        { ...hiddenAxis(y.length), gridIndex: 0 },
        {
          ...axisOption(theme, { name: yName, format: yFormat, min: y[0] - dy / 2, max: y[y.length - 1] + dy / 2, gridIndex: 1, splitLine: false, vertical: true, nameGap: 44, endLabels: false }),
          z: 10,
        },
      ],
      visualMap: {
        type: 'continuous',
        seriesIndex: 0,
        dimension: 2,
        min: lo,
        max: hi,
        calculable: false,
        orient: 'horizontal',
        left: 'center',
        bottom: 4,
        itemWidth: 10,
        itemHeight: 120,
        text: [`${hi} %`, `${valueName}  ${lo} %`],
        textGap: 6,
        formatter: (v: number) => formatPercent(v, 0),
        textStyle: { color: theme.muted, fontFamily: theme.fontFigures, fontSize: 10 },
        inRange: { color: [...theme.heatRamp] },
        // The ramp ends at the night accent, never at white.
        outOfRange: { color: [theme.panel] },
      },
      tooltip: tooltipOption(theme, 'item', formatter),
      series: [
        {
          type: 'heatmap',
          id: 'cells',
          xAxisIndex: 0,
          yAxisIndex: 0,
          data: cells,
          progressive: 0,
          itemStyle: { borderWidth: 0 },
          emphasis: { itemStyle: { borderColor: theme.text, borderWidth: 1 } },
        },
        {
          type: 'scatter',
          id: 'points',
          xAxisIndex: 1,
          yAxisIndex: 1,
          data: points.map((p) => ({ name: p.name, value: [p.x, p.y] })),
          symbol: 'circle',
          symbolSize: 9,
          itemStyle: { color: theme.point.fill, borderColor: theme.point.edge, borderWidth: 1.75 },
          label: {
            show: true,
            position: 'right',
            distance: 6,
            formatter: (p: { name: string }) => p.name,
            color: theme.text,
            fontFamily: theme.fontText,
            fontSize: 10,
            backgroundColor: theme.panel,
            borderRadius: 3,
            padding: [1, 4],
            opacity: 0.92,
          },
          emphasis: { scale: 1.3 },
          z: 20,
        },
      ],
    };
  }, [x, y, values, points, theme, lo, hi, xName, yName, valueName, xFormat, yFormat]);

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
      label={`${title}: ${valueName} (%) by ${xName} and ${yName}`}
      aspect={aspect}
      narrowAspect={1}
      height={height}
    />
  );
}
