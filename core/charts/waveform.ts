/**
 * Receiver waveform chart: voltage against time for the rising and falling edge, with the receiver's
 * thresholds, rails and absolute limits as marked lines and the measured threshold crossings as points.
 * Input in SI (s, V); the chart shows ns and V.
 */
import type { EChartsOption } from 'echarts';
import { baseChartOption, CHART_TITLE_SIZE, CHART_FONT_SIZE, LEVEL_COLOR, TRACE_COLOR } from './style.js';
import { decimateMinMax } from './decimate.js';
import type { Edge } from '../circuit/types.js';

export type { Edge };

export interface WaveformTrace {
  edge: Edge;
  /** Legend text, e.g. "rising (slow)". */
  label: string;
  /** Sample times, s (0 = start of the driver's ramp). */
  t: ArrayLike<number>;
  /** Receiver pin voltage, V. */
  v: ArrayLike<number>;
}

/** Levels drawn across the chart, V. Optional ones are drawn only when given. */
export interface WaveformLevels {
  vil: number;
  vih: number;
  /** Supply rails that overshoot and undershoot are measured from. */
  railLow?: number;
  railHigh?: number;
  /** Receiver absolute maximum / minimum. */
  vmaxAbs?: number;
  vminAbs?: number;
}

/** A measured crossing of a threshold (DESIGN.md §5), s and V. */
export interface WaveformCrossing {
  edge: Edge;
  level: string;
  t: number;
  v: number;
}

export interface WaveformChartInput {
  title: string;
  subtitle?: string;
  traces: WaveformTrace[];
  levels: WaveformLevels;
  crossings?: WaveformCrossing[];
  /** Points drawn per trace at most (extremes are kept); default 600. */
  maxPointsPerTrace?: number;
}

const NS = 1e-9;

/** Lowest and highest value worth showing, padded and rounded outward to a tidy step. */
function voltageRange(input: WaveformChartInput): { min: number; max: number } {
  const { levels } = input;
  let lo = Math.min(levels.vil, levels.vih);
  let hi = Math.max(levels.vil, levels.vih);
  for (const x of [levels.railLow, levels.railHigh, levels.vmaxAbs, levels.vminAbs]) {
    if (x !== undefined && Number.isFinite(x)) {
      lo = Math.min(lo, x);
      hi = Math.max(hi, x);
    }
  }
  for (const trace of input.traces) {
    for (let i = 0; i < trace.v.length; i++) {
      const x = trace.v[i];
      if (!Number.isFinite(x)) continue;
      if (x < lo) lo = x;
      if (x > hi) hi = x;
    }
  }
  const span = Math.max(hi - lo, 0.1);
  const step = span > 2 ? 0.5 : span > 0.5 ? 0.1 : 0.05;
  return {
    min: Math.floor((lo - 0.05 * span) / step) * step,
    max: Math.ceil((hi + 0.05 * span) / step) * step,
  };
}

/** End of the time axis, ns, rounded up to a tidy step (9.995 ns -> 10 ns). */
function timeEnd(input: WaveformChartInput): number {
  let end = 0;
  for (const trace of input.traces) if (trace.t.length) end = Math.max(end, trace.t[trace.t.length - 1]);
  const ns = end / NS;
  if (!(ns > 0)) return 1;
  const step = 10 ** Math.floor(Math.log10(ns)) / 2;
  return Math.ceil(ns / step - 1e-9) * step;
}

function levelLine(name: string, value: number, color: string, position: string, dashed: boolean): Record<string, unknown> {
  return {
    name,
    yAxis: value,
    lineStyle: { color, type: dashed ? 'dashed' : 'solid', width: 1 },
    label: { formatter: `${name} ${Number(value.toPrecision(3))} V`, position, color, fontSize: CHART_FONT_SIZE - 1 },
  };
}

/** ECharts option for one receiver's waveforms. Pure: same input, same option. */
export function waveformChartOption(input: WaveformChartInput): EChartsOption {
  const { levels } = input;
  const maxPoints = input.maxPointsPerTrace ?? 600;
  const range = voltageRange(input);
  const marks: Record<string, unknown>[] = [
    levelLine('VIH', levels.vih, LEVEL_COLOR.threshold, 'insideEndTop', true),
    levelLine('VIL', levels.vil, LEVEL_COLOR.threshold, 'insideEndBottom', true),
  ];
  if (levels.railHigh !== undefined) marks.push(levelLine('rail', levels.railHigh, LEVEL_COLOR.rail, 'insideStartTop', false));
  if (levels.railLow !== undefined) marks.push(levelLine('rail', levels.railLow, LEVEL_COLOR.rail, 'insideStartBottom', false));
  if (levels.vmaxAbs !== undefined) marks.push(levelLine('max', levels.vmaxAbs, LEVEL_COLOR.limit, 'insideMiddleTop', false));
  if (levels.vminAbs !== undefined) marks.push(levelLine('min', levels.vminAbs, LEVEL_COLOR.limit, 'insideMiddleBottom', false));

  const series: Record<string, unknown>[] = input.traces.map((trace, index) => ({
    type: 'line',
    name: trace.label,
    data: decimateMinMax(trace.t, trace.v, maxPoints).map(([t, v]) => [t / NS, v]),
    showSymbol: false,
    lineStyle: { width: 1.5, color: TRACE_COLOR[trace.edge] },
    itemStyle: { color: TRACE_COLOR[trace.edge] },
    z: 3,
    // The levels are drawn once, with the first trace.
    ...(index === 0 ? { markLine: { symbol: 'none', silent: true, data: marks } } : {}),
  }));
  const crossings = input.crossings ?? [];
  if (crossings.length) {
    series.push({
      type: 'scatter',
      name: 'threshold crossings',
      data: crossings.map((c) => [c.t / NS, c.v]),
      symbol: 'circle',
      symbolSize: 6,
      itemStyle: { color: '#ffffff', borderColor: '#222222', borderWidth: 1.2 },
      z: 4,
    });
  }

  return {
    ...baseChartOption(),
    title: {
      text: input.title,
      subtext: input.subtitle ?? '',
      left: 8,
      top: 4,
      textStyle: { fontSize: CHART_TITLE_SIZE, fontWeight: 'bold' },
      subtextStyle: { fontSize: CHART_FONT_SIZE - 1, lineHeight: Math.round((CHART_FONT_SIZE - 1) * 1.4) },
    },
    legend: { top: input.subtitle ? 44 : 28, left: 8, itemWidth: 18, itemGap: 18, textStyle: { fontSize: CHART_FONT_SIZE - 1 } },
    grid: { left: 64, right: 24, top: input.subtitle ? 76 : 60, bottom: 48 },
    xAxis: {
      type: 'value',
      name: 'Time (ns)',
      nameLocation: 'middle',
      nameGap: 28,
      min: 0,
      max: Number(timeEnd(input).toPrecision(6)),
      axisLabel: { fontSize: CHART_FONT_SIZE - 1 },
      splitLine: { lineStyle: { color: '#e4e4e4' } },
    },
    yAxis: {
      type: 'value',
      name: 'Voltage (V)',
      nameLocation: 'middle',
      nameGap: 44,
      min: Number(range.min.toFixed(3)),
      max: Number(range.max.toFixed(3)),
      axisLabel: { fontSize: CHART_FONT_SIZE - 1 },
      splitLine: { lineStyle: { color: '#e4e4e4' } },
    },
    series,
  } as EChartsOption;
}
