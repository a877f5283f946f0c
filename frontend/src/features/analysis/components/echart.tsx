// ECharts through its modular entry: only the chart types and components these pages draw are
// bundled (the full build is several times larger), and only the analysis pages load it.
import ReactEChartsCore from 'echarts-for-react/esm/core';
import type { EChartsReactProps } from 'echarts-for-react/esm/types';
import * as echarts from 'echarts/core';
import { CustomChart, LineChart, ScatterChart } from 'echarts/charts';
import {
  BrushComponent,
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TooltipComponent,
} from 'echarts/components';
import { CanvasRenderer } from 'echarts/renderers';

echarts.use([LineChart, ScatterChart, CustomChart, GridComponent, TooltipComponent, LegendComponent, MarkLineComponent, BrushComponent, CanvasRenderer]);

export type EChartProps = Omit<EChartsReactProps, 'echarts'>;

/** One chart; the option is ECharts' own. */
export function EChart(props: EChartProps) {
  return <ReactEChartsCore echarts={echarts} {...props} />;
}
