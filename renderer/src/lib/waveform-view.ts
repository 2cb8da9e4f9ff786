/**
 * Turns a net's simulated waveforms into the chart input of the net view: one receiver or every
 * receiver, one corner or every corner, one edge or both, the driver pin on request, with the
 * thresholds of the corner shown, rails, limits and the measured crossings. The chart option itself
 * comes from core/charts (shared with the report); this adds the workbench's interactive touches:
 * zoom (drag inside, slider, reset), legend toggles kept across redraws, two time cursors, and a
 * tooltip drawn on the canvas (no inline-styled HTML, which the page's style policy forbids).
 */
import type { EChartsOption } from 'echarts';
import type { NetWaveforms } from '../../../core/contract/api.js';
import type { Corner, NetDefinition, PartModel, Stackup } from '../../../core/project/model.js';
import {
  activeWindow, canvasTooltip, chartPalette, waveformChartOption, type ChartTheme, type WaveformChartInput, type WaveformCrossing,
  type WaveformTrace,
} from '../../../core/charts/index.js';
import { edgeCrossings } from '../../../core/report/waveform-input.js';
import { buildNetCircuit } from '../../../core/netbuild/index.js';

export interface WaveformSelection {
  /** A receiver designator, or '*' for every receiver. */
  receiver: string;
  /** A corner name, or '*' for every corner. */
  corner: string;
  /** Which edges; default both (overlaid, each referenced to its own launch at t = 0). */
  edges?: 'both' | 'rising' | 'falling';
  /** Overlay the driver's output pin. */
  driver?: boolean;
}

export interface Thresholds { vil: number; vih: number; vmaxAbs: number; vminAbs: number }

/**
 * The thresholds a receiver sees at one corner: rail-referenced levels move with the corner's rail
 * factor exactly as the circuit the solver ran is built (core/netbuild). Falls back to the levels
 * the waveforms carry (typical rail) when the circuit cannot be built here.
 */
export function cornerThresholds(
  net: NetDefinition,
  stackup: Stackup | null,
  parts: PartModel[],
  corner: Corner | undefined,
  designator: string,
  fallback: Thresholds,
): Thresholds {
  if (!corner || !stackup) return fallback;
  try {
    const circuit = buildNetCircuit(net, stackup, parts, corner);
    const index = net.receivers.findIndex((r) => r.designator === designator);
    const r = circuit.receivers[index];
    if (!r) return fallback;
    return { vil: r.vil, vih: r.vih, vmaxAbs: r.vmaxAbs ?? fallback.vmaxAbs, vminAbs: r.vminAbs ?? fallback.vminAbs };
  } catch {
    return fallback;
  }
}

