'use client';

import ReactEChartsCore from 'echarts-for-react/lib/core';
import type { CSSProperties, RefObject } from 'react';
import { echarts, type EChartsCoreOption, type EChartsType } from './echarts-core';

export type ChartEvents = Record<string, (params: unknown, chart: EChartsType) => void>;

export interface ChartCanvasProps {
  option: EChartsCoreOption;
  /** Draw only once the theme has been read, so the night view never flashes day colours. */
  ready: boolean;
  /** Short accessible name of the drawing; the figure's caption carries the full summary. */
  label: string;
  describedBy?: string;
  /** Width ÷ height from 640 px up. */
  aspect?: number;
  /** Width ÷ height below 640 px, taller so a phone still shows a readable plot. */
  narrowAspect?: number;
  /** Fixed height in px; overrides the aspect ratios. */
  height?: number;
  onEvents?: ChartEvents;
  chartRef?: RefObject<ReactEChartsCore | null>;
}

const NO_EVENTS: ChartEvents = {};
const OPTS = { renderer: 'canvas' as const };

/** The ECharts drawing surface, sized by aspect ratio so it keeps its shape at any width. */
export function ChartCanvas({
  option,
  ready,
  label,
  describedBy,
  aspect = 16 / 9,
  narrowAspect = 4 / 3,
  height,
  onEvents = NO_EVENTS,
  chartRef,
}: ChartCanvasProps) {
  const sizing: CSSProperties =
    height != null
      ? { height }
      : ({ '--chart-ar': String(aspect), '--chart-ar-narrow': String(narrowAspect) } as CSSProperties);
  return (
    <div
      role="img"
      aria-label={label}
      aria-describedby={describedBy}
      className={`relative w-full min-w-0 ${height != null ? '' : 'aspect-[var(--chart-ar-narrow)] sm:aspect-[var(--chart-ar)]'}`}
      style={sizing}
    >
      {ready ? (
        <ReactEChartsCore
          ref={chartRef}
          echarts={echarts}
          option={option}
          notMerge
          opts={OPTS}
          onEvents={onEvents}
          style={{ position: 'absolute', inset: 0, width: '100%', height: '100%' }}
        />
      ) : null}
    </div>
  );
}

/** The live ECharts instance behind a canvas, or null before it has been drawn. */
export function instanceOf(ref: RefObject<ReactEChartsCore | null>): EChartsType | null {
  try {
    return (ref.current?.getEchartsInstance() as EChartsType | undefined) ?? null;
  } catch {
    return null;
  }
}
