'use client';

import type ReactEChartsCore from 'echarts-for-react/lib/core';
import { useCallback, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { instanceOf, type ChartEvents } from './chart-canvas';
import type { LegendItem } from './chart-frame';
import { downloadText, downloadUrl, fileNameFor } from './csv';
import { chartToPng } from './png';
import type { ChartTheme } from './use-chart-theme';

export type ZoomWindow = readonly [number, number];

interface Options {
  title: string;
  /** Base of the downloaded file names; the title when absent. */
  fileName?: string;
  theme: ChartTheme;
  legend: readonly LegendItem[];
  /** Builds the CSV text only when asked, so large curves cost nothing until then. */
  csv?: () => string;
  /** x range shown first; the user can zoom out to the whole axis. */
  initialZoom?: ZoomWindow | null;
}

/**
 * Everything the action row and the legend need, shared by the ECharts-based charts:
 * the instance handle, downloads, the remembered zoom window (so a theme switch or a
 * hidden series does not throw the reader's zoom away) and series visibility.
 */
export function useChartControls({ title, fileName, theme, legend, csv, initialZoom = null }: Options) {
  const chartRef = useRef<ReactEChartsCore | null>(null);
  // The reader's own zoom window, null until they zoom. Kept out of the option so zooming never rebuilds it.
  const zoomRef = useRef<ZoomWindow | null>(null);
  const [hidden, setHidden] = useState<ReadonlySet<string>>(() => new Set());
  const [boxZoom, setBoxZoom] = useState(false);

  // A new first window from the caller (another curve chosen) wins over the remembered zoom.
  // A layout effect, so it runs before the chart's own `useAfterOption` re-applies the zoom.
  const initialKey = initialZoom ? `${initialZoom[0]}:${initialZoom[1]}` : '';
  const appliedKey = useRef(initialKey);
  useLayoutEffect(() => {
    if (appliedKey.current === initialKey) return;
    appliedKey.current = initialKey;
    zoomRef.current = null;
  }, [initialKey]);

  const onEvents = useMemo<ChartEvents>(
    () => ({
      datazoom: (_params, chart) => {
        const dz = (chart.getOption() as { dataZoom?: { startValue?: number; endValue?: number }[] }).dataZoom?.[0];
        if (dz && typeof dz.startValue === 'number' && typeof dz.endValue === 'number') {
          zoomRef.current = [dz.startValue, dz.endValue];
        }
      },
    }),
    [],
  );

  const toggle = useCallback((key: string) => {
    setHidden((prev) => {
      const next = new Set(prev);
      if (next.has(key)) next.delete(key);
      else next.add(key);
      return next;
    });
  }, []);

  const setBoxCursor = useCallback((active: boolean) => {
    instanceOf(chartRef)?.dispatchAction({ type: 'takeGlobalCursor', key: 'dataZoomSelect', dataZoomSelectActive: active });
  }, []);

  const toggleBoxZoom = useCallback(() => {
    const next = !boxZoom;
    setBoxCursor(next);
    setBoxZoom(next);
  }, [boxZoom, setBoxCursor]);

  /**
   * Run after each new option is drawn (see `useAfterOption`): replacing the option resets
   * zoom and cursor, so the reader's zoom window and box-zoom mode are put back.
   */
  const afterOption = useCallback(() => {
    const chart = instanceOf(chartRef);
    if (!chart) return;
    const zoom = zoomRef.current;
    if (zoom) chart.dispatchAction({ type: 'dataZoom', startValue: zoom[0], endValue: zoom[1] });
    if (boxZoom) setBoxCursor(true);
  }, [boxZoom, setBoxCursor]);

  // The datazoom event that follows records the whole range as the reader's choice.
  const resetZoom = useCallback(() => {
    instanceOf(chartRef)?.dispatchAction({ type: 'dataZoom', start: 0, end: 100 });
  }, []);

  const downloadPng = useCallback(async () => {
    const chart = instanceOf(chartRef);
    if (!chart) return;
    const url = await chartToPng(chart, title, legend.filter((l) => !hidden.has(l.key)), theme);
    downloadUrl(fileNameFor(fileName ?? title, 'png'), url);
  }, [title, fileName, legend, hidden, theme]);

  const downloadCsv = useMemo(
    () => (csv ? () => downloadText(fileNameFor(fileName ?? title, 'csv'), csv()) : undefined),
    [csv, fileName, title],
  );

  const legendItems = useMemo(() => legend.map((l) => ({ ...l, hidden: hidden.has(l.key) })), [legend, hidden]);

  return {
    chartRef,
    onEvents,
    hidden,
    toggle,
    legendItems,
    boxZoom,
    toggleBoxZoom,
    afterOption,
    resetZoom,
    downloadPng,
    downloadCsv,
  };
}

/** Re-applies the reader's zoom and box-zoom mode each time a chart's option is replaced. */
export function useAfterOption(afterOption: () => void, option: unknown): void {
  useLayoutEffect(() => afterOption(), [afterOption, option]);
}
