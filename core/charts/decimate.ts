/**
 * Thins a sampled waveform for drawing while keeping its extremes: each bucket keeps its minimum and
 * maximum sample in time order, so an overshoot peak or ringback dip survives the thinning (a plain
 * every-nth pick can step over a one-sample peak). Pure display helper; measurements always use the
 * full waveform.
 */
export function decimateMinMax(t: ArrayLike<number>, v: ArrayLike<number>, maxPoints: number): [number, number][] {
  const n = Math.min(t.length, v.length);
  const out: [number, number][] = [];
  if (n === 0) return out;
  if (n <= maxPoints || maxPoints < 4) {
    for (let i = 0; i < n; i++) out.push([t[i], v[i]]);
    return out;
  }
  // First and last samples are kept exactly; the rest is split into buckets of two points each.
  const buckets = Math.floor((maxPoints - 2) / 2);
  out.push([t[0], v[0]]);
  const span = (n - 2) / buckets;
  for (let b = 0; b < buckets; b++) {
    const start = 1 + Math.floor(b * span);
    const end = Math.min(n - 1, 1 + Math.floor((b + 1) * span));
    if (end <= start) continue;
    let iMin = start;
    let iMax = start;
    for (let i = start + 1; i < end; i++) {
      if (v[i] < v[iMin]) iMin = i;
      if (v[i] > v[iMax]) iMax = i;
    }
    const first = Math.min(iMin, iMax);
    const second = Math.max(iMin, iMax);
    out.push([t[first], v[first]]);
    if (second !== first) out.push([t[second], v[second]]);
  }
  out.push([t[n - 1], v[n - 1]]);
  return out;
}
