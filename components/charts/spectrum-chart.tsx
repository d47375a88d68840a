'use client';

import { useCallback, useEffect, useId, useMemo, type ReactNode } from 'react';
import { ChartCanvas } from './chart-canvas';
import { ChartActions, ChartFrame, ChartLegend, type LegendItem } from './chart-frame';
import { seriesToCsv } from './csv';
import { formatFwhm, formatNm, formatPercent } from './format';
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
import { ascending, passbandStats, passbandWindow, valueAt } from './passband';
import { useChartControls } from './use-chart-controls';
import { useChartTheme, type ChartTheme } from './use-chart-theme';

export interface SpectrumSeries {
  name: string;
  wavelengthNm: readonly number[];
  /** Fraction 0–1. */
  transmission: readonly number[];
  /** 'measured' is drawn solid; 'cone' (cone-averaged) dashed, in the hue of its measured curve. */
  kind?: 'measured' | 'cone';
  /**
   * Palette slot. Defaults: measured curves take the next free slot in order; a cone
   * curve takes the slot of the measured curve listed before it.
   */
  colorIndex?: number;
}

export interface SpectrumLine {
  id: string;
  name: string;
  nm: number;
}

export interface SpectrumChartProps {
  /** Shown above the chart, names the PNG and CSV, and labels the drawing for screen readers. */
  title: string;
  series: readonly SpectrumSeries[];
  /** Catalogued emission lines, drawn as thin vertical markers with their names. */
  lines?: readonly SpectrumLine[];
  /** The maker's nominal passband, shaded. */
  nominal?: { cwlNm: number; fwhmNm: number } | null;
  /** Wavelength window shown first (nm); the reader can zoom out to the whole scan. Defaults to the passband. */
  xRange?: readonly [number, number] | null;
  /** Fixed height in px. Without it the chart keeps its aspect ratio at every width. */
  height?: number;
  /** Width ÷ height from 640 px up (default 16:9); phones get 4:3. */
  aspect?: number;
  /** Text summary beside the chart. Without it a plain description of each curve is written. */
  summary?: ReactNode;
  summaryPlacement?: 'below' | 'side';
  /** Base name of downloaded files; the title when absent. */
  fileName?: string;
  titleAs?: 'h2' | 'h3' | 'h4' | 'p';
  className?: string;
}

interface Prepared {
  key: string;
  name: string;
  kind: 'measured' | 'cone';
  slot: number;
  x: number[];
  /** Percent. */
  y: number[];
}

function prepare(series: readonly SpectrumSeries[]): Prepared[] {
  let next = 0;
  let lastMeasured = -1;
  return series.map((s, i) => {
    const kind = s.kind ?? 'measured';
    const inherits = s.colorIndex == null && kind === 'cone' && lastMeasured >= 0;
    const slot = s.colorIndex ?? (inherits ? lastMeasured : next);
    if (kind === 'measured') lastMeasured = slot;
    if (!inherits) next = Math.max(next, slot + 1);
    const { x, y } = ascending(s.wavelengthNm, s.transmission);
    return { key: String(i), name: s.name, kind, slot, x, y: y.map((t) => t * 100) };
  });
}

/** About seven markers spread over the passband, phase-shifted per curve so overlapping curves do not stack them. */
function markerPoints(p: Prepared, order: number): [number, number][] {
  const stats = passbandStats(p.x, p.y);
  if (!stats || !(stats.peak > 0)) return [];
  const floor = stats.peak * 0.15;
  const inBand: number[] = [];
  for (let i = 0; i < p.x.length; i++) if (p.y[i] >= floor) inBand.push(i);
  if (inBand.length === 0) return [];
  const count = Math.min(7, inBand.length);
  const out: [number, number][] = [];
  const phase = ((order * 0.37) % 1) / count;
  for (let k = 0; k < count; k++) {
    const idx = inBand[Math.min(inBand.length - 1, Math.floor(((k + 0.5) / count + phase) * inBand.length) % inBand.length)];
    out.push([p.x[idx], p.y[idx]]);
  }
  return out;
}

function styleOf(theme: ChartTheme, p: Prepared) {
  const s = theme.series(p.slot);
  return { color: s.color, width: s.width, symbol: s.symbol };
}

