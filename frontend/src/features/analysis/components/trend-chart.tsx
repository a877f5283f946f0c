import { useCallback, useEffect, useMemo, useRef } from 'react';
import type { ECharts } from 'echarts/core';
import type { ChannelSeries, StableValue, TimeWindow } from '@dialsheet/common';
import { predictAt } from '../utils/analysis-lib';
import { sig } from '../utils/number-format';
import { EChart } from './echart';

// Colours of the one accent and its quieter companions (the app's theme is calm and light).
const ACCENT = '#0f766e';
const UNCHECKED = '#c2410c';
const FIT = '#1e3a8a';
const BAND = 'rgba(30, 58, 138, 0.14)';
const BAND_STEPS = 40;

export const UNCHECKED_LEGEND = 'unchecked (first pass only)';

interface TrendChartProps {
  series: ChannelSeries;
  stable: StableValue | null;
  window: TimeWindow;
  tStar: number;
  /** While dragging (`final` false) and when the drag ends (`final` true). */
  onWindowChange: (window: TimeWindow, final: boolean) => void;
  onTStarChange: (tStar: number) => void;
  height?: number;
}

const round = (x: number) => Math.round(x * 1000) / 1000;
const sameWindow = (a: TimeWindow, b: TimeWindow) => Math.abs(a.from - b.from) < 1e-6 && Math.abs(a.to - b.to) < 1e-6;

interface BrushArea {
  coordRange?: [number, number];
}

/**
 * Readings against test time (unchecked first-pass values drawn hollow, in their own legend
 * entry), the fitted line with the confidence band of the mean response across the window, and t*.
 * The window is an ECharts brush along the time axis: drag across the chart to set it, drag its
 * edges to adjust it; double-click sets t*.
 */
