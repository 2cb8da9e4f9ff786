/**
 * The length window is consistent (docs/design.md §6.3): re-simulated at each window edge a net has zero margin
 * within 1 ps (or sits on a signal-quality limit), and just outside the window it fails. Also the search
 * itself on functions with known roots. Stackup and parts: the invented demo project (fixtures/demo).
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { netBudget } from '../../../core/budget/net-budget.js';
import { netParts } from '../../../core/netbuild/index.js';
import { searchLengthWindow } from '../../../core/engine/length-window.js';
import type { BusDefinition, NetDefinition, ProjectData } from '../../../core/project/model.js';

const demo = buildDemoProject();
const bus: BusDefinition = {
  name: 'LB', kind: 'common-clock', description: 'test bus', referenceNet: null,
  timing: { kind: 'common-clock', cycleTime: 6.5e-9, clockSkew: 0, jitter: 0 },
  // a large hold allowance makes hold bind when the net gets short (so both window edges are closed)
  allowances: [{ name: 'hold test allowance', value: 1.1e-9, appliesTo: 'hold', note: 'test only' }],
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

/** Full re-simulation (every corner, both edges) with segment 2 at `length`. */
function recheck(length: number) {
  const parts = netParts(net, project.parts);
  const measures = simulateNetMeasures(project, net, { length: { elementIndex: 1, length } });
  return netBudget({
    net, bus, corners: project.corners, driverPart: parts.driver,
    receivers: new Map(parts.receivers.map((r) => [r.designator, r.model])), strobe: null, guardBand: project.info.guardBand,
  }, measures);
}

describe('length window of a common-clock net', () => {
  const solved = solveNet(project, 'W1', {});
  const w = solved.result.lengthWindow!;

  it('is closed at both ends within the search range, around the present length', () => {
    expect(solved.result.status).not.toBe('fail');
    expect(w.min).not.toBeNull();
    expect(w.max).not.toBeNull();
    expect(w.min!).toBeLessThan(0.1);
    expect(w.max!).toBeGreaterThan(0.1);
    expect(w.min!).toBeGreaterThan(0.02); // not the 0.2x search limit
    expect(w.max!).toBeLessThan(0.3); // not the 3x search limit
    expect(w.note).toMatch(/shortest length set by hold margin; longest length set by setup margin/);
  });

  it('has zero margin within 1 ps at each edge, re-simulated at every corner (common practice, no source)', () => {
    const atMin = recheck(w.min!);
    const atMax = recheck(w.max!);
    expect(Math.abs(atMin.holdMargin!)).toBeLessThan(1e-12);
    expect(Math.abs(atMax.setupMargin!)).toBeLessThan(1e-12);
    expect(atMin.status).not.toBe('fail');
    expect(atMax.status).not.toBe('fail');
  });

  it('fails just outside each edge (0.5 mm, about 3.5 ps of stripline delay)', () => {
    expect(recheck(w.min! - 0.5e-3).holdMargin).toBeLessThan(0);
    expect(recheck(w.max! + 0.5e-3).setupMargin).toBeLessThan(0);
    expect(recheck(w.min! - 0.5e-3).status).toBe('fail');
    expect(recheck(w.max! + 0.5e-3).status).toBe('fail');
  });

  it('also gives the window for margins >= the guard band, inside the first, its edges at the guard band within 1 ps', () => {
    // the demo's guard band (25 ps); re-simulated at every corner at each guard edge (common practice, no source)
    const gb = project.info.guardBand;
    expect(w.guardBand).toBe(gb);
    expect(w.guardMin!).toBeGreaterThan(w.min!);
    expect(w.guardMax!).toBeLessThan(w.max!);
    expect(Math.abs(recheck(w.guardMin!).holdMargin! - gb)).toBeLessThan(1e-12);
    expect(Math.abs(recheck(w.guardMax!).setupMargin! - gb)).toBeLessThan(1e-12);
    // ~ 25 ps of stripline delay (about 7 ps/mm, docs/design.md §3.6) is about 3.6 mm per edge
    expect(w.guardMin! - w.min!).toBeGreaterThan(2e-3);
    expect(w.guardMin! - w.min!).toBeLessThan(6e-3);
    expect(w.note).toMatch(/segment 2 on L6_SIG .*margins >= 0: .*margins >= the 25 ps guard band: \d/);
  });
});

describe('searchLengthWindow on margins with known roots (common practice, no source)', () => {
  it('finds linear roots to the margin tolerance and says which margin bounds each edge', () => {
    // setup = 100 ps - (L - 50 mm) * 7 ps/mm, zero at 64.2857 mm; hold = (L - 30 mm) * 7 ps/mm, zero at 30 mm
    let calls = 0;
    const w = searchLengthWindow((L) => {
      calls++;
      return { setupMargin: 100e-12 - (L - 0.05) * 7e-9, holdMargin: (L - 0.03) * 7e-9, qualityPass: true };
    }, 0.05);
    expect(w.max!).toBeCloseTo(0.05 + 100 / 7 / 1000, 4); // within 0.1 mm, i.e. the 0.25 ps tolerance / 7 ps/mm
    expect(w.min!).toBeCloseTo(0.03, 4);
    expect(w.maxBound).toBe('setup');
    expect(w.minBound).toBe('hold');
    expect(calls).toBeLessThan(14); // linear margins: the extrapolation lands next to each root
  });

  it('stops at a signal-quality boundary by bisection to the stated 25 um resolution (docs/design.md §6.3)', () => {
    const w = searchLengthWindow((L) => ({ setupMargin: 1e-9, holdMargin: 1e-9, qualityPass: L < 0.0734 }), 0.05);
    expect(w.max!).toBeLessThan(0.0734);
    expect(w.max!).toBeGreaterThan(0.0734 - 25e-6);
    expect(w.maxBound).toBe('quality');
    expect(w.minOpen).toBe(true);
    expect(w.min).toBeCloseTo(0.01, 12); // 0.2x the present length: open-ended
  });

  it('reports no window when no length in the range passes', () => {
    const w = searchLengthWindow(() => ({ setupMargin: -1e-12, holdMargin: 1e-9, qualityPass: true }), 0.05);
    expect(w.min).toBeNull();
    expect(w.max).toBeNull();
    expect(w.note).toMatch(/no length from 0.2x to 3x of the present length passes \(setup fails/);
  });
});
