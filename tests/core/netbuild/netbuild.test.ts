/**
 * Net + stackup + parts + corner -> Circuit (core/netbuild), and "matched length is not matched delay"
 * (docs/design.md §6). Stackup and parts: the invented demo project on its linear models (fixtures/demo).
 */
import { describe, expect, it } from 'vitest';
import { buildLinearDemoProject as buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { buildNetCircuit, longestSegment } from '../../../core/netbuild/index.js';
import { traceOnLayer } from '../../../core/stackup/index.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { flightTimes } from '../../../core/budget/measures.js';
import type { Corner, NetDefinition } from '../../../core/project/model.js';
import { InputError } from '../../../core/errors.js';

const project = buildDemoProject();
const typical = project.corners.find((c) => c.name === 'typical')!;
const slow: Corner = { name: 'slow-test', driverStrength: 1.15, edgeRate: 1.3, dk: 1.05, widthDelta: -12.7e-6, rail: 0.95, cin: 1.15, tco: 'max' };

/** A point-to-point net on one layer, controller data I/O to memory data I/O (demo parts). */
function p2p(name: string, layer: string, width: number, length: number): NetDefinition {
  return {
    name, bus: 'BYTE0', role: 'data',
    driver: { part: 'MC-DQ', node: 'ctl', designator: 'U1' },
    receivers: [{ part: 'MEM-DQ', node: 'mem', designator: 'U10' }],
    elements: [{ kind: 'segment', a: 'ctl', b: 'mem', layer, width, length }],
    rails: {},
  };
}

describe('buildNetCircuit', () => {
  it('turns a segment into a line with the stackup Z0 and delay at the corner Dk and etch', () => {
    const net = p2p('T1', 'L3_SIG', 105e-6, 0.05);
    const c = buildNetCircuit(net, project.stackup, project.parts, slow);
    const trace = traceOnLayer(project.stackup, 'L3_SIG', 105e-6, { dkFactor: 1.05, widthDelta: -12.7e-6 });
    const line = c.elements[0];
    expect(line.kind).toBe('line');
    if (line.kind !== 'line') return;
    // identity, no tolerance needed beyond float rounding: delay = length x delay per metre (docs/design.md §2)
    expect(line.z0).toBe(trace.z0);
    expect(line.delay).toBeCloseTo(0.05 * trace.delayPerMetre, 18);
    // a narrower trace in a higher Dk is slower and of higher impedance than typical (docs/design.md §2, Z0 = sqrt(L/C))
    const typ = traceOnLayer(project.stackup, 'L3_SIG', 105e-6);
    expect(trace.delayPerMetre).toBeGreaterThan(typ.delayPerMetre);
    expect(trace.z0).toBeGreaterThan(typ.z0);
  });

  it('scales the driver, rails and receiver by the corner as stated in core/netbuild', () => {
    const net = p2p('T2', 'L3_SIG', 105e-6, 0.05);
    const c = buildNetCircuit(net, project.stackup, project.parts, slow);
    // MC-DQ: 34 ohm, 120 ps edges, VOH 1.2 V; MEM-DQ: 1.3 pF, VREF 0.6 V, VIH 0.7 V, ODT 60 ohm to 0.6 V (demo data)
    expect(c.driver.routHigh).toBeCloseTo(34 * 1.15, 12);
    expect(c.driver.riseTime).toBeCloseTo(120e-12 * 1.3, 24);
    expect(c.driver.vhigh).toBeCloseTo(1.2 * 0.95, 12);
    expect(c.driver.refLoad!.vtt).toBeCloseTo(0.6 * 0.95, 12);
    const rx = c.receivers[0];
    expect(rx.cin).toBeCloseTo(1.3e-12 * 1.15, 24);
    // VREF tracks the rail, the AC offset (VIH - VREF = 0.1 V) stays fixed: 0.57 + 0.1 = 0.67 V
    expect(rx.vih).toBeCloseTo(0.67, 12);
    expect(rx.vil).toBeCloseTo(0.47, 12);
    expect(rx.odt).toEqual({ ohms: 60, vtt: 0.6 * 0.95 });
    // absolute limits are ratings: not scaled
    expect(rx.vmaxAbs).toBe(1.5);
  });

  it('stops several round trips after the edge (at least 10 one-way delays of all lines)', () => {
    const net = p2p('T3', 'L3_SIG', 105e-6, 0.05);
    const c = buildNetCircuit(net, project.stackup, project.parts, typical);
    const line = c.elements[0];
    if (line.kind !== 'line') throw new Error('expected a line');
    expect(c.stop!).toBeGreaterThanOrEqual(10 * line.delay + c.driver.riseTime / 0.8);
  });

  it('names the net and element for an unknown layer, and the endpoint for a missing part', () => {
    expect(() => buildNetCircuit(p2p('BAD', 'NO_SUCH', 1e-4, 0.01), project.stackup, project.parts, typical)).toThrow(InputError);
    expect(() => buildNetCircuit(p2p('BAD', 'NO_SUCH', 1e-4, 0.01), project.stackup, project.parts, typical)).toThrow(/net BAD element 1 \(segment\)/);
    const missing = { ...p2p('BAD2', 'L3_SIG', 105e-6, 0.01), driver: { part: 'NOPE', node: 'ctl', designator: 'U9' } };
    expect(() => buildNetCircuit(missing, project.stackup, project.parts, typical)).toThrow(/net BAD2 driver U9: part "NOPE" is not in the project/);
  });

  it('inserts a series resistor at the driver and a parallel resistor to a termination rail on request', () => {
    const net = p2p('T4', 'L3_SIG', 105e-6, 0.05);
    const c = buildNetCircuit(net, project.stackup, project.parts, typical, { series: 22, parallel: { node: 'mem', ohms: 51, vtt: 0.6 } });
    expect(c.driver.node).not.toBe('ctl');
    expect(c.elements).toContainEqual({ kind: 'resistor', a: c.driver.node, b: 'ctl', ohms: 22 });
    expect(c.elements.some((e) => e.kind === 'resistor' && e.a === 'mem' && e.ohms === 51)).toBe(true);
  });

  it('picks the longest routed segment for the length window', () => {
    const net = project.nets.find((n) => n.name === 'DQ0')!;
    expect(longestSegment(net)).toEqual({ elementIndex: 2, layer: 'L3_SIG', width: 105e-6, length: 0.0385 });
  });
});

describe('matched length on different layers gives different delays (docs/design.md §6)', () => {
  const length = 0.06;
  const outer = p2p('OUT', 'L1_TOP', 160e-6, length);
  const inner = p2p('IN', 'L3_SIG', 105e-6, length);
  const vOuter = traceOnLayer(project.stackup, 'L1_TOP', 160e-6).velocity;
  const vInner = traceOnLayer(project.stackup, 'L3_SIG', 105e-6).velocity;

  it('the line delays are length / velocity of each layer (Td = length / vp, docs/design.md §2)', () => {
    const a = buildNetCircuit(outer, project.stackup, project.parts, typical).elements[0];
    const b = buildNetCircuit(inner, project.stackup, project.parts, typical).elements[0];
    if (a.kind !== 'line' || b.kind !== 'line') throw new Error('expected lines');
    expect(a.delay).toBeCloseTo(length / vOuter, 18);
    expect(b.delay).toBeCloseTo(length / vInner, 18);
    // stripline is slower than the outer microstrip (common practice: ~170 vs ~140-150 ps/in, docs/design.md §3)
    expect(b.delay).toBeGreaterThan(a.delay);
  });

  it('the simulated flight times differ by the delay difference', () => {
    const fa = simulateNetMeasures(project, outer, {}, [typical]);
    const fb = simulateNetMeasures(project, inner, {}, [typical]);
    const expected = length / vInner - length / vOuter;
    for (const edge of ['rising', 'falling'] as const) {
      const a = flightTimes(fa.find((m) => m.edge === edge)!);
      const b = flightTimes(fb.find((m) => m.edge === edge)!);
      // Tolerance 5 ps: the two layers' Z0 differ by a few ohm, which changes how fast the receiver's
      // capacitance and ODT charge after the wave arrives; the line delay itself enters exactly.
      expect(Math.abs(b.max! - a.max! - expected)).toBeLessThan(5e-12);
      expect(Math.abs(b.min! - a.min! - expected)).toBeLessThan(5e-12);
    }
    expect(expected).toBeGreaterThan(20e-12); // the difference is large enough to matter in a 60 mm route
  });
});
