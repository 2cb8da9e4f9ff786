/**
 * A buffer driven into one of its own waveform fixtures (docs/ibis.md §5): R_fixture to V_fixture with
 * C_fixture and C_comp at the pin (L_fixture and the DUT parasitics are not modelled here). Used for the
 * standard's consistency checks: the static operating points against the waveform end points, and the
 * whole edge against the table.
 */
import type { BufferCorner, CornerWaveform } from './corner.js';
import { padCurrent, type PadCurrent } from './buffer.js';
import type { Switching } from './switching.js';
import { lookupHeld } from './table.js';

/**
 * Solves g(v) = 0 by Newton's method with the step limited to `maxStep` and a bisection fallback on
 * the bracket [lo, hi] (Press et al., "Numerical Recipes", 3rd ed. 2007, §9.4 "rtsafe"). g must change
 * sign on the bracket for the fallback to apply.
 */
export function solveScalar(g: (v: number, out: PadCurrent) => PadCurrent, guess: number, lo: number, hi: number, tol = 1e-9): number {
  const r: PadCurrent = { i: 0, didv: 0 };
  let v = guess;
  for (let iter = 0; iter < 60; iter++) {
    g(v, r);
    if (r.i === 0) return v;
    if (r.i > 0) hi = Math.min(hi, v);
    else lo = Math.max(lo, v);
    let next = r.didv > 0 ? v - r.i / r.didv : NaN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - v) < tol) return next;
    v = next;
  }
  return v;
}

/** Static pin voltage into the fixture with the given coefficients (KCL: current into the pin = fixture current out). */
export function fixtureOperatingPoint(b: BufferCorner, w: CornerWaveform, ku: number, kd: number): number {
  const span = Math.abs(b.pullupRef - b.pulldownRef) + Math.abs(w.vFixture) + 1;
  const g = (v: number, out: PadCurrent) => {
    padCurrent(b, v, ku, kd, out);
    out.i += (v - w.vFixture) / w.rFixture;
    out.didv += 1 / w.rFixture;
    return out;
  };
  return solveScalar(g, w.vFixture, Math.min(b.pulldownRef, w.vFixture) - span, Math.max(b.pullupRef, w.vFixture) + span);
}

/**
 * The pin voltage over the table's time span with the edge's coefficients, by the trapezoidal rule at
 * `steps` equal steps (Dommel 1969 companion form of the capacitor) and Newton at each step; starts
 * from the static point before the edge. Returns times and voltages.
 */
export function fixtureResponse(b: BufferCorner, w: CornerWaveform, k: Switching, steps = 4000): { t: Float64Array; v: Float64Array } {
  const tEnd = Math.max(w.t[w.t.length - 1], k.t[k.t.length - 1]);
  const h = tEnd / steps;
  const c = b.cComp + w.cFixture;
  const gC = (2 * c) / h;
  const t = new Float64Array(steps + 1);
  const v = new Float64Array(steps + 1);
  const ku0 = lookupHeld(k.t, k.ku, 0);
  const kd0 = lookupHeld(k.t, k.kd, 0);
  v[0] = fixtureOperatingPoint(b, w, ku0, kd0);
  // Capacitor current leaving the pin into C (trapezoidal companion: i1 = gC·(v1 − v0) − i0).
  let iC = 0;
  const span = Math.abs(b.pullupRef - b.pulldownRef) + Math.abs(w.vFixture) + 1;
  for (let m = 1; m <= steps; m++) {
    const time = m * h;
    t[m] = time;
    const ku = lookupHeld(k.t, k.ku, time);
    const kd = lookupHeld(k.t, k.kd, time);
    const vPrev = v[m - 1];
    const g = (x: number, out: PadCurrent) => {
      padCurrent(b, x, ku, kd, out);
      out.i += (x - w.vFixture) / w.rFixture + gC * (x - vPrev) - iC;
      out.didv += 1 / w.rFixture + gC;
      return out;
    };
    const x = solveScalar(g, vPrev, Math.min(b.pulldownRef, w.vFixture) - span, Math.max(b.pullupRef, w.vFixture) + span, 1e-12);
    iC = gC * (x - vPrev) - iC;
    v[m] = x;
  }
  return { t, v };
}
