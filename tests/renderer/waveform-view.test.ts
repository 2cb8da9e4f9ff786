/**
 * Receiver waveform chart input of the net view (renderer/src/lib/waveform-view.ts). docs/design.md §1.1: receiver
 * waveforms for rising and falling edges per corner with the thresholds, rails and measured points marked.
 */
import { describe, expect, it } from 'vitest';
import { cursorReadout, interactiveWaveformOption, valueAt, waveformInput, waveformKey, cornerThresholds } from '../../renderer/src/lib/waveform-view.js';
import type { NetWaveforms } from '../../core/contract/api.js';
import type { Corner, NetDefinition, PartModel } from '../../core/project/model.js';

// Invented net, parts and waveforms for these tests.
const net: NetDefinition = {
  name: 'DQ4', bus: 'MEM', role: 'data',
  driver: { part: 'CTL', node: 'd', designator: 'U1' },
  receivers: [{ part: 'MEMX', node: 'r1', designator: 'U2' }],
  elements: [{ kind: 'segment', a: 'd', b: 'r1', layer: 'L1', width: 100e-6, length: 0.03 }],
  rails: {},
};
const ramp = { t: [0, 1e-9, 2e-9], v: { d: [0, 1.2, 1.2], r1: [0, 1.2, 1.2] } };
const fall = { t: [0, 1e-9, 2e-9], v: { d: [1.2, 0, 0], r1: [1.2, 0, 0] } };
const waves: NetWaveforms = {
  net: 'DQ4',
  corners: [
    { corner: 'slow', edge: 'rising', ...ramp },
    { corner: 'slow', edge: 'falling', ...fall },
    { corner: 'fast', edge: 'rising', ...ramp },
  ],
  thresholds: [{ receiver: 'U2', vil: 0.5, vih: 0.7, vmaxAbs: 1.6, vminAbs: -0.4 }],
};
const parts: PartModel[] = [{
  name: 'CTL', description: '', ioStandard: '', receiver: null,
  driver: { vol: 0, voh: 1.2, routHigh: 40, routLow: 40, riseTime: 1e-10, fallTime: 1e-10, tcoMin: 1e-10, tcoMax: 3e-10, refLoad: { ohms: 50, vtt: 0.6, farads: 0 }, vmeas: 0.6 },
}];
const corners: Corner[] = [
  { name: 'slow', driverStrength: 1.1, edgeRate: 1.2, dk: 1.05, widthDelta: 0, rail: 0.95, cin: 1.1, tco: 'max' },
  { name: 'fast', driverStrength: 0.9, edgeRate: 0.8, dk: 0.95, widthDelta: 0, rail: 1.05, cin: 0.9, tco: 'min' },
];

describe('waveformKey', () => {
  it('finds the node of a receiver named by designator, or uses a name that already keys the waveforms', () => {
    // waveform-view.ts contract: waveforms are keyed by node, thresholds by designator
    expect(waveformKey(net, waves, 'U2')).toBe('r1');
    expect(waveformKey(net, waves, 'r1')).toBe('r1');
    expect(waveformKey(net, waves, 'U9')).toBe('U9');
  });
});

describe('waveformInput', () => {
  it('picks both edges of one corner, marks the threshold crossings and scales the rails by the corner', () => {
    // docs/design.md §1.1: thresholds, rails and measured points marked; rail factor from core/project/model.ts Corner
    const input = waveformInput(net, waves, parts, corners, { receiver: 'U2', corner: 'slow' })!;
    expect(input.title).toBe('DQ4 at receiver U2');
    expect(input.subtitle).toBe('slow corner (its own levels); t = 0 at each edge\'s launch; circles: threshold crossings used for flight time');
    expect(input.traces.map((t) => t.label)).toEqual(['rising (slow)', 'falling (slow)']);
    expect(input.levels).toEqual({ vil: 0.5, vih: 0.7, vmaxAbs: 1.6, vminAbs: -0.4, railLow: 0, railHigh: 1.2 * 0.95 });
    // linear ramps 0 -> 1.2 V in 1 ns: VIL 0.5 V at 0.5/1.2 ns, VIH 0.7 V at 0.7/1.2 ns (first and last coincide)
    const rising = (input.crossings ?? []).filter((c) => c.edge === 'rising');
    expect(rising.map((c) => c.level)).toEqual(['VIL', 'VIH']);
    expect(rising[0].t).toBeCloseTo((0.5 / 1.2) * 1e-9, 21); // 1e-21 s: interpolation in floats
    expect(rising[1].t).toBeCloseTo((0.7 / 1.2) * 1e-9, 21);
    expect((input.crossings ?? []).filter((c) => c.edge === 'falling').map((c) => c.level)).toEqual(['VIH', 'VIL']);
  });

  it('shows every corner for "*" at nominal rails, and null when there is nothing to draw', () => {
    // waveform-view.ts contract: '*' means every corner
    const all = waveformInput(net, waves, parts, corners, { receiver: 'U2', corner: '*' })!;
    expect(all.traces.map((t) => t.label)).toEqual(['rising (slow)', 'falling (slow)', 'rising (fast)']);
    expect((all.subtitle ?? '').startsWith('all corners (levels at the typical rail);')).toBe(true);
    expect(all.levels.railHigh).toBe(1.2);
    expect(waveformInput(net, waves, parts, corners, { receiver: 'U2', corner: 'typical' })).toBeNull();
    expect(waveformInput(net, { ...waves, thresholds: [] }, parts, corners, { receiver: 'U2', corner: 'slow' })).toBeNull();
  });

  it('leaves the rails out when the driver part is unknown', () => {
    // docs/design.md §9: state what was modelled
    const input = waveformInput(net, waves, [], corners, { receiver: 'U2', corner: 'slow' })!;
    expect('railHigh' in input.levels).toBe(false);
  });
});

