/**
 * Slew-rate derating of a receiver's setup and hold (docs/design.md §6.4), as JEDEC DDR data sheets
 * tabulate it: an added setup (hold) requirement for each pair of the signal's and the strobe's (or
 * clock's) slew rates at the receiver. Between the tabulated slews the value is interpolated
 * bilinearly; outside the table it is held at the nearest edge (this program's choice: data sheets
 * leave it undefined there, and the line item says so).
 */
import type { SlewDerating } from '../project/model.js';

/** Index and weight of `x` between the ascending breakpoints `xs` (clamped at the ends). */
function locate(xs: readonly number[], x: number): { i: number; w: number; clamped: boolean } {
  if (xs.length === 1 || x <= xs[0]) return { i: 0, w: 0, clamped: x < xs[0] };
  const last = xs.length - 1;
  if (x >= xs[last]) return { i: last - 1, w: 1, clamped: x > xs[last] };
  let i = 0;
  while (xs[i + 1] < x) i++;
  return { i, w: (x - xs[i]) / (xs[i + 1] - xs[i]), clamped: false };
}

/** Bilinear interpolation of table[signal][strobe] at (signal slew, strobe slew), V/s; and whether clamped. */
export function derate(table: readonly (readonly number[])[], d: SlewDerating, signalSlew: number, strobeSlew: number): { value: number; clamped: boolean } {
  const a = locate(d.signalSlews, signalSlew);
  const b = locate(d.strobeSlews, strobeSlew);
  const at = (i: number, j: number) => table[Math.min(i, d.signalSlews.length - 1)][Math.min(j, d.strobeSlews.length - 1)];
  const value =
    at(a.i, b.i) * (1 - a.w) * (1 - b.w) + at(a.i + 1, b.i) * a.w * (1 - b.w) +
    at(a.i, b.i + 1) * (1 - a.w) * b.w + at(a.i + 1, b.i + 1) * a.w * b.w;
  return { value, clamped: a.clamped || b.clamped };
}
