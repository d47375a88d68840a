/**
 * Option fragments every ECharts chart of the kit shares, so axes, tooltips and zoom
 * controls look the same everywhere and follow the night view.
 */

import { formatTick, type ValueFormat } from './format';
import type { ChartTheme } from './use-chart-theme';
import type { ZoomWindow } from './use-chart-controls';
import type { Dash, SymbolShape } from './colour';

/** User-typed names go into tooltip HTML; they must never become markup. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);
}

export function dashType(dash: Dash): 'solid' | number[] {
  return dash === 'solid' ? 'solid' : [...dash];
}

/** Points above this count switch off animation and hover effects, which cost more than they give. */
export const LARGE = 2000;

export function baseOption(theme: ChartTheme) {
  return {
    backgroundColor: theme.background,
    animation: true,
    animationDuration: 300,
    textStyle: { fontFamily: theme.fontText, color: theme.text },
  };
}

export function gridOption(opts: { top?: number; bottom?: number; left?: number; right?: number } = {}) {
  return {
    top: opts.top ?? 12,
    left: opts.left ?? 8,
    right: opts.right ?? 16,
    bottom: opts.bottom ?? 8,
    // Axis labels and names stay inside the canvas at any width.
    outerBoundsMode: 'same' as const,
    outerBoundsContain: 'all' as const,
  };
}

interface AxisArgs {
  name: string;
  format?: ValueFormat;
  min?: number | 'dataMin';
  max?: number | 'dataMax';
  type?: 'value' | 'category';
  data?: (string | number)[];
  gridIndex?: number;
  show?: boolean;
  splitLine?: boolean;
  /** Vertical axis names are rotated along the axis. */
  vertical?: boolean;
  nameGap?: number;
  /** Print the labels at the axis ends (off where the ends are half-cell edges, not data). */
  endLabels?: boolean;
}

export function axisOption(theme: ChartTheme, a: AxisArgs) {
  const fmt = a.format ?? 'number';
  return {
    type: a.type ?? 'value',
    data: a.data,
    gridIndex: a.gridIndex ?? 0,
    show: a.show ?? true,
    name: a.name,
    nameLocation: 'middle' as const,
    nameGap: a.nameGap ?? (a.vertical ? 36 : 26),
    nameTextStyle: { color: theme.muted, fontFamily: theme.fontText, fontSize: 11 },
    min: a.min,
    max: a.max,
    // Without explicit limits, fit the data rather than always reaching zero (a CWL axis at 0 nm hides everything).
    scale: a.min == null && a.max == null,
    axisLine: { show: true, onZero: false, lineStyle: { color: theme.axis, width: 1 } },
    axisTick: { show: true, lineStyle: { color: theme.axis } },
    axisLabel: {
      color: theme.muted,
      fontFamily: theme.fontFigures,
      fontSize: 10,
      hideOverlap: true,
      showMinLabel: a.endLabels,
      showMaxLabel: a.endLabels,
      formatter: a.type === 'category' ? undefined : (v: number) => formatTick(v, fmt),
    },
    splitLine: { show: a.splitLine ?? true, lineStyle: { color: theme.grid, width: 1 } },
    axisPointer: {
      label: {
        backgroundColor: theme.panel,
        borderColor: theme.rule,
        borderWidth: 1,
        color: theme.text,
        fontFamily: theme.fontFigures,
        fontSize: 10,
        padding: [3, 5],
        formatter: (p: { value: number | string }) => (typeof p.value === 'number' ? formatTick(p.value, fmt) : String(p.value)),
      },
    },
  };
}

export function tooltipOption(theme: ChartTheme, trigger: 'axis' | 'item', formatter: (params: unknown) => string) {
  return {
    trigger,
    confine: true,
    backgroundColor: theme.panel,
    borderColor: theme.rule,
    borderWidth: 1,
    padding: [6, 9],
    textStyle: { color: theme.text, fontFamily: theme.fontFigures, fontSize: 11 },
    // No drop shadow: at night it would read as a grey halo.
    extraCssText: `box-shadow:none;border-radius:6px;font-variant-numeric:tabular-nums;font-family:${theme.fontFigures.replace(/"/g, "'")}`,
    axisPointer: {
      type: 'line' as const,
      lineStyle: { color: theme.muted, type: 'dashed' as const, width: 1 },
    },
    formatter,
  };
}

