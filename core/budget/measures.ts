/**
 * What the budget engine needs from one receiver waveform (one net, corner, edge, receiver), in SI.
 * Filled from the solver's measurements (core/measure) by core/budget/evaluate-net.ts; kept as its own
 * small shape so the budget arithmetic can be tested on hand-made numbers.
 */
import type { Edge } from '../circuit/types.js';

export type { Edge };

export interface ReceiverEdgeMeasure {
  /** Receiver designator (e.g. "U4"), used to pair data and strobe receivers. */
  receiver: string;
  node: string;
  corner: string;
  edge: Edge;
  /** Driver's crossing of Vmeas into its reference load, s from the start of the ramp (docs/design.md §5). */
  tReference: number;
  /** First crossing of the near threshold (VIL rising, VIH falling), s from ramp start; null if never. */
  tNearFirst: number | null;
  /** Last crossing of the far threshold (VIH rising, VIL falling), s from ramp start; null if never. */
  tFarLast: number | null;
  /** Level the first incident wave reaches at the receiver, V. */
  vFirstIncidence: number;
  firstIncidence: boolean;
  vmax: number;
  vmin: number;
  /** Distance kept from the far threshold after the first far crossing, V (negative = re-enters the band). */
  ringbackMargin: number;
  monotonic: boolean;
  /** Thresholds and limits this receiver was checked against at this corner, V. */
  vil: number;
  vih: number;
  vmaxAbs: number;
  vminAbs: number;
  /** End of the simulated window, s: used as a bound when the receiver never crosses. */
  tStop: number;
  /**
   * Slew rate through the threshold band, V/s: |VIH − VIL| over the time from the first near to the
   * first far crossing (for slew-rate derating, docs/design.md §6.4); absent or null when unknown.
   */
  slew?: number | null;
  /**
   * Differential pairs only (docs/design.md §5): the differential threshold VIH,diff = VIH − VIL of the
   * leg thresholds (entered as Vcm ± Vth,diff/2), V, and the level Vdiff holds once it has reached it
   * (the highest it reaches when it never does), V.
   */
  differential?: { threshold: number; level: number };
}

/**
 * Compensated flight times of one measure, s (docs/design.md §5): receiver crossing minus the driver's
 * crossing of Vmeas into its reference load. null when the receiver never crosses.
 */
export function flightTimes(m: ReceiverEdgeMeasure): { min: number | null; max: number | null } {
  return {
    min: m.tNearFirst === null ? null : m.tNearFirst - m.tReference,
    max: m.tFarLast === null ? null : m.tFarLast - m.tReference,
  };
}