describe('waveformInput overlays', () => {
  it('adds the driver pin on request, tagged as the driver, and filters edges', () => {
    // Workbench issue: "driver pin and every receiver overlaid on request"
    const both = waveformInput(net, waves, parts, corners, { receiver: 'U2', corner: 'slow', driver: true })!;
    expect(both.traces.map((t) => `${t.pin ?? 'receiver'} ${t.edge}`)).toEqual(['driver rising', 'receiver rising', 'driver falling', 'receiver falling']);
    expect(both.traces[0].label).toBe('driver U1 rising (slow)');
    const rising = waveformInput(net, waves, parts, corners, { receiver: 'U2', corner: '*', edges: 'rising' })!;
    expect(rising.traces.map((t) => t.label)).toEqual(['rising (slow)', 'rising (fast)']);
    expect(rising.traces.map((t) => t.corner)).toEqual(['slow', 'fast']);
  });

  it('draws every receiver when asked, naming the receiver in each trace', () => {
    const two: NetDefinition = { ...net, receivers: [...net.receivers, { part: 'MEMX', node: 'r2', designator: 'U3' }] };
    const w: NetWaveforms = {
      ...waves,
      corners: waves.corners.map((c) => ({ ...c, v: { ...c.v, r2: c.v.r1 } })),
      thresholds: [...waves.thresholds, { receiver: 'U3', vil: 0.5, vih: 0.7, vmaxAbs: 1.6, vminAbs: -0.4 }],
    };
    const input = waveformInput(two, w, parts, corners, { receiver: '*', corner: 'slow', edges: 'rising' })!;
    expect(input.traces.map((t) => t.label)).toEqual(['U2 rising (slow)', 'U3 rising (slow)']);
  });

  it('uses the fallback thresholds when the circuit cannot be built (no stackup given)', () => {
    const fallback = { vil: 0.5, vih: 0.7, vmaxAbs: 1.6, vminAbs: -0.4 };
    expect(cornerThresholds(net, null, parts, corners[0], 'U2', fallback)).toBe(fallback);
  });
});

describe('cursor and tooltip helpers', () => {
  it('interpolates a polyline linearly and is null outside it', () => {
    // hand calculation: halfway between (1, 0) and (2, 1.2) is 0.6
    expect(valueAt([[0, 0], [1, 0], [2, 1.2]], 1.5)).toBeCloseTo(0.6, 12);
    expect(valueAt([[0, 0], [1, 1]], 2)).toBeNull();
  });

  it('reads out delta-t as B minus A with a true minus sign', () => {
    expect(cursorReadout(1.5, 1.25)).toBe('A 1.500 ns · B 1.250 ns · Δt = B \u2212 A = \u22120.250 ns');
    expect(cursorReadout(null, null)).toMatch(/^Click the chart/);
  });
});

