import { describe, expect, it } from 'vitest';
import { waveformChartOption, traceStyles, activeWindow, type WaveformChartInput } from '../../../core/charts/waveform.js';
import { chartPalette, TRACE_COLOR } from '../../../core/charts/style.js';
import { decimateMinMax } from '../../../core/charts/decimate.js';

// Invented waveform: a 1 ns linear ramp from 0 to 1.2 V starting at 0.5 ns, 5 ps samples to 4 ns.
function rampInput(extra: Partial<WaveformChartInput> = {}): WaveformChartInput {
  const t: number[] = [];
  const v: number[] = [];
  for (let i = 0; i <= 800; i++) {
    t.push(i * 5e-12);
    v.push(Math.min(1.2, Math.max(0, ((i * 5e-12 - 0.5e-9) / 1e-9) * 1.2)));
  }
  return {
    title: 'DQ7 at U9',
    traces: [
      { edge: 'rising', label: 'rising (slow)', t, v },
      { edge: 'falling', label: 'falling (slow)', t, v: v.map((x) => 1.2 - x) },
    ],
    levels: { vil: 0.5, vih: 0.7 },
    ...extra,
  };
}

type Any = Record<string, any>;

describe('waveformChartOption', () => {
  it('labels the axes with quantity and unit and turns animation off', () => {
    const o = waveformChartOption(rampInput()) as Any;
    expect(o.animation).toBe(false); // exported charts come out blank mid-animation (ECharts docs)
    expect(o.xAxis.name).toBe('Time (ns)');
    expect(o.yAxis.name).toBe('Voltage (V)');
    expect(o.textStyle.fontSize).toBeGreaterThanOrEqual(11); // readable in print: common practice, no source
  });

  it('converts seconds to nanoseconds and keeps volts', () => {
    const o = waveformChartOption(rampInput()) as Any;
    const data: [number, number][] = o.series[0].data;
    // sample i = 200 is t = 1 ns, v = 0.6 V by construction of the ramp
    const point = data.find(([t]) => Math.abs(t - 1) < 1e-9);
    expect(point).toBeDefined();
    expect(point![1]).toBeCloseTo(0.6, 12);
    expect(o.xAxis.max).toBe(4); // last sample 4 ns, already a tidy number
  });

  it('marks VIL and VIH, and rails and limits only when given', () => {
    const plain = waveformChartOption(rampInput()) as Any;
    const names = (o: Any) => o.series[0].markLine.data.map((d: Any) => `${d.name}@${d.yAxis}`);
    expect(names(plain)).toEqual(['VIH@0.7', 'VIL@0.5']);
    const full = waveformChartOption(rampInput({ levels: { vil: 0.5, vih: 0.7, railLow: 0, railHigh: 1.2, vmaxAbs: 1.6, vminAbs: -0.4 } })) as Any;
    expect(names(full)).toEqual(['VIH@0.7', 'VIL@0.5', 'rail@1.2', 'rail@0', 'max@1.6', 'min@-0.4']);
    // Only the first trace carries the marks, so they are drawn once.
    expect(full.series[1].markLine).toBeUndefined();
  });

  it('sets the voltage range to include the data and every marked level', () => {
    const o = waveformChartOption(rampInput({ levels: { vil: 0.5, vih: 0.7, vmaxAbs: 1.6, vminAbs: -0.4 } })) as Any;
    expect(o.yAxis.min).toBeLessThanOrEqual(-0.4);
    expect(o.yAxis.max).toBeGreaterThanOrEqual(1.6);
  });

  it('draws measured crossings as points in ns and V', () => {
    const o = waveformChartOption(rampInput({ crossings: [{ edge: 'rising', level: 'VIH', t: 1.0833e-9, v: 0.7 }] })) as Any;
    const scatter = o.series.find((s: Any) => s.type === 'scatter');
    expect(scatter.data).toHaveLength(1);
    expect(scatter.data[0][0]).toBeCloseTo(1.0833, 9);
    expect(scatter.data[0][1]).toBe(0.7);
  });

  it('is pure and serialisable (the same input gives the same option, which survives JSON)', () => {
    const a = waveformChartOption(rampInput());
    const b = waveformChartOption(rampInput());
    expect(a).toEqual(b);
    expect(JSON.parse(JSON.stringify(a))).toEqual(a);
  });
});

