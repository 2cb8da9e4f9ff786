/**
 * Differential strobes and clocks are timed at the crossing of their two legs (differential zero, the
 * reference of JEDEC timing for differential inputs), with both legs simulated: the partner leg is the
 * same leg circuit driven through the opposite edge (complementary drive, odd mode; docs/design.md §5).
 */
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { simulateNet } from '../../../core/solver/transient.js';
import { legCrossings } from '../../../core/measure/differential.js';
import { valueAt } from '../../../core/measure/crossings.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { buildNetCircuit } from '../../../core/netbuild/index.js';

const ns = 1e-9;

describe('crossing of the two legs, by hand', () => {
  // Matched 50 Ω source into a 50 Ω, 1 ns line with an open end (docs/design.md §2.1): the launched wave
  // is half the source, the open end doubles it, so each leg at the receiver is the source ramp 1 ns
  // late: leg A rises 0 -> 1.2 V over 1.000-1.125 ns (100 ps 10-90 % / 0.8), leg B falls 1.2 -> 0 V over
  // the same interval. They cross at 0.6 V, half way: 1.0625 ns. Leg thresholds 0.525/0.675 V would
  // give 1.0547 and 1.0703 ns instead (1 + 0.125·0.525/1.2, 1 + 0.125·0.675/1.2): 7.8 ps each side.
  const c = parseNetFile({
    driver: { node: 'drv', vlow: 0, vhigh: 1.2, rout: 50, riseTime: '100ps', fallTime: '100ps' },
    elements: [{ kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: '1ns' }],
    receivers: [{ node: 'rx', vil: 0.525, vih: 0.675 }],
    stop: '4ns',
  }, 'pair-leg');
  const w = simulateNet(c);
  const i = w.rising.nodes.indexOf('rx');
  it('crosses once at 1.0625 ns (0.01 ps: the step divides the ramp, so the legs are exact ramps between samples)', () => {
    const x = legCrossings(w.rising.t, w.rising.v[i], w.falling.t, w.falling.v[i]);
    expect(Math.abs(x.first! - 1.0625 * ns)).toBeLessThan(0.01e-12);
    expect(Math.abs(x.last! - 1.0625 * ns)).toBeLessThan(0.01e-12);
  });
});

describe('a demo strobe (DQS0, an edge-coupled pair) through the engine', () => {
  const demo = buildDemoProject();
  const dqs = demo.nets.find((n) => n.name === 'DQS0')!;
  const measures = simulateNetMeasures(demo, dqs);
  it('has its minimum and maximum flight at the legs\' crossing: one time, no band charged to the strobe', () => {
    for (const m of measures) {
      expect(m.tNearFirst, `${m.corner} ${m.edge}`).not.toBeNull();
      // a clean pair crosses once: first and last crossing coincide (1e-21 s: the same interpolation)
      expect(Math.abs(m.tNearFirst! - m.tFarLast!), `${m.corner} ${m.edge}`).toBeLessThan(1e-21);
    }
  });
  it('the crossing is where the rising leg equals the falling leg (within 0.1 mV, linear interpolation)', () => {
    const corner = demo.corners[1];
    const m = measures.find((x) => x.corner === corner.name && x.edge === 'rising')!;
    // simulate the same leg again to read both legs at the crossing time
    const w = simulateNet(buildNetCircuit(dqs, demo.stackup, demo.parts, corner, {}, demo.ibisFiles));
    const k = w.rising.nodes.indexOf(m.node);
    const a = valueAt(w.rising.t, w.rising.v[k], m.tNearFirst!);
    const b = valueAt(w.falling.t, w.falling.v[k], m.tNearFirst!);
    expect(Math.abs(a - b)).toBeLessThan(1e-4);
  });
});