describe('interactiveWaveformOption', () => {
  it('adds sampling to line series and a tooltip with units', () => {
    // docs/design.md §8: numbers shown to people carry their units
    const input = waveformInput(net, waves, parts, corners, { receiver: 'U2', corner: 'slow' })!;
    const option = interactiveWaveformOption(input) as Record<string, unknown>;
    const lines = (option.series as Record<string, unknown>[]).filter((s) => s.type === 'line' && s.name !== 'levels and cursors');
    expect(lines.length).toBeGreaterThan(0);
    expect(lines.every((s) => s.sampling === 'lttb' && s.showSymbol === false)).toBe(true);
    // Canvas tooltip: an HTML one writes inline styles, which the page's style-src 'self' refuses.
    const tooltip = option.tooltip as { renderMode: string; formatter: (p: unknown) => string };
    expect(tooltip.renderMode).toBe('richText');
    // ramp r1 = 0 -> 1.2 V over 1 ns: at 0.5 ns it reads 0.600 V on both slow edges (falling 1.2 -> 0: 0.600 V too)
    expect(tooltip.formatter([{ axisValue: 0.5 }])).toBe('t = 0.500 ns\nrising (slow): 0.600 V\nfalling (slow): 0.600 V');
    expect(option.animation).toBe(false);
  });

  it('keeps levels on a series outside the legend, adds cursors, zoom and the legend state', () => {
    const input = waveformInput(net, waves, parts, corners, { receiver: 'U2', corner: 'slow' })!;
    const option = interactiveWaveformOption(input, { zoom: { start: 0.2, end: 1.1 }, legend: { 'rising (slow)': false }, cursors: { a: 0.3, b: 0.9 } }) as Record<string, any>;
    const marks = option.series.find((s: any) => s.name === 'levels and cursors');
    expect(marks.markLine.data.map((d: any) => d.name)).toEqual(['VIH', 'VIL', 'rail', 'rail', 'max', 'min', 'cursor A', 'cursor B']);
    expect(option.legend.data).toEqual(['rising (slow)', 'falling (slow)']);
    expect(option.legend.selected).toEqual({ 'rising (slow)': false });
    expect(option.dataZoom.map((z: any) => [z.type, z.startValue, z.endValue])).toEqual([['inside', 0.2, 1.1], ['slider', 0.2, 1.1]]);
    // A hidden trace is left out of the tooltip too.
    expect(option.tooltip.formatter([{ axisValue: 0.5 }])).toBe('t = 0.500 ns\nfalling (slow): 0.600 V');
  });
});

describe('levels served with a corner\'s waveform', () => {
  it('draws the levels and rails the solve sent with that corner (an IBIS net\'s, which the page cannot rebuild)', () => {
    // core/engine/waveforms.ts: each corner's run carries its receivers' levels and the driver's rails
    const served = { receiver: 'U2', vil: 0.47, vih: 0.67, vmaxAbs: 1.5, vminAbs: -0.3, vlow: 0.01, vhigh: 1.13 };
    const withLevels: NetWaveforms = { ...waves, corners: waves.corners.map((run) => (run.corner === 'slow' ? { ...run, thresholds: [served] } : run)) };
    const input = waveformInput(net, withLevels, parts, corners, { receiver: 'U2', corner: 'slow' }, { stackup: null })!;
    expect(input.levels).toEqual({ vil: 0.47, vih: 0.67, vmaxAbs: 1.5, vminAbs: -0.3, railLow: 0.01, railHigh: 1.13 });
    // crossings at the served levels: VIL 0.47 V of the 0 -> 1.2 V ramp in 1 ns at 0.47/1.2 ns (1e-21 s: floats)
    expect(input.crossings!.find((c) => c.edge === 'rising' && c.level === 'VIL')!.t).toBeCloseTo((0.47 / 1.2) * 1e-9, 21);
  });
});

describe('cornerThresholds on the demo project (its linear models)', () => {
  it('moves rail-referenced thresholds with the shown corner\'s rail factor, as the solved circuit does', async () => {
    const { buildLinearDemoProject } = await import('../../fixtures/demo/demo-project.js');
    const project = buildLinearDemoProject();
    const net = project.nets.find((n) => n.role === 'data')!;
    const model = project.parts.find((p) => p.name === net.receivers[0].part)!.receiver!;
    const slow = project.corners.find((c) => c.rail !== 1)!;
    const fallback = { vil: model.vil, vih: model.vih, vmaxAbs: model.vmaxAbs, vminAbs: model.vminAbs };
    const th = cornerThresholds(net, project.stackup, project.parts, slow, net.receivers[0].designator, fallback);
    // core/netbuild/build-circuit.ts: Vref scales with the rail, VIL and VIH keep their offsets from it.
    const vref = model.vref * slow.rail;
    expect(th.vil).toBeCloseTo(vref - (model.vref - model.vil), 12); // 1e-12 V: float arithmetic only
    expect(th.vih).toBeCloseTo(vref + (model.vih - model.vref), 12);
    expect(th.vil).not.toBeCloseTo(model.vil, 6); // the corner's own levels, not the typical ones
  });
});
