/**
 * The differential level of a pair is checked on Vdiff = v_P − v_N itself, separately from the leg
 * checks (docs/design.md §5): the level Vdiff holds once it has reached VIH,diff = VIH − VIL of the leg
 * thresholds, to the end of the window.
 */
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { differentialLevelHeld } from '../../../core/measure/differential.js';
import { measureCircuit } from '../../../core/engine/simulate-net.js';
import { qualityChecks } from '../../../core/budget/quality.js';
import { qualityReasons } from '../../../core/budget/net-budget.js';
import { simulateNetMeasures } from '../../../core/engine/simulate-net.js';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import type { Corner, NetDefinition } from '../../../core/project/model.js';

describe('differentialLevelHeld on hand-made samples', () => {
  it('returns the lowest Vdiff after the first peak past the threshold (hand-made samples, no source needed)', () => {
    const diff = Float64Array.from([-1, -0.5, 0.16, 0.4, 0.12, 0.3, 0.35]);
    expect(differentialLevelHeld(diff, 0.15)).toEqual({ reached: true, level: 0.12 });
  });
  it('a Vdiff that rises monotonically to its final level holds that level (the crossing is not ringback)', () => {
    const diff = Float64Array.from([-0.8, -0.2, 0.16, 0.5, 0.7, 0.75, 0.76]);
    expect(differentialLevelHeld(diff, 0.15)).toEqual({ reached: true, level: 0.76 });
  });
  it('returns the highest Vdiff when the threshold is never reached', () => {
    const diff = Float64Array.from([-1, -0.2, 0.1, 0.05]);
    expect(differentialLevelHeld(diff, 0.15)).toEqual({ reached: false, level: 0.1 });
  });
});

// A pair leg: a strong 10 Ω driver into a 50 Ω, 1 ns line with an open end (lattice diagram,
// docs/design.md §2.1). Launch V+ = 1.2·50/60 = 1.0 V; the open end doubles it: 2.0 V at 1 ns. The
// reflection returns to the source (Γs = (10 − 50)/60 = −2/3) and arrives again at 3 ns as
// 2·(−2/3)·1.0 = −1.333 V: the leg sits at 0.667 V from 3 to 5 ns. The complementary leg is its mirror
// (1.2 − v), so Vdiff = 2v − 1.2: 2.8 V, then 0.133 V — below VIH,diff = 0.675 − 0.525 = 0.150 V.
const ringingLeg = parseNetFile({
  driver: { node: 'drv', vlow: 0, vhigh: 1.2, rout: 10, riseTime: '100ps', fallTime: '100ps', refLoad: { ohms: 50, vtt: 0.6 }, vmeas: 0.6 },
  elements: [{ kind: 'line', a: 'drv', b: 'rx', z0: 50, delay: '1ns' }],
  receivers: [{ node: 'rx', vil: 0.525, vih: 0.675 }],
  stop: '12ns',
}, 'ringing-pair-leg');
// only what measureCircuit reads of a net definition: its receivers and a segment with a pair spacing
const pairNet = {
  name: 'PAIR', receivers: [{ designator: 'U9' }],
  elements: [{ kind: 'segment', spacing: 1e-4 }],
} as unknown as NetDefinition;
const corner = { name: 'typ' } as Corner;

describe('a ringing pair through the engine', () => {
  const measures = measureCircuit(pairNet, ringingLeg, corner, ['rising', 'falling']);
  const checks = measures.flatMap(qualityChecks).filter((q) => q.name === 'differential-level');
  it('adds one differential-level check per receiver edge, against VIH,diff = VIH − VIL = 0.150 V', () => {
    expect(checks).toHaveLength(2);
    for (const q of checks) expect(q.limit).toBeCloseTo(0.15, 12);
  });
  it('holds only 0.133 V (hand lattice above; 1 mV: the ramp is shorter than the 2 ns plateau) and fails', () => {
    for (const q of checks) {
      expect(Math.abs(q.value - (2 * (2 - 4 / 3) - 1.2))).toBeLessThan(1e-3);
      expect(q.pass).toBe(false);
    }
  });
  it('names the check and its level in the reason', () => {
    const reasons = qualityReasons(measures.flatMap(qualityChecks), measures);
    expect(reasons.join(' ')).toMatch(/differential voltage holds only 133 mV at U9 .* short of VIH,diff 150 mV/);
  });
  it('a single-ended net has no differential check (the leg checks only)', () => {
    const single = { ...pairNet, elements: [] } as unknown as NetDefinition;
    const plain = measureCircuit(single, ringingLeg, corner, ['rising']).flatMap(qualityChecks);
    expect(plain.some((q) => q.name === 'differential-level')).toBe(false);
  });
});

describe('the demo strobes', () => {
  const demo = buildDemoProject();
  it('DQS0 passes its differential level at every corner, holding far more than VIH,diff (ODT-terminated pair)', () => {
    const dqs = demo.nets.find((n) => n.name === 'DQS0')!;
    const checks = simulateNetMeasures(demo, dqs).flatMap(qualityChecks).filter((q) => q.name === 'differential-level');
    expect(checks.length).toBe(demo.corners.length * 2 * dqs.receivers.length);
    for (const q of checks) {
      expect(q.pass, `${q.corner} ${q.edge}`).toBe(true);
      expect(q.value).toBeGreaterThan(2 * q.limit!);
    }
  });
});
