'use client';

import type ReactEChartsCore from 'echarts-for-react/lib/core';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
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
  const zoomRef = useRef<ZoomWindow | null>(initialZoom);
  const [hidden, setHidden] = useState<ReadonlySet<string>>(() => new Set());
  const [boxZoom, setBoxZoom] = useState(false);
  const [zoomKey, setZoomKey] = useState(0);

  // A new initial window from the caller (another curve chosen) replaces the remembered one.
  const initialKey = initialZoom ? `${initialZoom[0]}:${initialZoom[1]}` : '';
  useEffect(() => {
    zoomRef.current = initialZoom;
    setZoomKey((k) => k + 1);
    // eslint-disable-next-line react-hooks/exhaustive-deps
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
   * Charts call this after each new option is drawn: replacing the option drops the
   * box-zoom cursor, which must come back if the reader had switched it on.
   */
  const syncBoxZoom = useCallback(() => {
    if (boxZoom) setBoxCursor(true);
  }, [boxZoom, setBoxCursor]);

  const resetZoom = useCallback(() => {
    zoomRef.current = null;
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
    zoomRef,
    /** Changes whenever the remembered zoom was replaced from outside; include it in option memo keys. */
    zoomKey,
    onEvents,
    hidden,
    toggle,
    legendItems,
    boxZoom,
    toggleBoxZoom,
    syncBoxZoom,
    resetZoom,
    downloadPng,
    downloadCsv,
  };
}
