/**
 * Threshold crossings of a sampled waveform, found by linear interpolation between samples
 * (common practice, no source). A crossing "upward" means from below `level` to at or above it.
 */

export type Direction = 'up' | 'down';

/** Interpolated time where the segment (i, i+1) reaches `level`. */
export function crossingTime(t: Float64Array, v: Float64Array, i: number, level: number): number {
  const dv = v[i + 1] - v[i];
  if (dv === 0) return t[i + 1];
  return t[i] + ((level - v[i]) / dv) * (t[i + 1] - t[i]);
}

/** First crossing of `level` in `direction` at or after sample `from`, or null. */
export function firstCrossing(t: Float64Array, v: Float64Array, level: number, direction: Direction, from = 0): number | null {
  if (direction === 'up') {
    for (let i = from; i + 1 < v.length; i++) if (v[i] < level && v[i + 1] >= level) return crossingTime(t, v, i, level);
  } else {
    for (let i = from; i + 1 < v.length; i++) if (v[i] > level && v[i + 1] <= level) return crossingTime(t, v, i, level);
  }
  return null;
}

/** Last crossing of `level` in `direction`, or null. */
export function lastCrossing(t: Float64Array, v: Float64Array, level: number, direction: Direction): number | null {
  if (direction === 'up') {
    for (let i = v.length - 2; i >= 0; i--) if (v[i] < level && v[i + 1] >= level) return crossingTime(t, v, i, level);
  } else {
    for (let i = v.length - 2; i >= 0; i--) if (v[i] > level && v[i + 1] <= level) return crossingTime(t, v, i, level);
  }
  return null;
}

/** Linear interpolation of the waveform at time `time` (clamped to its ends). Uniform or not. */
export function valueAt(t: Float64Array, v: Float64Array, time: number): number {
  const n = t.length;
  if (time <= t[0]) return v[0];
  if (time >= t[n - 1]) return v[n - 1];
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t[mid] <= time) lo = mid;
    else hi = mid;
  }
  return v[lo] + ((v[hi] - v[lo]) * (time - t[lo])) / (t[hi] - t[lo]);
}
