/**
 * Receiver waveform chart: voltage against time for the rising and falling edge, with the receiver's
 * thresholds, rails and absolute limits as marked lines and the measured threshold crossings as points.
 * Input in SI (s, V); the chart shows ns and V.
 */
import type { EChartsOption } from 'echarts';
import { baseChartOption, chartPalette, CHART_TITLE_SIZE, CHART_FONT_SIZE, valueAxis, type ChartPalette, type ChartTheme } from './style.js';
import { decimateMinMax } from './decimate.js';
import type { Edge } from '../circuit/types.js';

export type { Edge };

export interface WaveformTrace {
  edge: Edge;
  /** Legend text, e.g. "rising (slow)". */
  label: string;
  /** Sample times, s (0 = start of the driver's ramp). */
  t: ArrayLike<number>;
  /** Pin voltage, V. */
  v: ArrayLike<number>;
  /** Corner the trace was simulated at; traces of different corners get different colours. */
  corner?: string;
  /** Which pin: a receiver (default) or the driver's output pin (drawn dotted or dash-dotted). */
  pin?: 'receiver' | 'driver';
}

/** How one trace is drawn: colour and dash pattern, unique per corner, edge and pin. */
export interface TraceStyle {
  color: string;
  /** ECharts line type: 'solid', 'dotted', or a dash array in px. */
  dash: 'solid' | 'dotted' | number[];
  width: number;
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

/** A measured crossing of a threshold (docs/design.md §5), s and V. */
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
  /** Background and text colours (default light, as printed). */
  theme?: ChartTheme;
}

const NS = 1e-9;

/**
 * Lowest and highest value worth showing, padded, and a tick step of 1, 2, 2.5 or 5 times a power of
 * ten with both ends on it, so no end label falls between two ticks and prints over its neighbour.
 */
