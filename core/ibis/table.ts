/**
 * Piecewise-linear lookup of tables (docs/ibis.md §4): V-I tables are interpolated linearly and
 * extended beyond their ends along the end segments (the same rule as a SPICE pwl() function of a
 * behavioural source, so the ngspice emulation and this program agree); time tables (V-T, Ku/Kd) hold
 * their end values outside their range.
 */

/** Index k of the segment [x[k], x[k+1]] holding q (0 below the table, n-2 above it). Binary search. */
export function segment(x: Float64Array, q: number): number {
  const n = x.length;
  if (q <= x[0]) return 0;
  if (q >= x[n - 1]) return n - 2;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= q) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** y(q) by linear interpolation, extended along the end segments. */
export function lookupExtended(x: Float64Array, y: Float64Array, q: number): number {
  const k = segment(x, q);
  const s = (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
  return y[k] + s * (q - x[k]);
}

/** dy/dx of the segment holding q (the end segments' slopes beyond the table). */
export function slopeExtended(x: Float64Array, y: Float64Array, q: number): number {
  const k = segment(x, q);
  return (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
}

/** y(q) by linear interpolation, held at the end values outside the table. */
export function lookupHeld(x: Float64Array, y: Float64Array, q: number): number {
  const n = x.length;
  if (q <= x[0]) return y[0];
  if (q >= x[n - 1]) return y[n - 1];
  const k = segment(x, q);
  return y[k] + ((y[k + 1] - y[k]) * (q - x[k])) / (x[k + 1] - x[k]);
}

/**
 * dy/dx of a held table at q: the segment's slope inside a segment, the mean of the two adjacent
 * slopes at an interior knot (the central difference), and 0 outside the table.
 */
export function slopeHeld(x: Float64Array, y: Float64Array, q: number): number {
  const n = x.length;
  if (q < x[0] || q > x[n - 1]) return 0;
  const k = segment(x, q);
  const s = (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
  const atKnot = (j: number) => Math.abs(q - x[j]) <= 1e-9 * Math.max(Math.abs(x[n - 1] - x[0]), 1e-300);
  if (atKnot(k) && k > 0) return 0.5 * (s + (y[k] - y[k - 1]) / (x[k] - x[k - 1]));
  if (atKnot(k + 1) && k + 2 < n) return 0.5 * (s + (y[k + 2] - y[k + 1]) / (x[k + 2] - x[k + 1]));
  if (atKnot(k) && k === 0) return 0.5 * s; // first point: held before it, sloped after it
  if (atKnot(k + 1) && k + 2 === n) return 0.5 * s;
  return s;
}
