/**
 * Test helper: receiver waveforms of an invented point-to-point net from the lattice (bounce) diagram
 * closed form, so report tests have realistic ringing without running the solver.
 * Source: launched wave V+ = Vs·Z0/(Z0+Zs), reflections ΓL = (ZL-Z0)/(ZL+Z0), Γs = (Zs-Z0)/(Zs+Z0),
 * the k-th arrival at the far end is V+·(1+ΓL)·(ΓL·Γs)^k delayed by (2k+1)·Td (docs/design.md §2; the
 * lattice-diagram method, e.g. Bakoglu, Circuits, Interconnections and Packaging for VLSI, 1990, ch. 6).
 * Open far end (ΓL = 1, receiver capacitance neglected); a linear ramp edge superposes ramped steps.
 */
import type { NetWaveforms } from '../../../core/contract/api.js';

export interface LatticeNet {
  vdd: number;
  /** Driver output resistance, ohm. */
  rs: number;
  z0: number;
  /** One-way delay, s. */
  td: number;
  /** Full ramp time, s. */
  ramp: number;
}

/** Far-end voltage of a rising edge at time t (s). */
export function latticeRising(p: LatticeNet, t: number): number {
  const vPlus = (p.vdd * p.z0) / (p.z0 + p.rs);
  const gammaS = (p.rs - p.z0) / (p.rs + p.z0);
  let v = 0;
  for (let k = 0; k < 200; k++) {
    const start = (2 * k + 1) * p.td;
    if (t <= start) break;
    v += 2 * vPlus * gammaS ** k * Math.min(1, (t - start) / p.ramp);
  }
  return v;
}

/** NetWaveforms for one receiver node at the listed corners, both edges, `samples` points to `stop`. */
export function latticeNetWaveforms(
  net: string,
  receiver: string,
  p: LatticeNet,
  corners: string[],
  limits: { vil: number; vih: number; vmaxAbs: number; vminAbs: number },
  stop = 6e-9,
  samples = 1200,
): NetWaveforms {
  const t = Array.from({ length: samples }, (_, i) => (i * stop) / (samples - 1));
  const rising = t.map((x) => latticeRising(p, x));
  const falling = rising.map((v) => p.vdd - v);
  return {
    net,
    corners: corners.flatMap((corner) => [
      { corner, edge: 'rising' as const, t, v: { [receiver]: rising, drv: rising.map(() => 0) } },
      { corner, edge: 'falling' as const, t, v: { [receiver]: falling, drv: falling.map(() => 0) } },
    ]),
    thresholds: [{ receiver, ...limits }],
  };
}
