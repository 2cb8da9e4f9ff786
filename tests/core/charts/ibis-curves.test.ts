/**
 * The IBIS curve charts (docs/ibis.md §10): V-I tables drawn against the pad voltage, each converted
 * with the reference it is tabulated from (§4, "The pad current"), current into the pin in mA; V-T
 * tables against time in ns with their fixtures in the legend; units on both axes; canvas tooltips.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ibisViChartOption, ibisVtChartOption, viAtPad, fixtureText } from '../../../core/charts/ibis-curves.js';
import { chartPalette } from '../../../core/charts/style.js';
import { ibisCurvesAt, type ModelCurves } from '../../../core/ibis/curves.js';
import { parseIbis } from '../../../core/ibis/parse.js';

type Any = Record<string, any>;

const WREN = readFileSync(new URL('../../../fixtures/ibis/wren_mc7.ibs', import.meta.url), 'utf8');
const dq40 = parseIbis(WREN, 'wren_mc7.ibs').models.find((m) => m.name === 'dq_drv40')!;

// An invented model's curves at one column, small enough to check by hand.
const small: ModelCurves = {
  model: 'tiny', column: 'typ',
  pullup: { v: [-1, 0, 1], i: [0.02, 0, -0.03], reference: 1.2 },
  pulldown: { v: [-1, 0, 1], i: [-0.02, 0, 0.03], reference: 0 },
  gndClamp: null,
  powerClamp: null,
  rising: [{ t: [0, 1e-9], v: [0, 0.6], rFixture: 50, vFixture: 0, cFixture: 0 }],
  falling: [{ t: [0, 1e-9], v: [1.2, 0.6], rFixture: 50, vFixture: 1.2, cFixture: 5e-12 }],
  cComp: 1e-12, vinl: null, vinh: null,
};

describe('V-I chart', () => {
  it('puts a pull-up table at reference minus table voltage and a pull-down at reference plus it, ascending', () => {
    // docs/ibis.md §4: [Pullup] is tabulated against Vpu − V, [Pulldown] against V − Vpd. Hand calculation:
    // table −1, 0, 1 V below 1.2 V -> pad 2.2, 1.2, 0.2 V; sorted ascending: 0.2, 1.2, 2.2 V.
    expect(viAtPad(small.pullup!, true)).toEqual([[0.19999999999999996, -0.03], [1.2, 0], [2.2, 0.02]]);
    expect(viAtPad(small.pulldown!, false)).toEqual([[-1, -0.02], [0, 0], [1, 0.03]]);
  });

  it('draws current into the pin in mA against the pad voltage in V, the references in the legend', () => {
    const o = ibisViChartOption(small) as Any;
    expect(o.xAxis.name).toBe('Pad voltage (V)');
    expect(o.yAxis.name).toBe('Current into the pin (mA)');
    expect(o.series.map((s: Any) => s.name)).toEqual(['[Pullup] ref 1.2 V', '[Pulldown] ref 0 V']);
    // 0.03 A = 30 mA (unit conversion, hand calculation).
    expect(o.series[1].data[2]).toEqual([1, 30]);
    // A canvas tooltip: an HTML one needs inline styles the page's policy forbids (common practice, no source).
    expect(o.tooltip.renderMode).toBe('richText');
  });

  it('draws every V-I table of a real model of the fixture file, each crossing zero current at its own rail', () => {
    const curves = ibisCurvesAt(dq40, 'typ');
    const o = ibisViChartOption(curves, { theme: 'dark' }) as Any;
    expect(o.series.map((s: Any) => s.name.split(' ref')[0])).toEqual(['[Pullup]', '[Pulldown]', '[GND Clamp]', '[POWER Clamp]']);
    // A pull-up sources no current with the pad at its own rail, a pull-down none at 0 V: the tables' 0 V row
    // (ANSI/EIA-656 V-I table definition: current at zero voltage across the device). Tolerance: the
    // file's own 0 V rows are written as 0 to its printed precision (fixtures/ibis/README.md).
    const at = (data: [number, number][], v: number) => data.find(([x]) => Math.abs(x - v) < 1e-9)?.[1];
    expect(Math.abs(at(o.series[0].data, curves.pullup!.reference)!)).toBeLessThan(1e-6);
    expect(Math.abs(at(o.series[1].data, curves.pulldown!.reference)!)).toBeLessThan(1e-6);
    // Dark theme: axis text in the dark palette's text colour (readable on the dark background).
    expect(o.xAxis.axisLabel.color).toBe(chartPalette('dark').text);
    expect(o.backgroundColor).toBe(chartPalette('dark').background);
  });
});

describe('V-T chart', () => {
  it('names each waveform with its fixture and draws time in ns', () => {
    const o = ibisVtChartOption(small) as Any;
    expect(o.xAxis.name).toBe('Time (ns)');
    expect(o.yAxis.name).toBe('Pin voltage (V)');
    expect(o.series.map((s: Any) => s.name)).toEqual(['[Rising Waveform] 1: 50 Ω to 0 V', '[Falling Waveform] 1: 50 Ω to 1.2 V, 5 pF']);
    // 1e-9 s = 1 ns (unit conversion, hand calculation).
    expect(o.series[0].data[1]).toEqual([1, 0.6]);
    expect(o.xAxis.min).toBe(0);
  });

  it('shows all four waveforms of dq_drv40 with their fixtures at the min column', () => {
    const curves = ibisCurvesAt(dq40, 'min');
    const o = ibisVtChartOption(curves) as Any;
    // fixtures/ibis/wren_mc7.ibs: dq_drv40 has two rising and two falling waveforms (the summary lists x2 each).
    expect(o.series.length).toBe(4);
    for (const [k, w] of [...curves.rising, ...curves.falling].entries()) expect(o.series[k].name).toContain(fixtureText(w));
    expect(o.title.text).toContain('min column');
  });
});
