/**
 * Shapes of the budget engine's results (issue: per-bus timing budgets). Produced by core/budget,
 * cached by the services, shown by the renderer and the report. SI units throughout.
 */

export type Status = 'pass' | 'tight' | 'fail';

/** Where a budget line item's number came from. */
export type ItemSource = 'input' | 'part model' | 'simulation' | 'corner';

/** One visible line of a budget: value, sign and provenance. */
export interface BudgetLineItem {
  name: string;
  /** s, as it enters the margin sum (the sign is applied: margin = sum of signed values). */
  value: number;
  source: ItemSource;
  /** Words for the reviewer, e.g. "Tco,max of CTRL-IO into 50 Ω to VTT". */
  detail: string;
}

/** A signal-quality check on one receiver, edge and corner. */
export interface QualityCheck {
  name: 'first-incidence' | 'overshoot' | 'undershoot' | 'ringback' | 'monotonic' | 'differential-level';
  pass: boolean;
  /** Measured value (V for levels, V for ringback margin; 1/0 for booleans). */
  value: number;
  /** The limit it was checked against (V), or null for boolean checks. */
  limit: number | null;
  receiver: string;
  edge: 'rising' | 'falling';
  corner: string;
}

/** Timing of one net at one corner (worst over its receivers and both edges). */
export interface CornerTiming {
  corner: string;
  /**
   * Compensated flight times, s; null when a receiver never crosses its threshold at this corner (a
   * missing crossing is a failure with its own reason, never a number: docs/design.md §5).
   */
  flightMin: number | null;
  flightMax: number | null;
  /** s; null when a flight it needs is missing (then the items are empty and the net fails). */
  setupMargin: number | null;
  holdMargin: number | null;
  setupItems: BudgetLineItem[];
  holdItems: BudgetLineItem[];
}

export interface LengthWindow {
  /** Which segment is stretched or shortened (element index in the net's topology). */
  elementIndex: number;
  layer: string;
  current: number;
  /** m; null when no length in the searched range passes (then `note` says why). Margins >= 0. */
  min: number | null;
  max: number | null;
  /**
   * m; the window for margins >= the project's guard band (inside [min, max]); null when none in the
   * searched range. Optional: results stored before it existed lack it.
   */
  guardMin?: number | null;
  guardMax?: number | null;
  /** The guard band the guard window is for, s. */
  guardBand?: number;
  /** Names the segment the window is for, both windows and what bounds each edge. */
  note: string;
}

export interface TerminationSuggestion {
  kind: 'series' | 'parallel-end';
  /** E-series value, ohm. */
  ohms: number;
  /** Worst-corner margin before and after, s (or V for signal-quality driven suggestions). */
  marginBefore: number;
  marginAfter: number;
  /** Unit of marginBefore/After: 's' for timing margins, 'V' for signal-quality margins (optional, additive). */
  marginUnit?: 's' | 'V';
  note: string;
}

export interface NetResult {
  net: string;
  bus: string;
  role: string;
  status: Status;
  /** Failing/tight reasons in words ("hold margin -35 ps at fast corner: strobe arrives 41 ps after data"). */
  reasons: string[];
  worstCorner: string;
  /** The corner (or silicon/board combination) of the worst setup and of the worst hold margin (optional, additive). */
  worstSetupCorner?: string;
  worstHoldCorner?: string;
  /** Worst over corners, s; null when some receiver never crosses (see CornerTiming). */
  flightMin: number | null;
  flightMax: number | null;
  /** Data flight relative to the bus's clock or strobe, s (worst); null when either flight is unknown or there is no reference. */
  skew: number | null;
  /** s; null when a flight the margin needs is missing (the net then fails with the reason). */
  setupMargin: number | null;
  holdMargin: number | null;
  corners: CornerTiming[];
  quality: QualityCheck[];
  lengthWindow: LengthWindow | null;
  suggestion: TerminationSuggestion | null;
  /** Hash of every input of this result (cache key). */
  inputHash: string;
  /**
   * Set when the margins are not the net's own budget, in words: a source-synchronous strobe shows the
   * worst margins it gives its data nets; a clock or strobe checked for signal quality only shows the
   * bus worst. Absent for timed nets.
   */
  marginsFrom?: string;
}

export interface BusResult {
  bus: string;
  kind: string;
  status: Status;
  /** s; null when a timed net's margin is unknown (a receiver that never crosses). */
  worstSetup: number | null;
  worstHold: number | null;
  worstNet: string | null;
  nets: NetResult[];
  /** Set when the bus could not be evaluated (no nets, missing strobe...), in words. */
  note: string | null;
}

export interface BoardResult {
  project: string;
  /** ISO time of the solve. */
  solvedAt: string;
  /** Hash over every input that went into the results. */
  fingerprint: string;
  toolVersion: string;
  buses: BusResult[];
}

/** A corner's timing without its budget line items (what a margin-table row needs of it). */
export type CornerSummary = Pick<CornerTiming, 'corner' | 'flightMin' | 'flightMax' | 'setupMargin' | 'holdMargin'>;

/**
 * A net's result as its margin-table row needs it (docs/board-partitioning.md §4, "Margin tables"):
 * every NetResult field, with corners reduced to their numbers and `quality` holding the failing checks
 * only (what a waiver is matched against). A NetResult is a NetSummary.
 */
export interface NetSummary extends Omit<NetResult, 'corners' | 'quality'> {
  corners: CornerSummary[];
  quality: QualityCheck[];
}

/** A bus result with net summaries: its margin table. A BusResult is a BusTable. */
export interface BusTable extends Omit<BusResult, 'nets'> {
  nets: NetSummary[];
}

/** A board result with margin tables instead of full net results. A BoardResult is a BoardTable. */
export interface BoardTable extends Omit<BoardResult, 'buses'> {
  buses: BusTable[];
}