export function waveformInput(
  net: NetDefinition,
  waves: NetWaveforms,
  parts: PartModel[],
  corners: Corner[],
  pick: WaveformSelection,
  options: { stackup?: Stackup | null; theme?: ChartTheme } = {},
): WaveformChartInput | null {
  const allReceivers = pick.receiver === '*';
  const chosen = allReceivers ? waves.thresholds : waves.thresholds.filter((th) => th.receiver === pick.receiver);
  const receivers = chosen.length ? chosen : waves.thresholds.slice(0, 1);
  if (!receivers.length) return null;
  const edges = pick.edges ?? 'both';
  const runs = waves.corners.filter((run) => (pick.corner === '*' || run.corner === pick.corner) && (edges === 'both' || run.edge === edges));
  const corner = corners.find((c) => c.name === pick.corner);
  // Levels drawn: those of the first receiver shown, at the corner shown (typical rail for "all corners"):
  // the levels the solve served with that corner's waveform, else rebuilt here from the linear models.
  const servedRun = waves.corners.find((run) => run.corner === pick.corner && run.thresholds?.length);
  const served = (receiver: string) => servedRun?.thresholds?.find((x) => x.receiver === receiver);
  const levelsOf = (th: Thresholds & { receiver: string }): Thresholds =>
    served(th.receiver) ?? cornerThresholds(net, options.stackup ?? null, parts, corner, th.receiver, th);
  const first = receivers[0];
  const levels = levelsOf(first);
  const traces: WaveformTrace[] = [];
  const crossings: WaveformCrossing[] = [];
  const several = receivers.length > 1;
  for (const run of runs) {
    if (pick.driver && run.v[net.driver.node]) {
      traces.push({ edge: run.edge, corner: run.corner, pin: 'driver', label: `driver ${net.driver.designator} ${run.edge} (${run.corner})`, t: run.t, v: run.v[net.driver.node] });
    }
    for (const th of receivers) {
      const key = waveformKey(net, waves, th.receiver);
      const v = run.v[key];
      if (!v) continue;
      traces.push({ edge: run.edge, corner: run.corner, label: `${several ? `${th.receiver} ` : ''}${run.edge} (${run.corner})`, t: run.t, v });
      const own = th === first ? levels : levelsOf(th);
      crossings.push(...edgeCrossings(run.edge, run.t, v, own.vil, own.vih));
    }
  }
  if (!traces.some((t) => t.pin !== 'driver')) return null;
  const driver = parts.find((p) => p.name === net.driver.part)?.driver ?? null;
  const railScale = corner?.rail ?? 1;
  const rails = served(first.receiver);
  const where = several ? `every receiver (levels of ${first.receiver})` : `receiver ${first.receiver}`;
  const cornerWords = pick.corner === '*' ? 'all corners (levels at the typical rail)' : `${pick.corner} corner (its own levels)`;
  return {
    title: `${net.name} at ${where}`,
    subtitle: `${cornerWords}; t = 0 at each edge's launch; circles: threshold crossings used for flight time`,
    traces,
    levels: {
      vil: levels.vil,
      vih: levels.vih,
      vmaxAbs: levels.vmaxAbs,
      vminAbs: levels.vminAbs,
      ...(rails ? { railLow: rails.vlow, railHigh: rails.vhigh } : driver ? { railLow: driver.vol * railScale, railHigh: driver.voh * railScale } : {}),
    },
    crossings,
    theme: options.theme ?? 'light',
  };
}

/**
 * The waveform map is keyed by topology node; thresholds name the receiver by designator (U13).
 * Accepts either, so the view does not depend on which of the two a solver version uses.
 */
export function waveformKey(net: NetDefinition, waves: NetWaveforms, receiver: string): string {
  if (waves.corners.some((run) => run.v[receiver])) return receiver;
  return net.receivers.find((r) => r.designator === receiver)?.node ?? receiver;
}

/** Linear interpolation of a [t, v] polyline at t (null outside it). */
export function valueAt(data: readonly (readonly [number, number])[], t: number): number | null {
  if (!data.length || t < data[0][0] || t > data[data.length - 1][0]) return null;
  let lo = 0;
  let hi = data.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (data[mid][0] <= t) lo = mid;
    else hi = mid;
  }
  const [t0, v0] = data[lo];
  const [t1, v1] = data[hi];
  return t1 === t0 ? v0 : v0 + ((v1 - v0) * (t - t0)) / (t1 - t0);
}

/** Δt readout of two cursors, ns in, words out: "A 1.234 ns · B 2.100 ns · Δt = B − A = 0.866 ns". */
export function cursorReadout(a: number | null, b: number | null): string {
  const ns = (x: number) => `${x < 0 ? '\u2212' : ''}${Math.abs(x).toFixed(3)} ns`;
  if (a === null && b === null) return 'Click the chart to place cursor A, click again for cursor B.';
  if (b === null) return `A ${ns(a!)} · click again for cursor B`;
  if (a === null) return `B ${ns(b)}`;
  return `A ${ns(a)} · B ${ns(b)} · Δt = B \u2212 A = ${ns(b - a)}`;
}

