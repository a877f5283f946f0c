import { useMemo } from 'react';
import { Typography } from 'antd';
import type { ChannelSeries, StableValueAnalysis } from '@dialsheet/common';
import { useRunSeries } from '../api/get-run-series';
import { fitBand } from '../utils/fit-band';
import { sig } from '../utils/report-format';
import { ReportChart } from './report-chart';

const ACCENT = '#17695c';
const FIT = '#1e3a8a';
const BAND_STEPS = 30;

interface ReportTrendChartProps {
  analysis: StableValueAnalysis;
  title: string;
  /** Lead/engineer (the readings endpoint is theirs) and the run still holds this release's data. */
  drawReadings: boolean;
}

function chartOption(analysis: StableValueAnalysis, series: ChannelSeries | undefined) {
  const stable = analysis.result?.stable;
  if (!stable) return null;
  const fit = stable.fit;
  const line: Array<[number, number]> = [];
  const low: Array<[number, number]> = [];
  const high: Array<[number, number]> = [];
  for (let k = 0; k <= BAND_STEPS; k++) {
    const t = fit.tMin + ((fit.tMax - fit.tMin) * k) / BAND_STEPS;
    const band = fitBand(fit, t);
    line.push([t, band.y]);
    low.push([t, band.low]);
    high.push([t, band.high]);
  }
  const readings: Array<[number, number]> = series ? series.t.map((t, i) => [t, series.value[i]]) : [];
  const U = stable.expandedUncertainty;
  return {
    animation: false,
    grid: { left: 64, right: 20, top: 34, bottom: 42 },
    legend: { top: 0, data: [...(series ? ['readings'] : []), 'fit', 'confidence band of the fit', `value at t* ± U`] },
    xAxis: { type: 'value', name: 'test time (s)', nameLocation: 'middle', nameGap: 26, scale: true },
    yAxis: { type: 'value', name: stable.unit, scale: true },
    series: [
      ...(series
        ? [{ type: 'scatter', name: 'readings', data: readings, symbolSize: 4, itemStyle: { color: ACCENT } }]
        : []),
      {
        type: 'line',
        name: 'fit',
        data: line,
        showSymbol: false,
        lineStyle: { color: FIT, width: 2 },
        itemStyle: { color: FIT },
        markArea: {
          silent: true,
          itemStyle: { color: 'rgba(23, 105, 92, 0.06)' },
          data: [[{ xAxis: analysis.input.window.from }, { xAxis: analysis.input.window.to }]],
        },
      },
      {
        type: 'line',
        name: 'confidence band of the fit',
        data: high,
        showSymbol: false,
        lineStyle: { color: FIT, width: 1, type: 'dashed' },
        itemStyle: { color: FIT },
      },
      {
        type: 'line',
        name: 'confidence band of the fit',
        data: low,
        showSymbol: false,
        lineStyle: { color: FIT, width: 1, type: 'dashed' },
        itemStyle: { color: FIT },
      },
      {
        type: 'line',
        name: 'value at t* ± U',
        data: [
          [stable.tStar, stable.value - U],
          [stable.tStar, stable.value + U],
        ],
        symbol: 'rect',
        symbolSize: [10, 2],
        lineStyle: { color: '#b45309', width: 2 },
        itemStyle: { color: '#b45309' },
      },
    ],
  };
}

/** Readings, fit, band and the stable value at t* with its expanded uncertainty, for print. */
export function ReportTrendChart({ analysis, title, drawReadings }: ReportTrendChartProps) {
  const series = useRunSeries({
    runId: analysis.input.runId,
    channelId: analysis.input.channelId,
    queryConfig: { enabled: drawReadings, retry: false },
  });
  const data = drawReadings ? series.data : undefined;
  const option = useMemo(() => chartOption(analysis, data), [analysis, data]);
  if (!option) return null;
  const stable = analysis.result!.stable;
  return (
    <figure className="report-figure">
      <div className="report-chart" role="img" aria-label={`Trend of ${title}: fit and value at t* = ${sig(stable.tStar)} s`}>
        <ReportChart option={option} style={{ height: 260, width: '100%' }} notMerge />
      </div>
      <figcaption>
        <Typography.Text type="secondary">
          {title}: window {sig(analysis.input.window.from)}–{sig(analysis.input.window.to)} s (shaded), t* = {sig(stable.tStar)} s.
          {!data ? ' Readings not drawn: only the stored fit is shown.' : ''}
        </Typography.Text>
      </figcaption>
    </figure>
  );
}
