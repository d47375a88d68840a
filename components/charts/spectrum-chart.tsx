'use client';

import { useCallback, useId, useMemo, type ReactNode } from 'react';
import type { LegendItem } from './chart-frame';
import { ControlledChart } from './controlled-chart';
import { seriesToCsv } from './csv';
import { formatFwhm, formatNm, formatPercent } from './format';
import {
  LARGE,
  axisOption,
  baseOption,
  boxZoomToolbox,
  dashType,
  gridOption,
  symbolStyle,
  tooltipHeader,
  tooltipOption,
  tooltipRow,
  xZoomOption,
} from './options';
import { ascending, passbandStats, passbandWindow, valueAt } from './passband';
import { useAfterOption, useChartControls } from './use-chart-controls';
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

/** Index of the sample nearest `at` in an ascending array, or -1 when empty. */
function nearestIndex(x: readonly number[], at: number): number {
  if (x.length === 0) return -1;
  let lo = 0;
  let hi = x.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= at) lo = mid;
    else hi = mid;
  }
  return Math.abs(x[lo] - at) <= Math.abs(x[hi] - at) ? lo : hi;
}

/** A number and its unit never break across lines. */
function Num({ children }: { children: ReactNode }) {
  return <span className="whitespace-nowrap">{children}</span>;
}