export function TrendChart({ series, stable, window, tStar, onWindowChange, onTStarChange, height = 360 }: TrendChartProps) {
  const chartRef = useRef<ECharts | null>(null);
  // The window the brush shows now (dragged there, or drawn by us).
  const shownRef = useRef<TimeWindow | null>(null);
  const windowRef = useRef(window);
  windowRef.current = window;
  const handlers = useRef({ onWindowChange, onTStarChange });
  handlers.current = { onWindowChange, onTStarChange };

  const option = useMemo(() => {
    const checked: Array<[number, number]> = [];
    const unchecked: Array<[number, number]> = [];
    series.t.forEach((t, i) => (series.unchecked[i] ? unchecked : checked).push([t, series.value[i]]));
    let fitLine: Array<[number, number]> = [];
    let upper: Array<[number, number]> = [];
    let lower: Array<[number, number]> = [];
    if (stable) {
      const fit = stable.fit;
      const from = fit.tMin;
      const to = fit.tMax;
      fitLine = [from, to].map((t) => [t, fit.yMean + fit.slope * (t - fit.tMean)]);
      for (let k = 0; k <= BAND_STEPS; k++) {
        const t = from + ((to - from) * k) / BAND_STEPS;
        const p = predictAt(fit, t, { allowExtrapolation: true });
        upper.push([t, p.meanInterval.high]);
        lower.push([t, p.meanInterval.low]);
      }
    } else {
      upper = [];
      lower = [];
      fitLine = [];
    }
    const band = { upper, lower };
    return {
      animation: false,
      grid: { left: 70, right: 24, top: 40, bottom: 46 },
      legend: { top: 0, data: ['readings', UNCHECKED_LEGEND, 'fit', 'confidence band of the fit'] },
      tooltip: {
        trigger: 'item',
        formatter: (p: { seriesName: string; value: [number, number] }) => `${p.seriesName}<br/>t = ${sig(p.value[0], 6)} s<br/>${sig(p.value[1], 6)} ${series.unit}`,
      },
      xAxis: { type: 'value', name: 'test time (s)', nameLocation: 'middle', nameGap: 28, min: 'dataMin', max: 'dataMax' },
      yAxis: { type: 'value', name: series.unit, scale: true },
      brush: {
        xAxisIndex: 0,
        brushType: 'lineX',
        brushMode: 'single',
        transformable: true,
        throttleType: 'fixRate',
        throttleDelay: 40,
        brushStyle: { color: 'rgba(15, 118, 110, 0.08)', borderColor: ACCENT, borderWidth: 1 },
        outOfBrush: { colorAlpha: 0.35 },
      },
      series: [
        {
          type: 'custom',
          name: 'confidence band of the fit',
          silent: true,
          z: 1,
          clip: true,
          itemStyle: { color: BAND },
          data: band.upper.length > 0 ? [band.upper[0]] : [],
          renderItem: (params: { dataIndex: number }, api: { coord: (p: [number, number]) => number[] }) => {
            if (params.dataIndex !== 0 || band.upper.length === 0) return null;
            const points = [...band.upper.map((p) => api.coord(p)), ...[...band.lower].reverse().map((p) => api.coord(p))];
            return { type: 'polygon', shape: { points }, style: { fill: BAND } };
          },
        },
        {
          type: 'scatter',
          name: 'readings',
          data: checked,
          symbolSize: 5,
          itemStyle: { color: ACCENT },
          z: 3,
          markLine: {
            symbol: 'none',
            silent: true,
            lineStyle: { color: '#334155', type: 'dashed' },
            label: { formatter: 't*', position: 'end' },
            data: Number.isFinite(tStar) ? [{ xAxis: tStar }] : [],
          },
        },
        {
          type: 'scatter',
          name: UNCHECKED_LEGEND,
          data: unchecked,
          symbol: 'triangle',
          symbolSize: 7,
          itemStyle: { color: 'rgba(255,255,255,0.9)', borderColor: UNCHECKED, borderWidth: 1.5 },
          z: 4,
        },
        { type: 'line', name: 'fit', data: fitLine, showSymbol: false, lineStyle: { color: FIT, width: 2 }, itemStyle: { color: FIT }, z: 5 },
      ],
    };
  }, [series, stable, tStar]);

  const showWindow = useCallback((chart: ECharts, w: TimeWindow) => {
    shownRef.current = w;
    chart.dispatchAction({ type: 'brush', areas: [{ brushType: 'lineX', xAxisIndex: 0, coordRange: [w.from, w.to] }] });
  }, []);

  const onReady = useCallback(
    (chart: ECharts) => {
      chartRef.current = chart;
      // The brush is the chart's mouse mode from the start: no toolbar button to find first.
      chart.dispatchAction({ type: 'takeGlobalCursor', key: 'brush', brushOption: { brushType: 'lineX', brushMode: 'single' } });
      showWindow(chart, windowRef.current);
      chart.getZr().on('dblclick', (event: { offsetX: number; offsetY: number }) => {
        const point = chart.convertFromPixel({ gridIndex: 0 }, [event.offsetX, event.offsetY]) as number[] | undefined;
        if (point && Number.isFinite(point[0])) handlers.current.onTStarChange(round(point[0]));
      });
    },
    [showWindow],
  );

  // A window typed into the inputs (not dragged) is drawn as the brush.
  useEffect(() => {
    const chart = chartRef.current;
    if (!chart) return;
    if (!shownRef.current || !sameWindow(shownRef.current, window)) showWindow(chart, window);
  }, [window, showWindow]);

  const onEvents = useMemo(() => {
    const fromAreas = (params: { areas?: BrushArea[] }, final: boolean) => {
      const range = params.areas?.[0]?.coordRange;
      if (!range) {
        // A click without a drag clears the brush; the window stays and is drawn again.
        if (final && chartRef.current) showWindow(chartRef.current, windowRef.current);
        return;
      }
      const next = { from: round(Math.min(range[0], range[1])), to: round(Math.max(range[0], range[1])) };
      shownRef.current = next;
      if (!sameWindow(next, windowRef.current) || final) handlers.current.onWindowChange(next, final);
    };
    return {
      brush: (params: { areas?: BrushArea[] }) => fromAreas(params, false),
      brushEnd: (params: { areas?: BrushArea[] }) => fromAreas(params, true),
    };
  }, [showWindow]);

  return (
    <div aria-label={`Readings of ${series.symbol} against test time`} role="img" data-testid="trend-chart">
      <EChart option={option} onChartReady={onReady} onEvents={onEvents} style={{ height }} notMerge={false} lazyUpdate />
    </div>
  );
}

/** Residuals of the fitted points, on the same time axis as the readings (`extent`). */
export function ResidualChart({
  stable,
  windowT,
  unit,
  extent,
  height = 180,
}: {
  stable: StableValue | null;
  windowT: number[];
  unit: string;
  extent: [number, number];
  height?: number;
}) {
  const option = useMemo(() => {
    const residuals = stable?.fit.residuals ?? [];
    const data = residuals.map((r, i) => [windowT[i], r]);
    return {
      animation: false,
      grid: { left: 70, right: 24, top: 24, bottom: 40 },
      tooltip: { trigger: 'item' },
      xAxis: { type: 'value', name: 'test time (s)', nameLocation: 'middle', nameGap: 26, min: extent[0], max: extent[1] },
      yAxis: { type: 'value', name: `residual (${unit})`, scale: true },
      series: [
        {
          type: 'scatter',
          name: 'residual',
          data,
          symbolSize: 4,
          itemStyle: { color: ACCENT },
          markLine: { symbol: 'none', silent: true, lineStyle: { color: '#64748b' }, label: { show: false }, data: [{ yAxis: 0 }] },
        },
      ],
    };
  }, [stable, windowT, unit, extent]);
  return (
    <div aria-label="Residuals of the fit" role="img" data-testid="residual-chart">
      <EChart option={option} style={{ height }} notMerge />
    </div>
  );
}
