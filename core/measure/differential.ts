/**
 * Timing of a differential pair at the crossing of its two legs (docs/design.md §5): differential zero,
 * where JEDEC references the timing of differential strobes and clocks. The pair is built as one leg in
 * the odd mode (core/netbuild), driven complementarily: the partner leg of a rising edge is the same
 * leg circuit driven through its falling edge, so both legs come from the net's two edge simulations.
 */
import { firstCrossing, lastCrossing, valueAt } from './crossings.js';

/**
 * First and last time the rising leg crosses the falling leg (v_rise − v_fall through 0 upward), s;
 * null when they never cross. The falling leg is resampled on the rising leg's times by linear
 * interpolation (an asymmetric driver's two edges may use different steps).
 */
export function legCrossings(
  tRise: Float64Array, vRise: Float64Array, tFall: Float64Array, vFall: Float64Array,
): { first: number | null; last: number | null } {
  const diff = new Float64Array(tRise.length);
  const same = tRise === tFall || (tRise.length === tFall.length && tRise[tRise.length - 1] === tFall[tFall.length - 1]);
  for (let i = 0; i < tRise.length; i++) diff[i] = vRise[i] - (same ? vFall[i] : valueAt(tFall, vFall, tRise[i]));
  return { first: firstCrossing(tRise, diff, 0, 'up'), last: lastCrossing(tRise, diff, 0, 'up') };
}
