/**
 * Picks, from a net's simulated waveforms, what the report plots for a failing or tight net: the
 * receiver that failed (or the first one), at the net's worst corner, both edges, with its thresholds
 * and limits and the threshold crossings marked.
 */
import type { NetWaveforms } from '../engine/waveforms.js';
import type { NetResult } from '../budget/results.js';
import type { WaveformChartInput, WaveformCrossing, WaveformTrace, Edge } from '../charts/waveform.js';
import { firstCrossing, lastCrossing } from '../measure/crossings.js';

/**
 * The crossings docs/design.md §5 measures on one edge, as chart markers: first crossing of the near
 * threshold (minimum flight time), first and last crossing of the far threshold (first-incidence
 * switching and maximum flight time). Rising: near VIL, far VIH; falling: near VIH, far VIL.
 */
export function edgeCrossings(edge: Edge, t: ArrayLike<number>, v: ArrayLike<number>, vil: number, vih: number): WaveformCrossing[] {
  const tt = Float64Array.from(t);
  const vv = Float64Array.from(v);
  const dir = edge === 'rising' ? 'up' : 'down';
  const [nearName, near, farName, far] = edge === 'rising' ? ['VIL', vil, 'VIH', vih] as const : ['VIH', vih, 'VIL', vil] as const;
  const out: WaveformCrossing[] = [];
  const push = (level: string, value: number, time: number | null) => {
    if (time !== null && !out.some((c) => c.level === level && c.t === time)) out.push({ edge, level, t: time, v: value });
  };
  push(nearName, near, firstCrossing(tt, vv, near, dir));
  push(farName, far, firstCrossing(tt, vv, far, dir));
  push(farName, far, lastCrossing(tt, vv, far, dir));
  return out;
}

/** The corner a net's plot shows: that of its first failing signal check, else its worst corner. */
export function plotCorner(net: NetResult): string {
  return net.quality.find((q) => !q.pass)?.corner ?? net.worstCorner;
}

export interface WaveformPick {
  receiver: string;
  corner: string;
  input: WaveformChartInput;
}

/**
 * Builds the chart input for `net`, or null when the waveforms hold nothing for it.
 * `rails` are the driver's low and high output levels at that corner, V (drawn as the rails).
 */
export function pickWaveform(
  net: NetResult,
  waveforms: NetWaveforms,
  rails: { low: number; high: number } | null,
  nodeOf: (receiver: string) => string = (receiver) => receiver,
): WaveformPick | null {
  if (!waveforms.thresholds.length || !waveforms.corners.length) return null;
  // Traces are keyed by node; a threshold names its receiver by node or by designator.
  const traceKey = (receiver: string) =>
    waveforms.corners.some((c) => c.v[receiver]) ? receiver : nodeOf(receiver);
  const failing = net.quality.find((q) => !q.pass);
  const threshold =
    waveforms.thresholds.find((th) => th.receiver === failing?.receiver && waveforms.corners.some((c) => c.v[traceKey(th.receiver)])) ??
    waveforms.thresholds.find((th) => waveforms.corners.some((c) => c.v[traceKey(th.receiver)])) ??
    null;
  if (!threshold) return null;
  const receiver = threshold.receiver;
  const key = traceKey(receiver);
  const preferred = plotCorner(net);
  const atCorner = (corner: string) => waveforms.corners.filter((c) => c.corner === corner && c.v[key]);
  let runs = atCorner(preferred);
  if (!runs.length) runs = atCorner(net.worstCorner);
  if (!runs.length) runs = waveforms.corners.filter((c) => c.v[key]);
  if (!runs.length) return null;
  const corner = runs[0].corner;
  runs = runs.filter((r) => r.corner === corner);

  const traces: WaveformTrace[] = [];
  const crossings: WaveformCrossing[] = [];
  for (const edge of ['rising', 'falling'] as Edge[]) {
    const run = runs.find((r) => r.edge === edge);
    if (!run) continue;
    const v = run.v[key];
    traces.push({ edge, label: `${edge} (${corner})`, t: run.t, v });
    crossings.push(...edgeCrossings(edge, run.t, v, threshold.vil, threshold.vih));
  }
  return {
    receiver,
    corner,
    input: {
      title: `${net.net} at receiver ${receiver}`,
      subtitle: `${corner} corner; circles: first near-threshold and first/last far-threshold crossings (flight-time points)`,
      traces,
      levels: {
        vil: threshold.vil,
        vih: threshold.vih,
        ...(Number.isFinite(threshold.vmaxAbs) ? { vmaxAbs: threshold.vmaxAbs } : {}),
        ...(Number.isFinite(threshold.vminAbs) ? { vminAbs: threshold.vminAbs } : {}),
        ...(rails ? { railLow: rails.low, railHigh: rails.high } : {}),
      },
      crossings,
    },
  };
}