function voltageRange(input: WaveformChartInput): { min: number; max: number; step: number } {
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
  const rough = (span * 1.1) / 6;
  const power = 10 ** Math.floor(Math.log10(rough));
  const step = ([1, 2, 2.5, 5, 10].find((m) => m * power >= rough) ?? 10) * power;
  return {
    min: Math.floor((lo - 0.05 * span) / step) * step,
    max: Math.ceil((hi + 0.05 * span) / step) * step,
    step,
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

/**
 * Colour and dash of every trace: each corner (in order of first appearance) takes a pair of palette
 * colours, its rising edge the first and its falling edge the second; rising edges are solid and
 * falling edges dashed, so two traces never share both colour and dash, and the edge reads without
 * colour too. A driver-pin trace keeps its corner and edge colour, dotted (rising) or dash-dotted (falling).
 */
export function traceStyles(traces: readonly WaveformTrace[], palette: ChartPalette = chartPalette('light')): TraceStyle[] {
  const corners: string[] = [];
  for (const trace of traces) {
    const corner = trace.corner ?? '';
    if (!corners.includes(corner)) corners.push(corner);
  }
  return traces.map((trace) => {
    const pair = corners.indexOf(trace.corner ?? '');
    const color = palette.series[(2 * pair + (trace.edge === 'rising' ? 0 : 1)) % palette.series.length];
    if (trace.pin === 'driver') return { color, dash: trace.edge === 'rising' ? 'dotted' : [8, 3, 2, 3], width: 1.2 };
    return { color, dash: trace.edge === 'rising' ? 'solid' : [7, 4], width: 1.6 };
  });
}

/**
 * The part of the time axis where something happens, ns: from 0 to a little after the last moment any
 * trace is still more than 2 % of its swing away from its final value (common practice for settling,
 * no source). The workbench opens its zoom on this window; the full axis stays reachable.
 */
export function activeWindow(traces: readonly WaveformTrace[]): { start: number; end: number } {
  let fullEnd = 0;
  let settled = 0;
  for (const trace of traces) {
    const n = Math.min(trace.t.length, trace.v.length);
    if (!n) continue;
    fullEnd = Math.max(fullEnd, trace.t[n - 1]);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < n; i++) {
      if (trace.v[i] < lo) lo = trace.v[i];
      if (trace.v[i] > hi) hi = trace.v[i];
    }
    const band = 0.02 * Math.max(hi - lo, 1e-9);
    const final = trace.v[n - 1];
    let last = 0;
    for (let i = n - 1; i >= 0; i--) {
      if (Math.abs(trace.v[i] - final) > band) {
        last = i + 1 < n ? i + 1 : i;
        break;
      }
    }
    settled = Math.max(settled, trace.t[last]);
  }
  if (!(fullEnd > 0)) return { start: 0, end: 1 };
  // 30 % beyond the settling point shows the flat tail that proves it settled.
  const end = Math.min(fullEnd, Math.max(settled * 1.3, fullEnd * 0.05));
  return { start: 0, end: Number((end / NS).toPrecision(4)) };
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
  const theme = input.theme ?? 'light';
  const palette = chartPalette(theme);
  const level = palette.level;
  const maxPoints = input.maxPointsPerTrace ?? 600;
  const range = voltageRange(input);
  const marks: Record<string, unknown>[] = [
    levelLine('VIH', levels.vih, level.threshold, 'insideEndTop', true),
    levelLine('VIL', levels.vil, level.threshold, 'insideEndBottom', true),
  ];
  if (levels.railHigh !== undefined) marks.push(levelLine('rail', levels.railHigh, level.rail, 'insideStartTop', false));
  if (levels.railLow !== undefined) marks.push(levelLine('rail', levels.railLow, level.rail, 'insideStartBottom', false));
  if (levels.vmaxAbs !== undefined) marks.push(levelLine('max', levels.vmaxAbs, level.limit, 'insideMiddleTop', false));
  if (levels.vminAbs !== undefined) marks.push(levelLine('min', levels.vminAbs, level.limit, 'insideMiddleBottom', false));

  const styles = traceStyles(input.traces, palette);
  const series: Record<string, unknown>[] = input.traces.map((trace, index) => ({
    type: 'line',
    name: trace.label,
    data: decimateMinMax(trace.t, trace.v, maxPoints).map(([t, v]) => [t / NS, v]),
    showSymbol: false,
    lineStyle: { width: styles[index].width, color: styles[index].color, type: styles[index].dash },
    itemStyle: { color: styles[index].color },
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
      itemStyle: { color: palette.crossingFill, borderColor: palette.crossingBorder, borderWidth: 1.2 },
      z: 4,
    });
  }

  return {
    ...baseChartOption(theme),
    title: {
      text: input.title,
      subtext: input.subtitle ?? '',
      left: 8,
      top: 4,
      textStyle: { fontSize: CHART_TITLE_SIZE, fontWeight: 'bold', color: palette.text },
      subtextStyle: { fontSize: CHART_FONT_SIZE - 1, lineHeight: Math.round((CHART_FONT_SIZE - 1) * 1.4), color: palette.muted },
    },
    // itemWidth long enough to show each trace's dash pattern in the legend.
    legend: {
      top: input.subtitle ? 44 : 28, left: 8, right: 8, itemWidth: 28, itemGap: 14, type: 'scroll',
      textStyle: { fontSize: CHART_FONT_SIZE - 1, color: palette.text },
      pageTextStyle: { color: palette.text },
      inactiveColor: palette.splitLine,
    },
    grid: { left: 64, right: 24, top: input.subtitle ? 76 : 60, bottom: 48 },
    // hideOverlap (valueAxis): the end labels (0 and the axis end) never print over their neighbours.
    xAxis: valueAxis(palette, 'Time (ns)', 28, { min: 0, max: Number(timeEnd(input).toPrecision(6)) }),
    yAxis: valueAxis(palette, 'Voltage (V)', 44, {
      min: Number(range.min.toFixed(3)), max: Number(range.max.toFixed(3)), interval: Number(range.step.toPrecision(6)),
    }),
    series,
  } as EChartsOption;
}
