/**
 * Exact lattice-diagram (bounce diagram) cases: a lossless line between resistive ends driven by an
 * ideal step (riseTime 0). Source: docs/design.md §2 — launched step V+ = Vs·Z0/(Z0+Zs), reflection
 * coefficients Γ = (Z − Z0)/(Z + Z0); the bounce-diagram sums are the textbook construction (Bakoglu,
 * "Circuits, Interconnections, and Packaging for VLSI", 1990, ch. 6 — chapter from memory). With
 * resistive ends and a step, the method of characteristics with the trapezoidal rule is exact between
 * wave arrivals, so plateaus are checked to 1e-6 V (floating-point round-off only).
 */
import { describe, expect, it } from 'vitest';
import { parseNetFile } from '../../../core/circuit/parse.js';
import { simulateEdge, type Waveform } from '../../../core/solver/transient.js';
import { launchStep, reflection } from '../../../core/solver/closed-form.js';
import { valueAt } from '../../../core/measure/crossings.js';

const TOL = 1e-6; // V: round-off only (see file comment)

function net(zs: number, z0: number, delay: number, load: number | null) {
  return parseNetFile(
    {
      driver: { node: 'drv', vlow: 0, vhigh: 1, rout: zs, riseTime: 0, fallTime: 0 },
      elements: [
        { kind: 'line', a: 'drv', b: 'rx', z0, delay },
        ...(load === null ? [] : [{ kind: 'resistor', a: 'rx', b: 'gnd', ohms: load }]),
      ],
      receivers: [{ node: 'rx', vil: 0.3, vih: 0.6 }],
      stop: 12 * delay,
    },
    'lattice',
  );
}

/** Bounce diagram: far-end level after its k-th arrival, near-end level after its k-th change (k >= 0). */
function bounce(step: number, zs: number, z0: number, load: number | null, count: number) {
  const vplus = launchStep(step, z0, zs);
  const gl = reflection(load ?? Infinity, z0);
  const gs = reflection(zs, z0);
  const far: number[] = [];
  const near: number[] = [vplus];
  let forward = vplus;
  let farLevel = 0;
  let nearLevel = vplus;
  for (let k = 0; k < count; k++) {
    const back = gl * forward;
    farLevel += forward + back;
    far.push(farLevel);
    const next = gs * back;
    nearLevel += back + next;
    near.push(nearLevel);
    forward = next;
  }
  return { far, near };
}

const node = (w: Waveform, name: string) => w.v[w.nodes.indexOf(name)];

describe('lattice diagram, ideal step into a line between resistive ends', () => {
  const cases = [
    { name: 'Zs 25 Ω, Z0 50 Ω, 150 Ω load', zs: 25, z0: 50, load: 150 as number | null, delay: 1e-9, step: 1e-10 },
    { name: 'Zs 10 Ω, Z0 60 Ω, open end', zs: 10, z0: 60, load: null, delay: 1e-9, step: 1e-10 },
    { name: 'Zs 75 Ω, Z0 40 Ω, 20 Ω load', zs: 75, z0: 40, load: 20, delay: 0.8e-9, step: 0.1e-9 },
    // Delay not a whole number of steps: the history is interpolated, plateaus must still be exact.
    { name: 'Zs 25 Ω, Z0 50 Ω, 150 Ω load, delay 1.03 ns on a 0.1 ns step', zs: 25, z0: 50, load: 150, delay: 1.03e-9, step: 1e-10 },
  ];
  for (const c of cases) {
    it(`rising edge plateaus match the bounce diagram: ${c.name}`, () => {
      const w = simulateEdge(net(c.zs, c.z0, c.delay, c.load), 'rising', { step: c.step });
      const { far, near } = bounce(1, c.zs, c.z0, c.load, 5);
      const T = c.delay;
      // Far end: k-th plateau lies in ((2k+1)T, (2k+3)T); sample its middle (away from the one-step edge).
      far.forEach((level, k) => expect(Math.abs(valueAt(w.t, node(w, 'rx'), (2 * k + 2) * T) - level)).toBeLessThan(TOL));
      // Near end: launch level in (0, 2T), then the k-th change at 2kT.
      near.forEach((level, k) => expect(Math.abs(valueAt(w.t, node(w, 'drv'), (2 * k + 1) * T) - level)).toBeLessThan(TOL));
      // Before the first arrival the far end is still at its DC level (0 V).
      expect(Math.abs(valueAt(w.t, node(w, 'rx'), 0.5 * T))).toBeLessThan(TOL);
    });
  }

  it('falling edge from the high DC point is the DC level plus the bounce diagram of a −1 V step (superposition)', () => {
    const w = simulateEdge(net(25, 50, 1e-9, 150), 'falling', { step: 1e-10 });
    const dc = 150 / (150 + 25); // voltage divider at DC (lossless line is a short), V
    const { far, near } = bounce(-1, 25, 50, 150, 5);
    far.forEach((level, k) => expect(Math.abs(valueAt(w.t, node(w, 'rx'), (2 * k + 2) * 1e-9) - (dc + level))).toBeLessThan(TOL));
    near.forEach((level, k) => expect(Math.abs(valueAt(w.t, node(w, 'drv'), (2 * k + 1) * 1e-9) - (dc + level))).toBeLessThan(TOL));
    expect(Math.abs(w.final[w.nodes.indexOf('rx')])).toBeLessThan(TOL); // settles to 0 V (DC)
  });

  it('layer change: first arrival is V+·τ·(1+ΓL) with τ = 2·Z2/(Z1+Z2) at the junction', () => {
    // Transmission coefficient at a junction of two lines: τ = 1 + Γ = 2·Z2/(Z1+Z2) (same bounce-diagram source).
    const circuit = parseNetFile(
      {
        driver: { node: 'drv', vlow: 0, vhigh: 1, rout: 50, riseTime: 0, fallTime: 0 },
        elements: [
          { kind: 'line', a: 'drv', b: 'mid', z0: 50, delay: 1e-9 },
          { kind: 'line', a: 'mid', b: 'rx', z0: 30, delay: 1e-9 },
          { kind: 'resistor', a: 'rx', b: 'gnd', ohms: 100 },
        ],
        receivers: [{ node: 'rx', vil: 0.3, vih: 0.6 }],
        stop: 20e-9,
      },
      'layer change',
    );
    const w = simulateEdge(circuit, 'rising', { step: 1e-10 });
    const vplus = launchStep(1, 50, 50);
    const tau = 2 * 30 / (50 + 30);
    const expected = vplus * tau * (1 + reflection(100, 30));
    // Arrival at 2 ns; the next change at rx comes back from the junction at 2 + 2·1 = 4 ns.
    expect(Math.abs(valueAt(w.t, node(w, 'rx'), 3e-9) - expected)).toBeLessThan(TOL);
    expect(Math.abs(w.final[w.nodes.indexOf('rx')] - 100 / 150)).toBeLessThan(TOL); // DC divider
  });
});
