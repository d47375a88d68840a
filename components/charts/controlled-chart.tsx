'use client';

import type { ReactNode } from 'react';
import type { EChartsCoreOption } from 'echarts/core';
import { ChartCanvas } from './chart-canvas';
import { ChartActions, ChartFrame, ChartLegend } from './chart-frame';
import type { useChartControls } from './use-chart-controls';

export interface ControlledChartProps {
  title: string;
  titleAs?: 'h2' | 'h3' | 'h4' | 'p';
  summary?: ReactNode;
  summaryId: string;
  summaryPlacement?: 'below' | 'side';
  className?: string;
  controls: ReturnType<typeof useChartControls>;
  option: EChartsCoreOption;
  ready: boolean;
  /** Short accessible name of the drawing. */
  label: string;
  aspect?: number;
  narrowAspect?: number;
  height?: number;
  /** How many series the legend lists; none is drawn when 0, and toggling needs two or more. */
  legendSeries?: number;
  /** Adds the zoom-by-box and whole-range buttons. */
  zoom?: boolean;
}

/** The frame, legend, action buttons and drawing every chart of ours shares, wired to its useChartControls. */
export function ControlledChart(p: ControlledChartProps) {
  const { controls } = p;
  return (
    <ChartFrame
      title={p.title}
      titleAs={p.titleAs}
      summary={p.summary}
      summaryId={p.summaryId}
      summaryPlacement={p.summaryPlacement}
      className={p.className}
      legend={p.legendSeries ? <ChartLegend items={controls.legendItems} onToggle={p.legendSeries > 1 ? controls.toggle : undefined} /> : undefined}
      actions={
        <ChartActions
          dragZoom={p.zoom ? { active: controls.boxZoom, onToggle: controls.toggleBoxZoom } : undefined}
          onResetZoom={p.zoom ? controls.resetZoom : undefined}
          onPng={controls.downloadPng}
          onCsv={controls.downloadCsv}
        />
      }
    >
      <ChartCanvas
        option={p.option}
        ready={p.ready}
        label={p.label}
        describedBy={p.summary ? p.summaryId : undefined}
        aspect={p.aspect}
        narrowAspect={p.narrowAspect}
        height={p.height}
        onEvents={controls.onEvents}
        chartRef={controls.chartRef}
      />
    </ChartFrame>
  );
}
