'use client';

import { useCallback, useId, useMemo, type ReactNode } from 'react';
import type { LegendItem } from './chart-frame';
import { ControlledChart } from './controlled-chart';
import { seriesToCsv } from './csv';
import { finitePairs } from './downsample';
import { formatValue, type ValueFormat } from './format';
import { markerLabelPositions } from './marker-labels';
import {
  LARGE,
  axisOption,
  baseOption,
  boxZoomToolbox,
  gridOption,
  symbolStyle,
  tooltipHeader,
  tooltipOption,
  tooltipRow,
  xZoomOption,
} from './options';
import { useAfterOption, useChartControls } from './use-chart-controls';
import { useChartTheme, type ChartTheme } from './use-chart-theme';

export interface XYSeries {
  name: string;
  x: readonly number[];
  y: readonly number[];
  /** 'line' (default) joins the points; 'scatter' draws them alone (e.g. measured points under a fitted curve). */
  type?: 'line' | 'scatter';
  /** Dashed line, e.g. a fitted or modelled curve beside measured points. */
  dashed?: boolean;
  /** Palette slot; defaults to the series' position. Give a fit the slot of its points to share their hue. */
  colorIndex?: number;
  /** One label per point (e.g. a unit's serial), shown in the tooltip. */
  pointLabels?: readonly string[];
}

export interface XYMarker {
  value: number;
  /** Text on the marker, e.g. "your optic f/2.5" or "best pre-shift +0.62 nm". */
  label: string;
  /** 'x' (default) draws a vertical marker at an x value; 'y' a horizontal one. */
  axis?: 'x' | 'y';
  /** Draws in the accent colour: the reader's own setting or the answer. */
  emphasis?: boolean;
}

export interface XYChartProps {
  title: string;
  series: readonly XYSeries[];
  /** Axis names with their units, e.g. "Focal ratio (f/)", "Line throughput (%)". */
  xName: string;
  yName: string;
  /** How numbers print on the axis and in the tooltip. */
  xFormat?: ValueFormat;
  yFormat?: ValueFormat;
  /** y values are fractions 0–1, drawn and printed as 0–100 %. */
  yAsPercent?: boolean;
  markers?: readonly XYMarker[];
  xMin?: number;
  xMax?: number;
  yMin?: number;
  yMax?: number;
  /** Adds the zoom slider and zoom buttons (for long series). */
  zoom?: boolean;
  aspect?: number;
  height?: number;
  summary?: ReactNode;
  summaryPlacement?: 'below' | 'side';
  fileName?: string;
  titleAs?: 'h2' | 'h3' | 'h4' | 'p';
  className?: string;
}

interface Prepared {
  key: string;
  name: string;
  type: 'line' | 'scatter';
  dashed: boolean;
  slot: number;
  x: number[];
  y: number[];
  labels?: readonly string[];
}

/** Lines with few points show every point; longer ones get about eight evenly spaced markers. */
const ALL_SYMBOLS_UP_TO = 24;

function styleOf(theme: ChartTheme, p: Prepared, identityDash: boolean) {
  const s = theme.series(p.slot);
  const dash: 'solid' | number[] = p.dashed ? [...theme.coneDash] : identityDash && s.dash !== 'solid' ? [...s.dash] : 'solid';
  return { color: s.color, width: s.width, symbol: s.symbol, dash };
}

