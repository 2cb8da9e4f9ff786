/**
 * A receiver that never crosses is a failure with its own reason, never a number (docs/design.md §5):
 * its flight times, margins and skew are unknown (null), not 0 ps and not a bound from the end of the
 * simulated window. Parts: the invented demo project (fixtures/demo).
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import { assembleBoard, planBoard } from '../../../core/engine/board.js';
import type { BusDefinition, NetDefinition, ProjectData } from '../../../core/project/model.js';

const demo = buildDemoProject();
const bus: BusDefinition = {
  name: 'LB', kind: 'common-clock', description: 'test bus', referenceNet: 'CLK',
  timing: { kind: 'common-clock', cycleTime: 10e-9, clockSkew: 0, jitter: 0 },
  allowances: [],
};
/**
 * MC-LB (1.8 V, 25 Ω) into a 50 Ω, 1 ns line with a 20 Ω load to ground at the receiver (EXP-LB,
 * VIH 1.17 V). Hand calculation (docs/design.md §2.1, lattice): launched step 1.8·50/75 = 1.20 V;
 * at the load Γ = (20 − 50)/70 = −0.4286, first arrival 1.20·(1 − 0.4286) = 0.686 V; the source
 * re-reflects with Γs = (25 − 50)/75 = −1/3, so the level climbs in shrinking steps to the DC divider
 * 1.8·20/(25 + 20) = 0.80 V. The highest it can get at any demo corner is the fast one's divider,
 * 1.8·1.05·20/(25·0.85 + 20) = 0.92 V: always below VIH 1.17 V.
 * VIH is never reached on the rising edge; on the falling edge the pin starts below VIH, so the near
 * threshold (VIH falling) is never crossed either.
 */
const weak: NetDefinition = {
  name: 'W1', bus: 'LB', role: 'data',
  driver: { part: 'MC-LB', node: 'drv', designator: 'U1' },
  receivers: [{ part: 'EXP-LB', node: 'rx', designator: 'U2' }],
  elements: [
    { kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: 1e-9 },
    { kind: 'resistor', a: 'rx', b: 'gnd', ohms: 20 },
  ],
  rails: {},
};
const clock: NetDefinition = {
  ...weak, name: 'CLK', role: 'clock',
  elements: [{ kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: 1e-9 }],
};
const project: ProjectData = { ...demo, buses: [bus], nets: [weak, clock] };

describe('a receiver that never reaches VIH', () => {
  const solved = solveNet(project, 'W1', {}, { lengthWindow: false, suggestion: false });
  const r = solved.result;

  it('fails with its own reason naming the threshold and the window', () => {
    expect(r.status).toBe('fail');
    // the sentence names receiver, edge, corner and threshold (wording: neverCrossedReasons)
    expect(r.reasons.some((x) => /U2 never reaches VIH 1\.1\d V on the rising edge at the slow corner within the [\d.]+ ns window/.test(x))).toBe(true);
  });

  it('has no flight time and no margin: unknown, never 0 ps or a bound from the window end', () => {
    expect(r.flightMax).toBeNull();
    expect(r.setupMargin).toBeNull();
    expect(r.holdMargin).toBeNull();
    for (const c of r.corners) {
      expect(c.flightMax, c.corner).toBeNull();
      expect(c.setupMargin, c.corner).toBeNull();
      expect(c.setupItems, c.corner).toEqual([]);
    }
  });

  it('leaves the skew to the bus clock unknown (null), not 0', () => {
    const plan = planBoard(project, { salt: 't' });
    const results = new Map([
      ['W1', r],
      ['CLK', solveNet(project, 'CLK', {}, { lengthWindow: false, suggestion: false }).result],
    ]);
    const board = assembleBoard(project, plan, results, { fingerprint: '', toolVersion: '', solvedAt: '' });
    const w1 = board.buses[0].nets.find((n) => n.net === 'W1')!;
    expect(w1.skew).toBeNull();
    expect(board.buses[0].worstSetup).toBeNull();
    expect(board.buses[0].status).toBe('fail');
  });
});
