/**
 * A pad's V-I data compiled for the time loop (docs/ibis.md §4): the pull-up, pull-down and summed
 * clamp currents re-tabulated against the pad voltage on one merged grid (the union of every table's
 * breakpoints, each mapped from its reference: v = Vpu − x for [Pullup], v = x + Vpd for [Pulldown]),
 * so one segment search serves all of them. Every table is piecewise linear and extended along its end
 * segments, so the sum on the merged grid is exact, including beyond the ends.
 */
import type { PadCurve, PadTables } from '../circuit/types.js';
import { lookupExtended } from '../ibis/table.js';

export interface CompiledPad {
  /** Pad voltage grid, V (increasing). */
  v: Float64Array;
  /** Pull-up, pull-down and clamp currents into the pin on that grid, A (zeros where absent). */
  pu: Float64Array;
  pd: Float64Array;
  clamp: Float64Array;
  /**
   * The same data per segment q (between v[q] and v[q+1]) as straight lines I = a + s·V, six numbers
   * from 6q: the slopes s of pull-up, pull-down and clamp, then their values a at V = 0. The time loop
   * evaluates a segment from these without dividing.
   */
  segments: Float64Array;
}

/** Slope and value at V = 0 of each segment of each of the three currents over the grid v (see CompiledPad.segments). */
function segmentLines(v: Float64Array, currents: Float64Array[]): Float64Array {
  const out = new Float64Array(6 * (v.length - 1));
  for (let q = 0; q + 1 < v.length; q++) {
    for (let c = 0; c < 3; c++) {
      const y = currents[c];
      const slope = (y[q + 1] - y[q]) / (v[q + 1] - v[q]);
      out[6 * q + c] = slope;
      out[6 * q + 3 + c] = y[q] - slope * v[q];
    }
  }
  return out;
}

function mapped(c: PadCurve | null, sign: 1 | -1, ref: number): number[] {
  return c ? Array.from(c.v, (x) => ref + sign * x) : [];
}

/** Compiled pads by their tables (a circuit's pad objects outlive its edges): compile once. */
const compiled = new WeakMap<PadTables, CompiledPad>();

export function compilePad(t: PadTables): CompiledPad {
  let c = compiled.get(t);
  if (!c) {
    c = compileTables(t);
    compiled.set(t, c);
  }
  return c;
}

function compileTables(t: PadTables): CompiledPad {
  const all = [
    ...mapped(t.pullup, -1, t.pullupRef), ...mapped(t.pulldown, 1, t.pulldownRef),
    ...mapped(t.gndClamp, 1, t.gndClampRef), ...mapped(t.powerClamp, -1, t.powerClampRef),
  ].sort((a, b) => a - b);
  const grid: number[] = [];
  for (const x of all) if (grid.length === 0 || x - grid[grid.length - 1] > 1e-9) grid.push(x);
  if (grid.length < 2) grid.splice(0, grid.length, -1, 1); // no tables: a zero current on any grid
  const v = Float64Array.from(grid);
  const at = (c: PadCurve | null, f: (vp: number) => number) => Float64Array.from(v, (vp) => (c ? lookupExtended(c.v, c.i, f(vp)) : 0));
  const gc = at(t.gndClamp, (vp) => vp - t.gndClampRef);
  const pc = at(t.powerClamp, (vp) => t.powerClampRef - vp);
  const pu = at(t.pullup, (vp) => t.pullupRef - vp);
  const pd = at(t.pulldown, (vp) => vp - t.pulldownRef);
  const clamp = Float64Array.from(gc, (x, i) => x + pc[i]);
  return { v, pu, pd, clamp, segments: segmentLines(v, [pu, pd, clamp]) };
}
