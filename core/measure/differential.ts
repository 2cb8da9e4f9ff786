/**
 * Timing of a differential pair at the crossing of its two legs (docs/design.md §5): differential zero,
 * where JEDEC references the timing of differential strobes and clocks. The pair is built as one leg in
 * the odd mode (core/netbuild), driven complementarily: the partner leg of a rising edge is the same
 * leg circuit driven through its falling edge, so both legs come from the net's two edge simulations.
 */
import { firstCrossing, lastCrossing, valueAt } from './crossings.js';

/**
 * The pair's differential voltage v_rise − v_fall on the rising leg's times (the rising pair edge:
 * P leg rising, N leg falling). The falling leg is resampled on the rising leg's times by linear
 * interpolation (an asymmetric driver's two edges may use different steps).
 */
export function pairDifference(tRise: Float64Array, vRise: Float64Array, tFall: Float64Array, vFall: Float64Array): Float64Array {
  const diff = new Float64Array(tRise.length);
  const same = tRise === tFall || (tRise.length === tFall.length && tRise[tRise.length - 1] === tFall[tFall.length - 1]);
  for (let i = 0; i < tRise.length; i++) diff[i] = vRise[i] - (same ? vFall[i] : valueAt(tFall, vFall, tRise[i]));
  return diff;
}

/**
 * First and last time the rising leg crosses the falling leg (v_rise − v_fall through 0 upward), s;
 * null when they never cross.
 */
export function legCrossings(
  tRise: Float64Array, vRise: Float64Array, tFall: Float64Array, vFall: Float64Array,
): { first: number | null; last: number | null } {
  return zeroCrossings(tRise, pairDifference(tRise, vRise, tFall, vFall));
}

/** First and last upward zero crossing of a pair's differential voltage, s; null when it never crosses. */
export function zeroCrossings(t: Float64Array, diff: Float64Array): { first: number | null; last: number | null } {
  return { first: firstCrossing(t, diff, 0, 'up'), last: lastCrossing(t, diff, 0, 'up') };
}

/**
 * Differential level check of a pair edge (docs/design.md §5), the ringback rule of a leg applied to
 * Vdiff: after Vdiff first reaches the differential threshold and the first peak that follows, the
 * lowest level it returns to up to the end of the window, V; when it never reaches the threshold, the
 * highest Vdiff it reaches (short of it). The falling pair edge exchanges the legs (Vdiff → −Vdiff,
 * read with the sign turned), so both pair edges give the same value from the same two leg waveforms.
 */
export function differentialLevelHeld(diff: Float64Array, threshold: number): { reached: boolean; level: number } {
  const n = diff.length;
  let i = 0;
  while (i < n && diff[i] < threshold) i++;
  if (i === n) {
    let highest = -Infinity;
    for (const v of diff) highest = Math.max(highest, v);
    return { reached: false, level: highest };
  }
  let scale = 0;
  for (const v of diff) scale = Math.max(scale, Math.abs(v));
  const eps = 1e-9 * scale;
  // the first peak after the crossing: the rise through the threshold is not ringback
  while (i + 1 < n && diff[i + 1] - diff[i] >= -eps) i++;
  let lowest = Infinity;
  for (let k = i; k < n; k++) lowest = Math.min(lowest, diff[k]);
  return { reached: true, level: lowest };
}
