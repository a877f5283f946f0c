// ECharts through its modular entry (only what the report draws), rendered as SVG: vectors print
// sharply to PDF where a canvas would print as a screen-resolution bitmap.
import ReactEChartsCore from 'echarts-for-react/esm/core';
import type { EChartsReactProps } from 'echarts-for-react/esm/types';
import * as echarts from 'echarts/core';
import { LineChart, ScatterChart } from 'echarts/charts';
import { GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent } from 'echarts/components';
import { SVGRenderer } from 'echarts/renderers';

echarts.use([LineChart, ScatterChart, GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, SVGRenderer]);

export type ReportChartProps = Omit<EChartsReactProps, 'echarts' | 'opts'>;

export function ReportChart(props: ReportChartProps) {
  return <ReactEChartsCore echarts={echarts} opts={{ renderer: 'svg' }} {...props} />;
}
