/**
 * The what-if sweep chart (core/charts/sweep.ts, docs/workbench.md "What-if sweep"): units on both
 * axes, the present value and the guard band drawn as lines, the engine's length window shaded at its
 * own edges, and each value failing a signal-quality check banded and marked with the check named in
 * its tooltip. Data: sweeps of the invented demo project (fixtures/demo). Behaviour, no numeric source needed.
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { sweepNet } from '../../../core/engine/sweep.js';
import { sweepChartOption, sweepPointText } from '../../../core/charts/sweep.js';
import type { BusDefinition, NetDefinition, ProjectData } from '../../../core/project/model.js';

const demo = buildDemoProject();
type Loose = Record<string, any>;

describe('length sweep chart of DQ12', () => {
  const sweep = sweepNet(demo, 'DQ12', { quantity: { kind: 'length', elementIndex: 2 }, start: 0.02, stop: 0.12, points: 6 });
  const option = sweepChartOption(sweep, { lengthUnit: 'mm' }) as Loose;

  it('states the units on both axes and draws the values in them', () => {
    expect(option.xAxis.name).toBe('Length of segment 3 on L3_SIG (mm)');
    expect(option.yAxis.name).toBe('Margin (ps)');
    const setup = option.series.find((s: Loose) => s.name === 'Setup margin');
    // 20 mm and the setup margin in ps (unit conversion only: 1e-3 m per mm, 1e-12 s per ps)
    expect(setup.data[0][0]).toBeCloseTo(20, 9);
    expect(setup.data[0][1]).toBeCloseTo(sweep.points[0].setupMargin! / 1e-12, 9);
  });

  it('marks the present value, zero and the guard band, and shades the engine length window', () => {
    const setup = option.series.find((s: Loose) => s.name === 'Setup margin');
    const lines = setup.markLine.data as Loose[];
    expect(lines.find((l) => l.name === 'present value')!.xAxis).toBeCloseTo(sweep.current / 1e-3, 9);
    expect(lines.find((l) => l.name === 'guard band')!.yAxis).toBeCloseTo(25, 9);
    expect(lines.find((l) => l.name === 'zero margin')!.yAxis).toBe(0);
    const window = (setup.markArea.data as Loose[][]).find((a) => a[0].name === 'length window')!;
    expect(window[0].xAxis).toBeCloseTo(sweep.lengthWindow!.min! / 1e-3, 9);
    expect(window[1].xAxis).toBeCloseTo(sweep.lengthWindow!.max! / 1e-3, 9);
  });

  it('draws its tooltip on the canvas (no inline-styled HTML) and draws in mil on request', () => {
    expect(option.tooltip.renderMode).toBe('richText');
    const mil = sweepChartOption(sweep, { lengthUnit: 'mil', theme: 'dark' }) as Loose;
    expect(mil.xAxis.name).toMatch(/\(mil\)$/);
    expect(mil.backgroundColor).not.toBe(option.backgroundColor);
  });
});

describe('resistance sweep chart with signal-quality failures', () => {
  const bus: BusDefinition = {
    name: 'LB', kind: 'common-clock', description: 'test bus', referenceNet: null,
    timing: { kind: 'common-clock', cycleTime: 6.5e-9, clockSkew: 0, jitter: 0 }, allowances: [],
  };
  const net: NetDefinition = {
    name: 'W1', bus: 'LB', role: 'data',
    driver: { part: 'MC-LB', node: 'drv', designator: 'U1' },
    receivers: [{ part: 'EXP-LB', node: 'rx', designator: 'U2' }],
    elements: [
      { kind: 'resistor', a: 'drv', b: 's', ohms: 22 },
      { kind: 'segment', a: 's', b: 'rx', layer: 'L6_SIG', width: 105e-6, length: 0.1 },
    ],
    rails: {},
  };
  const project: ProjectData = { ...demo, buses: [bus], nets: [net] };
  const sweep = sweepNet(project, 'W1', { quantity: { kind: 'resistance', elementIndex: 0 }, start: 1, stop: 61, points: 4 });
  const option = sweepChartOption(sweep) as Loose;

  it('has an Ω axis, no length window, and one red marker and band per failing value', () => {
    expect(option.xAxis.name).toMatch(/\(Ω\)$/);
    const setup = option.series.find((s: Loose) => s.name === 'Setup margin');
    expect((setup.markArea.data as Loose[][]).some((a) => a[0].name === 'length window')).toBe(false);
    const failing = sweep.points.filter((p) => p.failingChecks.length > 0);
    expect(failing.length).toBeGreaterThan(0);
    const marks = option.series.find((s: Loose) => s.name === 'Signal-quality fail');
    expect(marks.data).toHaveLength(failing.length);
    expect(marks.data[0][0]).toBe(failing[0].value);
    expect(setup.markArea.data.length).toBeGreaterThan(0);
  });

  it('names the failing check, receiver, edge and corner in the tooltip text', () => {
    const text = sweepPointText(sweep.points[0], 'Ω', true);
    expect(text).toMatch(/^1\.0 Ω/);
    expect(text).toMatch(/signal quality: overshoot fails \d+×, worst U2 rising at fast: \d\.\d{3} V against 2\.100 V/);
    expect(text).toMatch(/setup margin \d+\.\d ps/);
  });
});