describe('decimateMinMax', () => {
  it('keeps a one-sample overshoot peak while thinning 10 000 samples to at most 600', () => {
    const t = Array.from({ length: 10_000 }, (_, i) => i * 1e-12);
    const v = t.map(() => 1.0);
    v[4321] = 1.73; // the peak a plain every-nth pick would step over
    v[7000] = 0.21;
    const out = decimateMinMax(t, v, 600);
    expect(out.length).toBeLessThanOrEqual(600);
    expect(Math.max(...out.map((p) => p[1]))).toBe(1.73);
    expect(Math.min(...out.map((p) => p[1]))).toBe(0.21);
    // Time order is preserved (a line chart would zig-zag otherwise).
    for (let i = 1; i < out.length; i++) expect(out[i][0]).toBeGreaterThan(out[i - 1][0]);
    expect(out[0]).toEqual([0, 1]);
    expect(out[out.length - 1]).toEqual([t[9999], 1]);
  });

  it('returns short waveforms unchanged', () => {
    expect(decimateMinMax([0, 1, 2], [5, 6, 7], 600)).toEqual([[0, 5], [1, 6], [2, 7]]);
  });
});

describe('trace styles and themes', () => {
  const t = [0, 1e-9, 2e-9];
  const v = [0, 1, 1];
  const trace = (corner: string, edge: 'rising' | 'falling', pin?: 'driver') => ({ corner, edge, pin, label: `${edge} (${corner})`, t, v });

  it('gives every corner, edge and pin its own colour-and-dash pair (three corners, two edges, both pins)', () => {
    // Requirement from the workbench issue: "a distinct colour and dash per corner and edge"; no source beyond it.
    const traces = ['slow', 'typical', 'fast'].flatMap((c) => [trace(c, 'rising'), trace(c, 'falling'), trace(c, 'rising', 'driver'), trace(c, 'falling', 'driver')]);
    const styles = traceStyles(traces);
    const pairs = new Set(styles.map((s) => `${s.color}|${JSON.stringify(s.dash)}`));
    expect(pairs.size).toBe(traces.length);
    // Receiver colours alone already separate corner and edge (six receiver traces, six colours).
    const receiverColours = new Set(styles.filter((_, i) => traces[i].pin !== 'driver').map((s) => s.color));
    expect(receiverColours.size).toBe(6);
    // Rising solid, falling dashed: the edge reads without colour (common practice, no source).
    expect(styles[0].dash).toBe('solid');
    expect(Array.isArray(styles[1].dash)).toBe(true);
  });

  it('keeps the report\'s rising/falling colours for a single corner', () => {
    const styles = traceStyles([trace('slow', 'rising'), trace('slow', 'falling')]);
    expect(styles.map((s) => s.color)).toEqual([TRACE_COLOR.rising, TRACE_COLOR.falling]);
  });

  it('draws the series with those styles and uses the dark palette when asked', () => {
    const dark = waveformChartOption({ ...rampInput(), theme: 'dark' }) as Any;
    const light = waveformChartOption(rampInput()) as Any;
    expect(dark.backgroundColor).toBe(chartPalette('dark').background);
    expect(light.backgroundColor).toBe('#ffffff'); // printed reports stay white
    expect(dark.xAxis.axisLabel.color).toBe(chartPalette('dark').text);
    expect(dark.series[1].lineStyle.type).toEqual([7, 4]);
    expect(dark.series[0].lineStyle.color).not.toBe(light.series[0].lineStyle.color);
  });

  it('puts both ends of the voltage axis on its tick step, so end labels never crowd a tick', () => {
    const o = waveformChartOption(rampInput({ levels: { vil: 0.47, vih: 0.67, vmaxAbs: 1.5, vminAbs: -0.3 } })) as Any;
    // Multiples of the interval within float rounding (1e-9 of a step: printing precision, common practice).
    const onStep = (x: number) => Math.abs(x / o.yAxis.interval - Math.round(x / o.yAxis.interval)) < 1e-9;
    expect(onStep(o.yAxis.min) && onStep(o.yAxis.max)).toBe(true);
    expect(o.yAxis.min).toBeLessThanOrEqual(-0.3);
    expect(o.yAxis.max).toBeGreaterThanOrEqual(1.5);
  });

  it('opens the active window on the edge, not the whole settled tail', () => {
    // Invented: a ramp that settles at 1.5 ns on a 10 ns record; 2 % band, 30 % tail beyond it.
    const tt = Array.from({ length: 1001 }, (_, i) => i * 10e-12);
    const vv = tt.map((x) => Math.min(1, x / 1.5e-9));
    const w = activeWindow([{ edge: 'rising', label: 'r', t: tt, v: vv }]);
    expect(w.start).toBe(0);
    // Last sample outside 2 % of the final value: v < 0.98 until t = 1.47 ns; one sample later 1.48 ns; x 1.3 = 1.924 ns.
    expect(w.end).toBeCloseTo(1.924, 3);
  });
});
