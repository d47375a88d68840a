// Only what the chart kit draws is registered, which keeps the chart bundle a
// fraction of the full library.
import * as echarts from 'echarts/core';
import { BarChart, HeatmapChart, LineChart, ScatterChart } from 'echarts/charts';
import {
  DataZoomComponent,
  GridComponent,
  MarkAreaComponent,
  MarkLineComponent,
  ToolboxComponent,
  TooltipComponent,
  VisualMapComponent,
} from 'echarts/components';
import { CanvasRenderer } from 'echarts/renderers';

echarts.use([
  LineChart,
  BarChart,
  HeatmapChart,
  ScatterChart,
  GridComponent,
  TooltipComponent,
  DataZoomComponent,
  MarkLineComponent,
  MarkAreaComponent,
  VisualMapComponent,
  // Never shown: it only provides the drag-a-box zoom our own button switches on.
  ToolboxComponent,
  CanvasRenderer,
]);

export { echarts };
export type { EChartsCoreOption, EChartsType } from 'echarts/core';