export interface InteractiveState {
  /** Zoomed time window, ns; null = the active window (where the edges are). */
  zoom: { start: number; end: number } | null;
  /** Legend selection by series name (false = hidden). */
  legend: Record<string, boolean>;
  /** Time cursors, ns. */
  cursors: { a: number | null; b: number | null };
}

/** Name of the series that carries levels and cursors (not in the legend, never hidden). */
const MARKS_SERIES = 'levels and cursors';

/**
 * The shared option plus zoom, legend state, cursors and the canvas tooltip. The levels move from the
 * first trace to a series of their own so hiding a trace in the legend never hides the thresholds.
 */
export function interactiveWaveformOption(input: WaveformChartInput, state: InteractiveState = { zoom: null, legend: {}, cursors: { a: null, b: null } }): EChartsOption {
  const option = waveformChartOption(input) as Record<string, unknown>;
  const palette = chartPalette(input.theme ?? 'light');
  const base = option.series as Record<string, unknown>[];
  const lines = base.filter((s) => s.type === 'line');
  const levelMarks = (lines[0]?.markLine as { data: Record<string, unknown>[] } | undefined)?.data ?? [];
  const cursorMarks: Record<string, unknown>[] = [];
  for (const [name, value] of [['A', state.cursors.a], ['B', state.cursors.b]] as const) {
    if (value === null) continue;
    cursorMarks.push({
      name: `cursor ${name}`,
      xAxis: value,
      lineStyle: { color: palette.text, type: 'solid', width: 1 },
      label: { formatter: `${name} ${value.toFixed(3)} ns`, position: 'end', color: palette.text, fontSize: 11 },
    });
  }
  const series: Record<string, unknown>[] = base.map((s) => {
    if (s.type !== 'line') return s;
    const { markLine: _drop, ...rest } = s;
    return { ...rest, sampling: 'lttb', showSymbol: false };
  });
  series.push({
    type: 'line',
    name: MARKS_SERIES,
    data: [],
    silent: true,
    markLine: { symbol: 'none', silent: true, animation: false, data: [...levelMarks, ...cursorMarks] },
  });
  const window = state.zoom ?? activeWindow(input.traces);
  const traceData = new Map(lines.map((s) => [String(s.name), s.data as [number, number][]]));
  const legend = option.legend as Record<string, unknown>;
  return {
    ...option,
    series,
    animation: false,
    legend: { ...legend, data: lines.map((s) => String(s.name)), selected: { ...state.legend } },
    grid: { ...(option.grid as Record<string, unknown>), bottom: 84 },
    // The zoomed end is an arbitrary time: its label would crowd the last tick (the window is stated below the chart).
    xAxis: (() => {
      const x = option.xAxis as Record<string, unknown>;
      return { ...x, nameGap: 26, axisLabel: { ...(x.axisLabel as Record<string, unknown>), showMaxLabel: false } };
    })(),
    dataZoom: [
      { type: 'inside', xAxisIndex: 0, filterMode: 'none', startValue: window.start, endValue: window.end },
      {
        type: 'slider', xAxisIndex: 0, filterMode: 'none', startValue: window.start, endValue: window.end,
        bottom: 10, height: 18, showDetail: true, labelFormatter: (value: number) => `${Number(value).toFixed(2)} ns`,
        textStyle: { color: palette.text }, borderColor: palette.splitLine, fillerColor: 'rgba(110, 166, 216, 0.18)',
      },
    ],
    tooltip: canvasTooltip(palette, (params: unknown) => {
      const list = Array.isArray(params) ? params : [params];
      const t = Number((list[0] as { axisValue?: number })?.axisValue);
      if (!Number.isFinite(t)) return '';
      const rows = [`t = ${t.toFixed(3)} ns`];
      for (const [name, data] of traceData) {
        if (state.legend[name] === false) continue;
        const v = valueAt(data, t);
        if (v !== null) rows.push(`${name}: ${v.toFixed(3)} V`);
      }
      return rows.join('\n');
    }),
  } as EChartsOption;
}