/** One tooltip row: a coloured key, the name, and the value right-aligned. */
export function tooltipRow(colour: string, name: string, value: string, dashed = false): string {
  const key = `<span style="display:inline-block;width:14px;height:0;border-top:2px ${dashed ? 'dashed' : 'solid'} ${colour};vertical-align:middle;margin-right:6px"></span>`;
  return `<div style="display:flex;gap:12px;justify-content:space-between;line-height:1.5"><span>${key}${escapeHtml(name)}</span><span style="font-weight:600">${escapeHtml(value)}</span></div>`;
}

export function tooltipHeader(text: string): string {
  return `<div style="font-weight:600;margin-bottom:2px">${escapeHtml(text)}</div>`;
}

/**
 * Zoom on x: the slider under the plot (drag its handles or its body), wheel or
 * trackpad pinch with Ctrl held, and drag-to-pan once zoomed. Touch drags fall through
 * to page scrolling so a phone reader is never trapped in the chart.
 */
export function xZoomOption(
  theme: ChartTheme,
  format: ValueFormat,
  zoom: ZoomWindow | null,
  // 'filter' re-samples only what is in view, so zooming into a dense scan shows real detail.
  filterMode: 'filter' | 'none' = 'none',
) {
  const window = zoom ? { startValue: zoom[0], endValue: zoom[1] } : { start: 0, end: 100 };
  return [
    {
      type: 'inside' as const,
      xAxisIndex: 0,
      filterMode,
      zoomOnMouseWheel: 'ctrl' as const,
      moveOnMouseWheel: false,
      moveOnMouseMove: true,
      preventDefaultMouseMove: false,
      ...window,
    },
    {
      type: 'slider' as const,
      xAxisIndex: 0,
      filterMode,
      height: 18,
      bottom: 4,
      left: 48,
      right: 24,
      ...window,
      brushSelect: true,
      showDetail: true,
      labelFormatter: (v: number) => formatTick(Math.round(v * 100) / 100, format),
      textStyle: { color: theme.muted, fontFamily: theme.fontFigures, fontSize: 10 },
      backgroundColor: 'transparent',
      borderColor: theme.rule,
      borderRadius: 3,
      fillerColor: theme.accentSoft,
      dataBackground: { lineStyle: { color: theme.muted, width: 0.6, opacity: 0.6 }, areaStyle: { color: theme.muted, opacity: 0.08 } },
      selectedDataBackground: { lineStyle: { color: theme.accent, width: 0.8 }, areaStyle: { color: theme.accent, opacity: 0.12 } },
      handleStyle: { color: theme.panel, borderColor: theme.accent, borderWidth: 1 },
      moveHandleSize: 5,
      moveHandleStyle: { color: theme.rule, opacity: 1 },
      emphasis: {
        handleStyle: { borderColor: theme.accent, color: theme.panel },
        moveHandleStyle: { color: theme.accent },
        handleLabel: { show: true },
      },
      brushStyle: { color: theme.accentSoft, borderColor: theme.accent },
    },
  ];
}

/**
 * Invisible toolbox: it only supplies the drag-a-box zoom that the "Zoom by box" button
 * switches on. It must be "shown" (ECharts wires the box only for a rendered toolbox),
 * so its icon is drawn at zero size instead.
 */
export function boxZoomToolbox(theme: ChartTheme) {
  return {
    show: true,
    left: 0,
    top: 0,
    itemSize: 0,
    itemGap: 0,
    showTitle: false,
    iconStyle: { opacity: 0, borderWidth: 0 },
    emphasis: { iconStyle: { opacity: 0, borderWidth: 0 } },
    feature: {
      dataZoom: {
        yAxisIndex: 'none' as const,
        filterMode: 'none' as const,
        brushStyle: { color: theme.accentSoft, borderColor: theme.accent, borderWidth: 1 },
      },
    },
  };
}

/**
 * ECharts fills its "empty" marker shapes with white, which would break the night
 * view; hollow shapes are drawn as filled ones with the panel colour inside instead.
 */
export function symbolStyle(shape: SymbolShape, colour: string, theme: ChartTheme) {
  const hollow = shape.startsWith('empty');
  const base = hollow ? shape.slice(5).toLowerCase() : shape;
  return {
    symbol: base,
    itemStyle: hollow ? { color: theme.panel, borderColor: colour, borderWidth: 1.5 } : { color: colour, borderWidth: 0 },
  };
}
