import { describe, expect, it } from 'vitest';
import { pickWaveform, plotCorner } from '../../../core/report/waveform-input.js';
import { netWaveforms } from '../../../core/engine/waveforms.js';
import { buildNetCircuit } from '../../../core/netbuild/index.js';
import { loadProject, loadResult } from './fixture.js';

describe('report plot from the solver\'s net waveforms', () => {
  it('finds the receiver trace by designator and plots the failing check\'s corner, settled at the driver levels', () => {
    const project = loadProject();
    const dq3 = loadResult().buses[0].nets.find((n) => n.net === 'DQ3')!; // overshoot fails at U5, fast corner
    const def = project.nets.find((n) => n.name === 'DQ3')!;
    const nodeOf = (r: string) => def.receivers.find((x) => x.designator === r)?.node ?? r;
    const pick = pickWaveform(dq3, netWaveforms(project, 'DQ3'), null, nodeOf)!;
    expect(pick.receiver).toBe('U5');
    expect(pick.corner).toBe('fast');
    const circuit = buildNetCircuit(def, project.stackup, project.parts, project.corners.find((c) => c.name === 'fast')!);
    // A line ending in a capacitor draws no DC current, so each edge settles at the driver's level
    // (DC steady state, docs/design.md §2). 2 % of the swing allows for ringing not yet died out at the stop time.
    const swing = circuit.driver.vhigh - circuit.driver.vlow;
    const [rising, falling] = pick.input.traces;
    expect(Math.abs(rising.v[rising.v.length - 1] - circuit.driver.vhigh)).toBeLessThan(0.02 * swing);
    expect(Math.abs(falling.v[falling.v.length - 1] - circuit.driver.vlow)).toBeLessThan(0.02 * swing);
    expect(pick.input.crossings!.map((c) => `${c.edge} ${c.level}`)).toEqual(expect.arrayContaining(['rising VIL', 'rising VIH', 'falling VIH', 'falling VIL']));
  });
});

describe('plotCorner', () => {
  it('shows the corner of the failing signal check, else the worst corner', () => {
    const nets = loadResult().buses[0].nets;
    expect(plotCorner(nets.find((n) => n.net === 'DQ3')!)).toBe('fast'); // overshoot fails at fast
    expect(plotCorner(nets.find((n) => n.net === 'DQ2')!)).toBe('slow'); // setup, worst corner slow
  });
});
