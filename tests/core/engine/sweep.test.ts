/**
 * What-if sweep (core/engine/sweep.ts, docs/design.md §6.5): its margins at the present value are the
 * normal solve's, its setup curve crosses zero where the engine's own length window ends, its slope
 * against length is the line's delay per metre, and bad requests are refused naming the field.
 * Stackup and parts: the invented demo project (fixtures/demo).
 */
import { describe, expect, it } from 'vitest';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { runJob } from '../../../core/engine/jobs.js';
import { solveNet } from '../../../core/engine/solve-net.js';
import { planSweep, sweepNet, type NetSweep, type SweepPoint, type SweepRequest } from '../../../core/engine/sweep.js';
import { routedLine } from '../../../core/netbuild/index.js';
import { InputError } from '../../../core/errors.js';
import type { BusDefinition, NetDefinition, ProjectData } from '../../../core/project/model.js';

const demo = buildDemoProject();

/** The demo's DQ12 as the board solve gives it: its strobe's measures first, then the net (core/engine/board.ts stages). */
function boardSolveOf(project: ProjectData, net: string, strobe: string) {
  const measures = runJob(project, { kind: 'strobe-measures', net: strobe, key: '' }).measures;
  return runJob(project, { kind: 'net', net, key: '', strobe: { net: strobe, measures } }).result!;
}

/** The cell [a, b] of consecutive sweep values across which `f` changes sign (the first one), or null. */
function signChangeCell(points: readonly SweepPoint[], f: (p: SweepPoint) => number | null): [number, number] | null {
  for (let i = 0; i + 1 < points.length; i++) {
    const a = f(points[i]);
    const b = f(points[i + 1]);
    if (a !== null && b !== null && Math.sign(a) !== Math.sign(b)) return [Math.min(points[i].value, points[i + 1].value), Math.max(points[i].value, points[i + 1].value)];
  }
  return null;
}

describe('length sweep of a source-synchronous data net (demo DQ12, segment 3)', () => {
  // 9 values 10 mm apart centred on the present length, so the middle one is the present value
  const seg = demo.nets.find((n) => n.name === 'DQ12')!.elements[2];
  const now = seg.kind === 'segment' ? seg.length : NaN;
  const request: SweepRequest = { quantity: { kind: 'length', elementIndex: 2 }, start: now - 0.04, stop: now + 0.04, points: 9 };
  const sweep: NetSweep = sweepNet(demo, 'DQ12', request);
  const normal = boardSolveOf(demo, 'DQ12', 'DQS1');

  it('gives, at the present value, the same margins, status and worst corner as the normal solve', () => {
    // the same evaluation path, so the same numbers (consistency, no tolerance)
    expect(sweep.current).toBe(now);
    expect(sweep.atCurrent.setupMargin).toBe(normal.setupMargin);
    expect(sweep.atCurrent.holdMargin).toBe(normal.holdMargin);
    expect(sweep.atCurrent.status).toBe(normal.status);
    expect(sweep.atCurrent.worstCorner).toBe(normal.worstCorner);
    // and the middle swept value (start + 4 x 10 mm) agrees within round-off of the value (1e-15 s)
    const at = sweep.points[4];
    expect(at.value).toBeCloseTo(now, 12);
    expect(Math.abs(at.setupMargin! - normal.setupMargin!)).toBeLessThan(1e-15);
    expect(Math.abs(at.holdMargin! - normal.holdMargin!)).toBeLessThan(1e-15);
  });

  it('carries the engine length window of the swept segment, equal to the normal solve\'s (it is the longest segment)', () => {
    expect(sweep.lengthWindow).toEqual(normal.lengthWindow);
  });

  it('crosses zero setup margin inside the cell that holds the engine window\'s long edge, zero hold in the short edge\'s cell', () => {
    // consistency with the engine's own length window (docs/design.md §6.3)
    const w = sweep.lengthWindow!;
    const setupCell = signChangeCell(sweep.points, (p) => p.setupMargin);
    const holdCell = signChangeCell(sweep.points, (p) => p.holdMargin);
    expect(setupCell).not.toBeNull();
    expect(holdCell).not.toBeNull();
    expect(w.max!).toBeGreaterThanOrEqual(setupCell![0]);
    expect(w.max!).toBeLessThanOrEqual(setupCell![1]);
    expect(w.min!).toBeGreaterThanOrEqual(holdCell![0]);
    expect(w.min!).toBeLessThanOrEqual(holdCell![1]);
    // the guard-band window: setup margin - guard band changes sign in the cell of guardMax
    const guardCell = signChangeCell(sweep.points, (p) => (p.setupMargin === null ? null : p.setupMargin - sweep.guardBand));
    expect(w.guardMax!).toBeGreaterThanOrEqual(guardCell![0]);
    expect(w.guardMax!).toBeLessThanOrEqual(guardCell![1]);
  });

  it('marks values outside the window fail and those inside the guard window pass', () => {
    const w = sweep.lengthWindow!;
    for (const p of sweep.points) {
      if (p.value > w.max! || p.value < w.min!) expect(p.status).toBe('fail');
      if (p.value > w.guardMin! && p.value < w.guardMax!) expect(p.status).toBe('pass');
    }
  });
});

