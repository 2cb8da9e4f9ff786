/**
 * Signal-quality checks on one receiver edge (docs/design.md §5): first-incidence switching, overshoot and
 * undershoot against the receiver's absolute limits, ringback margin, monotonicity in the threshold
 * band. Also a single "quality margin" in volts used to rank termination trials.
 */
import type { QualityCheck } from './results.js';
import type { ReceiverEdgeMeasure } from './measures.js';

/**
 * The five checks of one measure, each with its value and limit; a differential pair adds its
 * differential level (the level Vdiff holds after switching against VIH,diff, docs/design.md §5).
 */
export function qualityChecks(m: ReceiverEdgeMeasure): QualityCheck[] {
  const base = { receiver: m.receiver, edge: m.edge, corner: m.corner };
  const pair: QualityCheck[] = m.differential
    ? [{ name: 'differential-level', pass: m.differential.level >= m.differential.threshold, value: m.differential.level, limit: m.differential.threshold, ...base }]
    : [];
  return [
    { name: 'first-incidence', pass: m.firstIncidence, value: m.firstIncidence ? 1 : 0, limit: null, ...base },
    { name: 'overshoot', pass: m.vmax <= m.vmaxAbs, value: m.vmax, limit: m.vmaxAbs, ...base },
    { name: 'undershoot', pass: m.vmin >= m.vminAbs, value: m.vmin, limit: m.vminAbs, ...base },
    { name: 'ringback', pass: m.ringbackMargin >= 0, value: m.ringbackMargin, limit: 0, ...base },
    { name: 'monotonic', pass: m.monotonic, value: m.monotonic ? 1 : 0, limit: null, ...base },
    ...pair,
  ];
}

/** Penalty for a failed yes/no check (first incidence, monotonicity) in the volt margin: 1 mV below zero. */
const BOOLEAN_FAIL_VOLTS = -1e-3;

/**
 * Worst signal-quality margin of one measure, V (positive = every check passes with that much room):
 * min of (vmaxAbs - vmax), (vmin - vminAbs), the ringback margin, and the first-incident level past
 * the far threshold (VIH rising, VIL falling), a pair's differential level past VIH,diff; a failed first-incidence or monotonicity check caps it
 * at -1 mV. Our definition for ranking, common practice, no source.
 */
export function qualityMarginVolts(m: ReceiverEdgeMeasure): number {
  const firstIncidenceRoom = m.edge === 'rising' ? m.vFirstIncidence - m.vih : m.vil - m.vFirstIncidence;
  let margin = Math.min(m.vmaxAbs - m.vmax, m.vmin - m.vminAbs, m.ringbackMargin, firstIncidenceRoom);
  if (m.differential) margin = Math.min(margin, m.differential.level - m.differential.threshold);
  if (!m.firstIncidence || !m.monotonic) margin = Math.min(margin, BOOLEAN_FAIL_VOLTS);
  return margin;
}