function describe(prepared: Prepared[], lines: readonly SpectrumLine[]): ReactNode {
  const measured = prepared.filter((p) => p.kind === 'measured');
  if (measured.length === 0) return null;
  return (
    <ul className="space-y-1">
      {measured.map((p) => {
        const s = passbandStats(p.x, p.y);
        if (!s) return null;
        const atLines = lines
          .map((l) => ({ l, v: valueAt(p.x, p.y, l.nm) }))
          .filter((e) => e.v != null)
          .map((e) => `${e.l.name} ${formatPercent(e.v)}`);
        return (
          <li key={p.key}>
            <span className="text-ink">{p.name}</span>: peak {formatPercent(s.peak)} at {formatNm(s.peakAt)}
            {s.width != null ? `; ${formatFwhm(s.width)} centred on ${formatNm(s.centre)}` : ''}
            {atLines.length ? `; ${atLines.join(', ')}` : ''}.
          </li>
        );
      })}
    </ul>
  );
}

/**
 * Transmission against wavelength: measured curves solid, cone-averaged curves dashed in
 * the same hue, catalogued lines as thin markers, the nominal passband shaded.
 */
export function SpectrumChart({
  title,
  series,
  lines = [],
  nominal = null,
  xRange = null,
  height,
  aspect = 16 / 9,
  summary,
  summaryPlacement,
  fileName,
  titleAs,
  className,
}: SpectrumChartProps) {
  const theme = useChartTheme();
  const summaryId = useId();
  const prepared = useMemo(() => prepare(series), [series]);

  const extent = useMemo<[number, number]>(() => {
    let lo = Infinity;
    let hi = -Infinity;
    for (const p of prepared) {
      if (p.x.length === 0) continue;
      lo = Math.min(lo, p.x[0]);
      hi = Math.max(hi, p.x[p.x.length - 1]);
    }
    if (!Number.isFinite(lo)) return nominal ? [nominal.cwlNm - 10, nominal.cwlNm + 10] : [400, 800];
    return [lo, hi];
  }, [prepared, nominal]);

  const firstWindow = useMemo(() => {
    if (xRange) return [Math.max(extent[0], xRange[0]), Math.min(extent[1], xRange[1])] as const;
    return passbandWindow(
      prepared.filter((p) => p.kind === 'measured'),
      extent,
    );
  }, [xRange, extent, prepared]);

  const legend = useMemo<LegendItem[]>(
    () =>
      prepared.map((p) => {
        const s = styleOf(theme, p);
        return {
          key: p.key,
          name: p.name,
          color: s.color,
          width: s.width,
          symbol: s.symbol,
          dash: p.kind === 'cone' ? theme.coneDash : 'solid',
        };
      }),
    [prepared, theme],
  );

  const csv = useCallback(
    () =>
      seriesToCsv(
        prepared.map((p) => ({ name: p.name, x: p.x, y: p.y })),
        'wavelength (nm)',
        (name) => `${name} transmission (%)`,
      ),
    [prepared],
  );

  const controls = useChartControls({ title, fileName, theme, legend, csv, initialZoom: firstWindow });
  const { hidden, zoomRef, zoomKey } = controls;

  const visibleLines = useMemo(
    () => lines.filter((l) => Number.isFinite(l.nm) && l.nm >= extent[0] && l.nm <= extent[1]),
    [lines, extent],
  );

  const option = useMemo(() => {
    const shown = prepared.filter((p) => !hidden.has(p.key));
    const pointCount = shown.reduce((m, p) => Math.max(m, p.x.length), 0);
    const large = pointCount > LARGE;
    const byId = new Map(shown.map((p) => [p.key, p]));

    const curves = shown.flatMap((p, order) => {
      const s = styleOf(theme, p);
      const cone = p.kind === 'cone';
      const data = p.x.map((x, i) => [x, p.y[i]]);
      const line = {
        type: 'line',
        id: `curve-${p.key}`,
        name: p.name,
        data,
        showSymbol: false,
        symbolSize: 6,
        ...symbolStyle(s.symbol, s.color, theme),
        sampling: large ? 'lttb' : undefined,
        animation: !large,
        lineStyle: { color: s.color, width: s.width, type: cone ? [...theme.coneDash] : 'solid' },
        emphasis: { disabled: true },
        z: cone ? 3 : 4,
      };
      const marks = markerPoints(p, order + (cone ? 0.5 : 0));
      const markers = {
        type: 'scatter',
        id: `marks-${p.key}`,
        name: p.name,
        data: marks,
        symbolSize: 7,
        ...symbolStyle(s.symbol, s.color, theme),
        silent: true,
        tooltip: { show: false },
        animation: false,
        z: 5,
      };
      return marks.length ? [line, markers] : [line];
    });

    const annotations = {
      type: 'line',
      id: 'annotations',
      data: [] as number[][],
      silent: true,
      tooltip: { show: false },
      markLine: visibleLines.length
        ? {
            silent: true,
            symbol: ['none', 'none'],
            animation: false,
            precision: 2,
            data: visibleLines.map((l) => ({
              name: l.name,
              xAxis: l.nm,
              lineStyle: { color: theme.lineMarker(l.nm), width: 1.25, type: 'solid' },
              label: {
                show: true,
                formatter: l.name,
                position: 'insideEndTop',
                color: theme.lineLabel(l.nm),
                fontFamily: theme.fontText,
                fontSize: 10,
                distance: [4, 3],
              },
            })),
          }
        : undefined,
      markArea:
        nominal && Number.isFinite(nominal.cwlNm) && nominal.fwhmNm > 0
          ? {
              silent: true,
              animation: false,
              itemStyle: { color: theme.band.fill, borderColor: theme.band.edge, borderWidth: 1, borderType: 'dashed' },
              label: {
                show: true,
                position: 'insideBottom',
                color: theme.muted,
                fontFamily: theme.fontText,
                fontSize: 10,
                formatter: 'nominal',
              },
              data: [[{ xAxis: nominal.cwlNm - nominal.fwhmNm / 2 }, { xAxis: nominal.cwlNm + nominal.fwhmNm / 2 }]],
            }
          : undefined,
    };

    const formatter = (raw: unknown) => {
      const params = (Array.isArray(raw) ? raw : [raw]) as {
        seriesId?: string;
        axisValue?: number;
        value?: [number, number];
      }[];
      const rows = params.filter((q) => q.seriesId?.startsWith('curve-'));
      const at = params[0]?.axisValue ?? rows[0]?.value?.[0];
      let html = typeof at === 'number' ? tooltipHeader(formatNm(at)) : '';
      for (const r of rows) {
        const p = byId.get(r.seriesId!.slice(6));
        if (!p || !r.value) continue;
        // Each curve's own sample nearest the cursor; interpolation would invent values.
        const label = p.kind === 'cone' ? `${p.name} (cone)` : p.name;
        html += tooltipRow(styleOf(theme, p).color, label, `${formatPercent(r.value[1])} at ${formatNm(r.value[0])}`, p.kind === 'cone');
      }
      if (typeof at === 'number') {
        const span = (zoomRef.current ? zoomRef.current[1] - zoomRef.current[0] : extent[1] - extent[0]) / 60;
        for (const l of visibleLines) {
          if (Math.abs(l.nm - at) <= span) html += tooltipRow(theme.lineMarker(l.nm), l.name, formatNm(l.nm));
        }
      }
      return html;
    };

    return {
      ...baseOption(theme),
      animation: !large,
      grid: gridOption({ top: 14, bottom: 34, right: 14 }),
      xAxis: axisOption(theme, { name: 'Wavelength (nm)', format: 'nm', min: extent[0], max: extent[1] }),
      yAxis: axisOption(theme, { name: 'Transmission (%)', format: 'percent', min: 0, max: 100, vertical: true }),
      tooltip: tooltipOption(theme, 'axis', formatter),
      dataZoom: xZoomOption(theme, 'nm', zoomRef.current, large ? 'filter' : 'none'),
      toolbox: boxZoomToolbox(theme),
      series: [annotations, ...curves],
    };
    // zoomKey: rebuild when the first window changes from outside.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [prepared, hidden, theme, extent, visibleLines, nominal, zoomKey]);

  const { syncBoxZoom } = controls;
  useEffect(() => syncBoxZoom(), [option, syncBoxZoom]);

  const text = summary ?? describe(prepared, visibleLines);
  const label = `${title}: transmission (%) against wavelength (nm), ${prepared.length} curve${prepared.length === 1 ? '' : 's'}`;

  return (
    <ChartFrame
      title={title}
      titleAs={titleAs}
      summary={text}
      summaryId={summaryId}
      summaryPlacement={summaryPlacement}
      className={className}
      legend={<ChartLegend items={controls.legendItems} onToggle={prepared.length > 1 ? controls.toggle : undefined} />}
      actions={
        <ChartActions
          dragZoom={{ active: controls.boxZoom, onToggle: controls.toggleBoxZoom }}
          onResetZoom={controls.resetZoom}
          onPng={controls.downloadPng}
          onCsv={controls.downloadCsv}
        />
      }
    >
      <ChartCanvas
        option={option}
        ready={theme.ready}
        label={label}
        describedBy={text ? summaryId : undefined}
        aspect={aspect}
        height={height}
        onEvents={controls.onEvents}
        chartRef={controls.chartRef}
      />
    </ChartFrame>
  );
}
