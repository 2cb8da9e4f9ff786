/**
 * simulateNet derives the falling edge of a symmetric driver by superposition (linear network:
 * falling(t) = DC(vlow) + DC(vhigh) − rising(t)). Checked against a direct falling run; the two differ
 * by round-off only (1e-12 V: the rounding of a few thousand steps of double arithmetic).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { simulateEdge, simulateNet } from '../../../core/solver/transient.js';

describe('falling edge by superposition', () => {
  for (const name of ['flyby-4-stubs', 'thevenin-end', 't-branch-ac']) {
    it(`${name}: equals a direct falling simulation`, () => {
      const c = parseNetFile(JSON.parse(readFileSync(new URL(`../../../fixtures/nets/${name}.json`, import.meta.url), 'utf8')), name);
      const { falling } = simulateNet(c);
      const direct = simulateEdge(c, 'falling');
      expect(falling.t.length).toBe(direct.t.length);
      let worst = 0;
      falling.v.forEach((w, i) => w.forEach((x, m) => (worst = Math.max(worst, Math.abs(x - direct.v[i][m])))));
      expect(worst).toBeLessThan(1e-12);
      direct.final.forEach((x, i) => expect(Math.abs(falling.final[i] - x)).toBeLessThan(1e-12));
    });
  }

  it('an asymmetric driver is simulated edge by edge, with the launch levels of its own pull-up and pull-down', () => {
    // fixtures/nets/asymmetric-driver.json: 0/1.8 V driver, Rout 38 Ω high / 22 Ω low, 450/330 ps edges,
    // 55 Ω line of 870 ps, Thevenin end 120 Ω to 1.8 V and 120 Ω to ground (= 60 Ω to 0.9 V), 1.8 pF at rx.
    // Hand calculation (lattice, docs/design.md §2: launched step = ΔVs·Z0/(Z0 + Zs), arrival ×(1 + Γ_L)):
    //   DC low  = 0.9·22/(22 + 60)                       = 0.241463 V
    //   DC high = 0.9 + 0.9·60/(38 + 60)                 = 1.451020 V
    //   Γ_L = (60 − 55)/(60 + 55) = 0.043478
    //   the ramp starts at the Thevenin voltage that holds the pin at DC behind the new resistance
    //   (rampStart in core/solver/transient.ts): rising 0.241463 − 0.241463·38/22 = −0.175610 V,
    //   falling 1.451020 + (1.8 − 1.451020)·22/38 = 1.653061 V.
    //   rising:  ΔV = (1.8 + 0.175610)·55/(55 + 38) = 1.168371 V -> driver 1.409835 V, receiver 1.460634 V
    //   falling: ΔV = (0 − 1.653061)·55/(55 + 22) = −1.180758 V -> driver 0.270262 V, receiver 0.218925 V
    // A symmetric model (or superposition of the rising edge) gives equal step sizes: 1.168 V vs 1.181 V here.
    const c = parseNetFile(JSON.parse(readFileSync(new URL('../../../fixtures/nets/asymmetric-driver.json', import.meta.url), 'utf8')), 'asym');
    const { rising, falling } = simulateNet(c);
    const at = (w: typeof rising, node: string, time: number): number => {
      const i = w.t.findIndex((t) => t >= time);
      return w.v[w.nodes.indexOf(node)][i];
    };
    const dc = (w: typeof rising, which: 'initial' | 'final', node: string): number => w[which][w.nodes.indexOf(node)];
    // DC points: a direct linear solve, round-off only (1e-9 V).
    expect(dc(rising, 'initial', 'rx')).toBeCloseTo(0.241463, 6);
    expect(dc(rising, 'final', 'rx')).toBeCloseTo(1.451020, 6);
    expect(dc(falling, 'initial', 'rx')).toBeCloseTo(1.451020, 6);
    expect(dc(falling, 'final', 'rx')).toBeCloseTo(0.241463, 6);
    // Driver plateau at 1.2 ns: after the full ramp (450 ps/0.8 = 562.5 ps), before the first reflection
    // returns (2 × 870 ps = 1.74 ns). The lattice is exact for a flat plateau: 1e-5 V covers round-off and
    // the 6-digit hand values.
    expect(Math.abs(at(rising, 'drv', 1.2e-9) - 1.409835)).toBeLessThan(1e-5);
    expect(Math.abs(at(falling, 'drv', 1.2e-9) - 0.270262)).toBeLessThan(1e-5);
    // Halfway through the ramp the source has made half its swing, so the pin sits at DC + ΔV/2 when it
    // started from its DC point without a jump (the reason for rampStart): rising 0.241463 + 0.584186 =
    // 0.825649 V (450/0.8/2 = 281.25 ps), falling 1.451020 − 0.590379 = 0.860641 V (330/0.8/2 = 206.25 ps).
    // Both times fall on a sample (the step divides the ramp into whole steps), so the value is exact to round-off.
    expect(Math.abs(at(rising, 'drv', 281.25e-12 * (1 - 1e-9)) - 0.825649)).toBeLessThan(1e-5);
    expect(Math.abs(at(falling, 'drv', 206.25e-12 * (1 - 1e-9)) - 0.860641)).toBeLessThan(1e-5);
    // Receiver plateau at 2.4 ns: the wave arrives at 0.87 ns, the ramp ends at 1.43 ns and the 1.8 pF
    // charges with τ = (55 ∥ 60 Ω)·1.8 pF = 52 ps, so at 2.4 ns e^(−0.97/0.052) ≈ 1e-8 of the step remains;
    // the source reflection arrives at 3 × 870 ps = 2.61 ns. 1e-4 V leaves room for the trapezoidal
    // companion of the capacitor (second-order in the step).
    expect(Math.abs(at(rising, 'rx', 2.4e-9) - 1.460634)).toBeLessThan(1e-4);
    expect(Math.abs(at(falling, 'rx', 2.4e-9) - 0.218925)).toBeLessThan(1e-4);
    // simulateNet ran the falling edge itself (same samples as a direct run), not by superposition.
    const direct = simulateEdge(c, 'falling');
    expect(falling.step).toBe(direct.step);
    expect(Math.abs(at(falling, 'rx', 2.4e-9) - at(direct, 'rx', 2.4e-9))).toBe(0);
  });
});