function describe(prepared: Prepared[], lines: readonly SpectrumLine[]): ReactNode {
  const measured = prepared.filter((p) => p.kind === 'measured');
  if (measured.length === 0) return null;
  return (
    <ul className="space-y-1">
      {measured.map((p) => {
        const s = passbandStats(p.x, p.y);
        if (!s) return null;
        // Lines near the passband (those it passes or must block); far ones would only list zeros.
        const reach = s.width != null && s.centre != null ? 2 * s.width + 2 : Infinity;
        const atLines = lines
          .map((l) => ({ l, v: valueAt(p.x, p.y, l.nm) }))
          .filter((e) => e.v != null && (Math.abs(e.l.nm - (s.centre ?? s.peakAt)) <= reach || e.v >= 1));
        return (
          <li key={p.key}>
            <span className="text-ink">{p.name}</span>: peak <Num>{formatPercent(s.peak)}</Num> at <Num>{formatNm(s.peakAt)}</Num>
            {s.width != null ? (
              <>
                ; <Num>{formatFwhm(s.width)}</Num> centred on <Num>{formatNm(s.centre)}</Num>
              </>
            ) : null}
            {atLines.map((e, i) => (
              <span key={e.l.id}>
                {i === 0 ? '; ' : ', '}
                <Num>{`${e.l.name} ${formatPercent(e.v)}`}</Num>
              </span>
            ))}
            .
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

  // At night hue cannot separate curves, so when no cone curve claims the dash it tells measured curves apart.
  const identityDash = theme.view === 'night' && !prepared.some((p) => p.kind === 'cone');

  const legend = useMemo<LegendItem[]>(
    () =>
      prepared.map((p) => {
        const s = styleOf(theme, p);
        return {
          key: p.key,
          name: p.name,
          color: s.color,
          width: s.width,
          symbol: new Set(prepared.map((q) => q.slot)).size > 1 ? s.symbol : undefined,
          dash: p.kind === 'cone' ? theme.coneDash : identityDash ? theme.series(p.slot).dash : 'solid',
        };
      }),
    [prepared, theme, identityDash],
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
  const { hidden } = controls;

  const visibleLines = useMemo(
    () => lines.filter((l) => Number.isFinite(l.nm) && l.nm >= extent[0] && l.nm <= extent[1]),
    [lines, extent],
  );

  const option = useMemo(() => {
    const shown = prepared.filter((p) => !hidden.has(p.key));
    const pointCount = shown.reduce((m, p) => Math.max(m, p.x.length), 0);
    const large = pointCount > LARGE;
    // Markers only matter when hues must be told apart; one curve and its cone differ by dash alone.
    const slots = new Set(prepared.map((p) => p.slot)).size;

    const curves = shown.flatMap((p, order) => {
      const s = styleOf(theme, p);
      const cone = p.kind === 'cone';
      const dash = cone ? [...theme.coneDash] : identityDash ? dashType(theme.series(p.slot).dash) : 'solid';
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
        lineStyle: { color: s.color, width: s.width, type: dash },
        emphasis: { disabled: true },
        z: cone ? 3 : 4,
      };
      const marks = slots > 1 ? markerPoints(p, order + (cone ? 0.5 : 0)) : [];
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
              lineStyle: { color: theme.lineMarker(l.nm), width: 1, type: 'solid' },
              // Names run up from the foot of the marker: the passband's top, where readers look, stays clear.
              label: {
                show: true,
                formatter: l.name,
                position: 'insideStartTop',
                color: theme.lineLabel(l.nm),
                fontFamily: theme.fontText,
                fontSize: 10,
                distance: [4, 3],
                backgroundColor: theme.panel,
                padding: [2, 1],
                borderRadius: 2,
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
                position: 'top',
                distance: 3,
                color: theme.muted,
                fontFamily: theme.fontText,
                fontSize: 10,
                formatter: 'nominal',
              },
              data: [[{ xAxis: nominal.cwlNm - nominal.fwhmNm / 2 }, { xAxis: nominal.cwlNm + nominal.fwhmNm / 2 }]],
            }
          : undefined,
    };

    // Every shown curve's own sample nearest the cursor. ECharts' axis tooltip lists only the curves
    // sampled at the snapped wavelength, which would drop curves measured on another grid.
    const formatter = (raw: unknown) => {
      const params = (Array.isArray(raw) ? raw : [raw]) as { axisValue?: number; value?: [number, number] }[];
      const at = params[0]?.axisValue ?? params[0]?.value?.[0];
      if (typeof at !== 'number') return '';
      let html = tooltipHeader(formatNm(at));
      for (const p of shown) {
        const i = nearestIndex(p.x, at);
        if (i < 0 || Math.abs(p.x[i] - at) > (extent[1] - extent[0]) / 50) continue;
        const label = p.kind === 'cone' ? `${p.name} (cone)` : p.name;
        const where = Math.abs(p.x[i] - at) >= 0.005 ? ` at ${formatNm(p.x[i])}` : '';
        html += tooltipRow(styleOf(theme, p).color, label, `${formatPercent(p.y[i])}${where}`, p.kind === 'cone');
      }
      // Lines within a few pixels' worth of the cursor at the whole scan's scale.
      const span = Math.min(1, Math.max(0.15, (extent[1] - extent[0]) / 150));
      for (const l of visibleLines) {
        if (Math.abs(l.nm - at) <= span) html += tooltipRow(theme.lineMarker(l.nm), l.name, formatNm(l.nm));
      }
      return html;
    };

    return {
      ...baseOption(theme),
      animation: !large,
      grid: gridOption({ top: nominal ? 20 : 12, bottom: 34, right: 14 }),
      xAxis: axisOption(theme, { name: 'Wavelength (nm)', format: 'nm', min: extent[0], max: extent[1], endLabels: false }),
      yAxis: axisOption(theme, { name: 'Transmission (%)', format: 'percent', min: 0, max: 100, vertical: true }),
      tooltip: tooltipOption(theme, 'axis', formatter),
      dataZoom: xZoomOption(theme, 'nm', firstWindow, large ? 'filter' : 'none'),
      toolbox: boxZoomToolbox(theme),
      series: [annotations, ...curves],
    };
  }, [prepared, hidden, theme, identityDash, extent, visibleLines, nominal, firstWindow]);

  useAfterOption(controls.afterOption, option);

  const text = summary ?? describe(prepared, visibleLines);
  const label = `${title}: transmission (%) against wavelength (nm), ${prepared.length} curve${prepared.length === 1 ? '' : 's'}`;

  return (
    <ControlledChart
      title={title}
      titleAs={titleAs}
      summary={text}
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
      zoom
    />
  );
}