describe('a simple point-to-point common-clock net (series R, one stripline segment)', () => {
  // the net of tests/core/engine/length-window.test.ts: driver, 22 Ω, 100 mm on L6_SIG, receiver
  const bus: BusDefinition = {
    name: 'LB', kind: 'common-clock', description: 'test bus', referenceNet: null,
    timing: { kind: 'common-clock', cycleTime: 6.5e-9, clockSkew: 0, jitter: 0 },
    allowances: [],
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

  it('loses setup margin at the line delay per metre, -1/vp (Td = length/vp, docs/design.md §2.1)', () => {
    const sweep = sweepNet(project, 'W1', { quantity: { kind: 'length', elementIndex: 1 }, start: 0.06, stop: 0.14, points: 5 });
    const corner = sweep.points[0].worstSetupCorner!;
    // the same corner limits setup along the sweep, so the slope is that corner's
    expect(sweep.points.every((p) => p.worstSetupCorner === corner)).toBe(true);
    const perMetre = routedLine(project.stackup, 'L6_SIG', 105e-6, undefined, project.corners.find((c) => c.name === corner)!).delayPerMetre;
    const first = sweep.points[0];
    const last = sweep.points[sweep.points.length - 1];
    const slope = (last.setupMargin! - first.setupMargin!) / (last.value - first.value);
    // within 2 %: the receiver's edge changes a little with length (the line's delay dominates; tolerance ours)
    expect(slope / -perMetre).toBeGreaterThan(0.98);
    expect(slope / -perMetre).toBeLessThan(1.02);
    // hold gains the delay per metre of its own worst corner (the flight enters hold with the opposite
    // sign, docs/design.md §6.1), within the same 2 %
    const holdCorner = first.worstHoldCorner!;
    expect(sweep.points.every((p) => p.worstHoldCorner === holdCorner)).toBe(true);
    const holdPerMetre = routedLine(project.stackup, 'L6_SIG', 105e-6, undefined, project.corners.find((c) => c.name === holdCorner)!).delayPerMetre;
    const holdSlope = (last.holdMargin! - first.holdMargin!) / (last.value - first.value);
    expect(holdSlope / holdPerMetre).toBeGreaterThan(0.98);
    expect(holdSlope / holdPerMetre).toBeLessThan(1.02);
  });

  it('sweeps the series resistor: the present value is the normal solve, low values overshoot', () => {
    const sweep = sweepNet(project, 'W1', { quantity: { kind: 'resistance', elementIndex: 0 }, start: 1, stop: 61, points: 4 });
    const normal = solveNet(project, 'W1', {}).result;
    expect(sweep.unit).toBe('Ω');
    expect(sweep.current).toBe(22);
    expect(sweep.atCurrent.setupMargin).toBe(normal.setupMargin);
    expect(sweep.atCurrent.holdMargin).toBe(normal.holdMargin);
    expect(sweep.lengthWindow).toBeNull();
    // 1 Ω leaves the 100 mm line about unterminated: the fast corner overshoots the receiver's absolute
    // maximum (a source much below Z0 rings, docs/design.md §2.1); 21 Ω and up pass
    expect(sweep.points[0].failingChecks.map((c) => c.name)).toContain('overshoot');
    expect(sweep.points[0].status).toBe('fail');
    expect(sweep.points[1].failingChecks).toEqual([]);
    // each point's failing checks are the checks the net fails with that resistor stored (same solve)
    const edited = (ohms: number): ProjectData => ({ ...project, nets: [{ ...net, elements: [{ ...net.elements[0], ohms } as NetDefinition['elements'][number], net.elements[1]] }] });
    for (const p of sweep.points) {
      const r = solveNet(edited(p.value), 'W1', {}, { lengthWindow: false, suggestion: false }).result;
      expect(p.failingChecks.map((c) => c.name).sort()).toEqual([...new Set(r.quality.filter((q) => !q.pass).map((q) => q.name))].sort());
      expect(p.failingChecks.reduce((n, c) => n + c.count, 0)).toBe(r.quality.filter((q) => !q.pass).length);
      expect(p.status).toBe(r.status);
    }
  });
});

describe('requests refused with the field named', () => {
  const ok: SweepRequest = { quantity: { kind: 'length', elementIndex: 2 }, start: 0.02, stop: 0.12, points: 11 };
  const refused = (change: Partial<SweepRequest>, where: RegExp) => {
    let error: unknown = null;
    try {
      planSweep(demo, 'DQ12', { ...ok, ...change });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(InputError);
    expect((error as InputError).where).toMatch(where);
  };
  // limits: docs/design.md §6.5 (this program's choices)
  it('points outside 2..101 or not whole', () => {
    refused({ points: 1 }, /^sweep points$/);
    refused({ points: 102 }, /^sweep points$/);
    refused({ points: 2.5 }, /^sweep points$/);
  });
  it('lengths not positive or beyond the sane range, equal ends', () => {
    refused({ start: -0.01 }, /^sweep start$/);
    refused({ start: 0 }, /^sweep start$/);
    refused({ stop: 5 }, /^sweep stop$/);
    refused({ stop: Number.NaN }, /^sweep stop$/);
    refused({ stop: 0.02 }, /^sweep stop$/);
  });
  it('resistances not above zero, and a quantity the element cannot take', () => {
    refused({ quantity: { kind: 'resistance', elementIndex: 2 } }, /^net DQ12 element 3$/);
    refused({ quantity: { kind: 'length', elementIndex: 1 } }, /^net DQ12 element 2$/);
    refused({ quantity: { kind: 'length', elementIndex: 9 } }, /^sweep element$/);
    const withR: ProjectData = {
      ...demo,
      nets: demo.nets.map((n) => (n.name === 'DQ12' ? { ...n, elements: [{ kind: 'resistor', a: n.driver.node, b: 'x', ohms: 20 }, ...n.elements.map((e, i) => (i === 0 ? { ...e, a: 'x' } : e))] as NetDefinition['elements'] } : n)),
    };
    expect(() => planSweep(withR, 'DQ12', { quantity: { kind: 'resistance', elementIndex: 0 }, start: 0, stop: 50, points: 3 })).toThrow(/sweep start: must be a positive resistance/);
    expect(() => planSweep(withR, 'DQ12', { quantity: { kind: 'resistance', elementIndex: 0 }, start: 10, stop: -5, points: 3 })).toThrow(/sweep stop: must be a positive resistance/);
    expect(planSweep(withR, 'DQ12', { quantity: { kind: 'resistance', elementIndex: 0 }, start: 10, stop: 60, points: 6 }).values).toEqual([10, 20, 30, 40, 50, 60]);
  });
  it('an unknown net', () => {
    expect(() => planSweep(demo, 'NOPE', ok)).toThrow(/net NOPE: not in the project/);
  });
});