/** Numbers against numbers: lines, scatter points, fitted curves and labelled markers. */
export function XYChart({
  title,
  series,
  xName,
  yName,
  xFormat = 'number',
  yFormat,
  yAsPercent = false,
  markers = [],
  xMin,
  xMax,
  yMin,
  yMax,
  zoom = false,
  aspect = 16 / 9,
  height,
  summary,
  summaryPlacement,
  fileName,
  titleAs,
  className,
}: XYChartProps) {
  const theme = useChartTheme();
  const summaryId = useId();
  const yFmt: ValueFormat = yFormat ?? (yAsPercent ? 'percent' : 'number');

  const prepared = useMemo<Prepared[]>(
    () =>
      series.map((s, i) => {
        const f = finitePairs(s.x, s.y);
        return {
          key: String(i),
          name: s.name,
          type: s.type ?? 'line',
          dashed: !!s.dashed,
          slot: s.colorIndex ?? i,
          x: f.x,
          y: yAsPercent ? f.y.map((v) => v * 100) : f.y,
          labels: s.pointLabels,
        };
      }),
    [series, yAsPercent],
  );

  // Dash carries meaning when the caller uses it (a fit); otherwise, at night, it tells series apart.
  const identityDash = theme.view === 'night' && !prepared.some((p) => p.dashed);
  // Markers tell solid lines apart without colour; a lone line, or a dashed fit, needs none.
  const markersFor = (p: Prepared) => p.type === 'scatter' || (prepared.length > 1 && !p.dashed);

  const legend = useMemo<LegendItem[]>(
    () =>
      prepared.map((p) => {
        const s = styleOf(theme, p, identityDash);
        return {
          key: p.key,
          name: p.name,
          color: s.color,
          width: p.type === 'scatter' ? 0 : s.width,
          dash: s.dash === 'solid' ? 'solid' : s.dash,
          symbol: markersFor(p) ? s.symbol : undefined,
        };
      }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [prepared, theme, identityDash],
  );

  const csv = useCallback(
    () => seriesToCsv(prepared.map((p) => ({ name: p.name, x: p.x, y: p.y })), xName, (name) => `${name}: ${yName}`),
    [prepared, xName, yName],
  );

  const controls = useChartControls({ title, fileName, theme, legend, csv });
  const { hidden } = controls;

  const option = useMemo(() => {
    const shown = prepared.filter((p) => !hidden.has(p.key));
    const large = shown.some((p) => p.x.length > LARGE);
    const byKey = new Map(shown.map((p) => [p.key, p]));
    const anyLine = shown.some((p) => p.type === 'line');

    const drawn = shown.flatMap<Record<string, unknown>>((p) => {
      const s = styleOf(theme, p, identityDash);
      const data = p.x.map((x, i) => [x, p.y[i]]);
      const sym = symbolStyle(s.symbol, s.color, theme);
      if (p.type === 'scatter') {
        return [{ type: 'scatter', id: `s-${p.key}`, name: p.name, data, symbolSize: 8, ...sym, large, z: 5, emphasis: { scale: 1.4 } }];
      }
      const few = markersFor(p) && p.x.length <= ALL_SYMBOLS_UP_TO;
      const line = {
        type: 'line',
        id: `s-${p.key}`,
        name: p.name,
        data,
        showSymbol: few,
        symbolSize: 6,
        ...sym,
        sampling: large ? 'lttb' : undefined,
        lineStyle: { color: s.color, width: s.width, type: s.dash },
        emphasis: { disabled: true },
        z: 4,
      };
      if (few || !markersFor(p) || p.x.length < 2) return [line];
      const step = (p.x.length - 1) / 8;
      const offset = (Number(p.key) * 0.29) % 1;
      const marks = Array.from({ length: 8 }, (_, k) => data[Math.min(p.x.length - 1, Math.round((k + offset) * step))]);
      return [line, { type: 'scatter', id: `m-${p.key}`, name: p.name, data: marks, symbolSize: 6, ...sym, silent: true, tooltip: { show: false }, z: 5 }];
    });

    const shownMarkers = markers.filter((m) => Number.isFinite(m.value));
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of [...shown.flatMap((p) => p.x), ...shownMarkers.filter((m) => m.axis !== 'y').map((m) => m.value)]) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    const xSpan = (xMax ?? hi) - (xMin ?? lo);
    const vertical = shownMarkers.filter((m) => m.axis !== 'y');
    const positions = markerLabelPositions(vertical.map((m) => m.value), Number.isFinite(xSpan) ? xSpan : 0);
    const markLineData = shownMarkers
      .map((m) => {
        const position = m.axis === 'y' ? 'insideEndTop' : positions[vertical.indexOf(m)];
        const colour = m.emphasis ? theme.accent : theme.muted;
        return {
          name: m.label,
          ...(m.axis === 'y' ? { yAxis: yAsPercent ? m.value * 100 : m.value } : { xAxis: m.value }),
          lineStyle: { color: colour, width: m.emphasis ? 1.5 : 1, type: m.emphasis ? 'solid' : [4, 3] },
          label: {
            show: true,
            formatter: m.label,
            position,
            color: colour,
            fontFamily: theme.fontText,
            fontSize: 10,
            fontWeight: m.emphasis ? 600 : 400,
            // A panel-coloured backing keeps the name legible where it crosses a curve.
            backgroundColor: theme.panel,
            padding: [2, 1],
            borderRadius: 2,
          },
        };
      });

    const annotations = {
      type: 'line',
      id: 'annotations',
      data: [] as number[][],
      silent: true,
      tooltip: { show: false },
      markLine: markLineData.length ? { silent: true, symbol: ['none', 'none'], animation: false, data: markLineData } : undefined,
    };

    const rowFor = (seriesId: string | undefined, value: [number, number] | undefined, dataIndex: number | undefined) => {
      const p = seriesId ? byKey.get(seriesId.slice(2)) : undefined;
      if (!p || !value) return '';
      const s = styleOf(theme, p, identityDash);
      const label = dataIndex != null && p.labels?.[dataIndex] ? `${p.name} · ${p.labels[dataIndex]}` : p.name;
      return tooltipRow(s.color, label, formatValue(value[1], yFmt), s.dash !== 'solid');
    };

    const formatter = (raw: unknown) => {
      const params = (Array.isArray(raw) ? raw : [raw]) as {
        seriesId?: string;
        axisValue?: number;
        value?: [number, number];
        dataIndex?: number;
      }[];
      const rows = params.filter((q) => q.seriesId?.startsWith('s-'));
      const at = anyLine ? (params[0]?.axisValue ?? rows[0]?.value?.[0]) : rows[0]?.value?.[0];
      const head = typeof at === 'number' ? tooltipHeader(`${xName.replace(/\s*\(.*\)\s*$/, '')} ${formatValue(at, xFormat)}`) : '';
      return head + rows.map((r) => rowFor(r.seriesId, r.value, r.dataIndex)).join('');
    };

    return {
      ...baseOption(theme),
      animation: !large,
      grid: gridOption({ top: 14, bottom: zoom ? 34 : 8, right: 14 }),
      xAxis: axisOption(theme, { name: xName, format: xFormat, min: xMin, max: xMax }),
      yAxis: axisOption(theme, {
        name: yName,
        format: yFmt,
        min: yMin ?? (yAsPercent ? 0 : undefined),
        max: yMax ?? (yAsPercent ? 100 : undefined),
        vertical: true,
      }),
      tooltip: tooltipOption(theme, anyLine ? 'axis' : 'item', formatter),
      dataZoom: zoom ? xZoomOption(theme, xFormat, null, large ? 'filter' : 'none') : undefined,
      toolbox: zoom ? boxZoomToolbox(theme) : undefined,
      series: [annotations, ...drawn],
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [prepared, hidden, theme, identityDash, markers, yAsPercent, yFmt, xFormat, xName, yName, xMin, xMax, yMin, yMax, zoom]);

  useAfterOption(controls.afterOption, option);

  const label = `${title}: ${yName} against ${xName}`;
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
      label={label}
      aspect={aspect}
      height={height}
      legendSeries={prepared.length}
      zoom={zoom}
    />
  );
}
