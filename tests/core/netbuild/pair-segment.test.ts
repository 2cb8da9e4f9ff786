/**
 * A segment with a pair spacing is one leg of an edge-coupled pair driven differentially: complementary
 * drive excites only the odd mode, so the leg is a line of Zodd travelling at c/sqrt(eps_eff,odd)
 * (even/odd mode decomposition of symmetric coupled lines, Cohn 1955; Kirschning & Jansen 1984 for the
 * coupled-microstrip odd mode). Stackup and parts: the invented demo project (fixtures/demo).
 */
import { describe, expect, it } from 'vitest';
import { buildLinearDemoProject as buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { buildNetCircuit } from '../../../core/netbuild/index.js';
import { pairOnLayer, traceOnLayer } from '../../../core/stackup/index.js';
import type { Corner, NetDefinition, NetElement } from '../../../core/project/model.js';

const project = buildDemoProject();
const slow: Corner = { name: 'slow-test', driverStrength: 1.15, edgeRate: 1.3, dk: 1.05, widthDelta: -12.7e-6, rail: 0.95, cin: 1.15, tco: 'max' };

function net(elements: NetElement[]): NetDefinition {
  return {
    name: 'PAIR_T', bus: 'BYTE0', role: 'strobe',
    driver: { part: 'MC-DQ', node: 'ctl', designator: 'U1' },
    receivers: [{ part: 'MEM-DQ', node: 'mem', designator: 'U10' }],
    elements, rails: {},
  };
}

describe('pair segments in buildNetCircuit', () => {
  it('uses Zodd and the odd-mode delay at the corner Dk and etch', () => {
    const c = buildNetCircuit(
      net([{ kind: 'segment', a: 'ctl', b: 'mem', layer: 'L1_TOP', width: 0.16e-3, length: 0.04, spacing: 0.075e-3 }]),
      project.stackup, project.parts, slow,
    );
    const leg = pairOnLayer(project.stackup, 'L1_TOP', 0.16e-3, 0.075e-3, { dkFactor: 1.05, widthDelta: -12.7e-6 });
    const line = c.elements[0];
    expect(line.kind).toBe('line');
    if (line.kind !== 'line') return;
    // identity (odd-mode theory, Cohn 1955): Z0 = Zodd, delay = length / v_odd; float rounding only
    expect(line.z0).toBe(leg.zodd);
    expect(line.delay).toBeCloseTo(0.04 * leg.delayPerMetreOdd, 18);
    // the coupled leg sits below the lone trace's impedance and, on microstrip, travels faster (K&J 1984)
    const lone = traceOnLayer(project.stackup, 'L1_TOP', 0.16e-3, { dkFactor: 1.05, widthDelta: -12.7e-6 });
    expect(line.z0).toBeLessThan(lone.z0);
    expect(leg.delayPerMetreOdd).toBeLessThan(lone.delayPerMetre);
  });

  it('leaves single-ended segments of the same net unchanged', () => {
    const c = buildNetCircuit(
      net([
        { kind: 'segment', a: 'ctl', b: 'v', layer: 'L3_SIG', width: 0.105e-3, length: 0.03, spacing: 0.07e-3 },
        { kind: 'segment', a: 'v', b: 'mem', layer: 'L3_SIG', width: 0.105e-3, length: 0.01 },
      ]),
      project.stackup, project.parts, slow,
    );
    const [pair, single] = c.elements;
    if (pair.kind !== 'line' || single.kind !== 'line') throw new Error('expected two lines');
    const adjust = { dkFactor: 1.05, widthDelta: -12.7e-6 };
    // the cache key includes the spacing: the two segments of one layer and width get their own Z0
    expect(pair.z0).toBe(pairOnLayer(project.stackup, 'L3_SIG', 0.105e-3, 0.07e-3, adjust).zodd);
    expect(single.z0).toBe(traceOnLayer(project.stackup, 'L3_SIG', 0.105e-3, adjust).z0);
  });

  it('names the net and element when the etched gap closes', () => {
    const bad = net([{ kind: 'segment', a: 'ctl', b: 'mem', layer: 'L3_SIG', width: 0.105e-3, length: 0.03, spacing: 5e-6 }]);
    // a 5 µm gap closes when a fast corner widens both traces by 12.7 µm at a fixed pitch
    const fast: Corner = { ...slow, name: 'fast-test', widthDelta: 12.7e-6 };
    expect(() => buildNetCircuit(bad, project.stackup, project.parts, fast)).toThrow(/net PAIR_T element 1 \(segment\).*spacing/);
  });
});
