/**
 * Switching coefficients Ku(t), Kd(t) of a driver edge (docs/ibis.md §4, "Switching coefficients").
 *
 * Two-waveform method: at every time of the union of both waveform tables' time grids, KCL at the pin
 * in each fixture j gives
 *     Ku·Ipu(Vpu − Vj) + Kd·Ipd(Vj − Vpd) = −[(Vj − Vfix,j)/Rfix,j + (Cfix,j + C_comp)·dVj/dt + Iclamp(Vj)]
 * (the V-I convention of buffer.ts; the fixture current leaves the pin), a 2×2 linear system solved by
 * Cramer's rule. No clipping of K to [0, 1]; K is held at its end values outside the tables.
 * One waveform per edge: the rising edge solves Ku with Kd at its static value after the edge (0), the
 * falling edge Kd with Ku = 0. Ramp only: K changes linearly over dt/0.6 from t = 0, where dt is the
 * 20-80 % time of [Ramp] dV/dt (the 20-80 % part is 0.6 of a linear ramp).
 */
import type { Edge } from '../circuit/types.js';
import type { BufferCorner, CornerWaveform } from './corner.js';
import { clampCurrent, pullCurrents } from './buffer.js';
import { lookupHeld, slopeHeld } from './table.js';

export type SwitchingMethod = 'two-waveform' | 'one-waveform' | 'ramp';

export interface Switching {
  edge: Edge;
  method: SwitchingMethod;
  /** Times (s, increasing) and the coefficients there; held at the end values outside. */
  t: Float64Array;
  ku: Float64Array;
  kd: Float64Array;
  /** Source lines of the waveform tables used (empty for ramp). */
  waveformLines: number[];
  /** One sentence on how the coefficients were found, for reports. */
  note: string;
}

/** Static (ku, kd) before and after an edge: rising goes from pull-down on to pull-up on. */
export function staticCoefficients(edge: Edge, when: 'before' | 'after'): { ku: number; kd: number } {
  const high = (edge === 'rising') === (when === 'after');
  return high ? { ku: 1, kd: 0 } : { ku: 0, kd: 1 };
}

/** The fixture current leaving the pin plus the clamp and C_comp currents into it, at table time t. */
function knownCurrent(b: BufferCorner, w: CornerWaveform, t: number): { v: number; rhs: number } {
  const v = lookupHeld(w.t, w.v, t);
  const dvdt = slopeHeld(w.t, w.v, t);
  const fixture = (v - w.vFixture) / w.rFixture + w.cFixture * dvdt;
  return { v, rhs: -(fixture + b.cComp * dvdt + clampCurrent(b, v)) };
}

function unionGrid(a: Float64Array, b: Float64Array): Float64Array {
  const all = Array.from(a).concat(Array.from(b)).sort((x, y) => x - y);
  const out: number[] = [];
  const span = Math.max(all[all.length - 1] - all[0], 1e-300);
  for (const x of all) if (out.length === 0 || x - out[out.length - 1] > 1e-9 * span) out.push(x);
  return Float64Array.from(out);
}

/** The two waveforms whose fixture voltages differ most (the best-conditioned pair). */
function pickPair(list: CornerWaveform[]): [CornerWaveform, CornerWaveform] {
  let best: [CornerWaveform, CornerWaveform] = [list[0], list[1]];
  let spread = -1;
  for (let i = 0; i < list.length; i++) {
    for (let j = i + 1; j < list.length; j++) {
      const d = Math.abs(list[i].vFixture - list[j].vFixture);
      if (d > spread) {
        spread = d;
        best = [list[i], list[j]];
      }
    }
  }
  return best;
}

/** Ku(t), Kd(t) of one edge at one corner. */
export function switchingCoefficients(b: BufferCorner, edge: Edge): Switching {
  const waves = edge === 'rising' ? b.rising : b.falling;
  const before = staticCoefficients(edge, 'before');
  const after = staticCoefficients(edge, 'after');
  const hasPu = b.pullup !== null;
  const hasPd = b.pulldown !== null;
  // A buffer without one of the pulls (open drain, open source) keeps that coefficient at 0.
  const fixedKu = hasPu ? null : 0;
  const fixedKd = hasPd ? null : 0;
  if (waves.length >= 2 && hasPu && hasPd) {
    const [w1, w2] = pickPair(waves);
    const t = unionGrid(w1.t, w2.t);
    const ku = new Float64Array(t.length);
    const kd = new Float64Array(t.length);
    let lastU = before.ku;
    let lastD = before.kd;
    for (let m = 0; m < t.length; m++) {
      const a = knownCurrent(b, w1, t[m]);
      const c = knownCurrent(b, w2, t[m]);
      const p1 = pullCurrents(b, a.v);
      const p2 = pullCurrents(b, c.v);
      const det = p1.pu * p2.pd - p2.pu * p1.pd;
      const scale = Math.abs(p1.pu * p2.pd) + Math.abs(p2.pu * p1.pd);
      if (Math.abs(det) > 1e-9 * scale && scale > 0) {
        lastU = (a.rhs * p2.pd - c.rhs * p1.pd) / det; // Cramer's rule
        lastD = (p1.pu * c.rhs - p2.pu * a.rhs) / det;
      }
      ku[m] = lastU;
      kd[m] = lastD;
    }
    return {
      edge, method: 'two-waveform', t, ku, kd, waveformLines: [w1.line, w2.line],
      note: `two-waveform method on the tables at lines ${w1.line} and ${w2.line} (${t.length} time points)`,
    };
  }
  if (waves.length >= 1) {
    const w = waves[0];
    const t = Float64Array.from(w.t);
    const ku = new Float64Array(t.length);
    const kd = new Float64Array(t.length);
    // The coefficient that is solved: the one that turns on in this edge, unless that pull is absent.
    const solveU = edge === 'rising' ? hasPu : !hasPd && hasPu;
    let last = solveU ? before.ku : before.kd;
    const otherStatic = solveU ? (fixedKd ?? after.kd) : (fixedKu ?? after.ku);
    for (let m = 0; m < t.length; m++) {
      const a = knownCurrent(b, w, t[m]);
      const p = pullCurrents(b, a.v);
      const mine = solveU ? p.pu : p.pd;
      const other = solveU ? p.pd : p.pu;
      const rhs = a.rhs - otherStatic * other;
      if (Math.abs(mine) > 1e-12) last = rhs / mine;
      ku[m] = solveU ? last : otherStatic;
      kd[m] = solveU ? otherStatic : last;
    }
    return {
      edge, method: 'one-waveform', t, ku, kd, waveformLines: [w.line],
      note: `one waveform (line ${w.line}): ${solveU ? 'Ku' : 'Kd'} solved with ${solveU ? 'Kd' : 'Ku'} held at ${otherStatic}`,
    };
  }
  if (!b.ramp) throw new Error(`switchingCoefficients: model ${b.model} has neither waveforms nor [Ramp] (the parser requires one)`);
  const r = edge === 'rising' ? b.ramp.rising : b.ramp.falling;
  const full = r.dt / 0.6;
  const t = Float64Array.of(0, full);
  const ku = Float64Array.of(fixedKu ?? before.ku, fixedKu ?? after.ku);
  const kd = Float64Array.of(fixedKd ?? before.kd, fixedKd ?? after.kd);
  return {
    edge, method: 'ramp', t, ku, kd, waveformLines: [],
    note: `no waveform tables: Ku and Kd change linearly from t = 0 over dt/0.6 = ${(full * 1e12).toFixed(1)} ps ([Ramp] 20-80 % time ${(r.dt * 1e12).toFixed(1)} ps)`,
  };
}
