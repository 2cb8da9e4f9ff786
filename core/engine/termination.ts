/**
 * Termination suggestion for a net that fails on signal quality: a series resistor at the driver or a
 * parallel resistor at the far end, chosen from the E24 series of preferred values, that maximises the
 * net's worst-corner combined margin (defined in `combinedMargin`).
 */
import type { TerminationSuggestion } from '../budget/results.js';
import { formatIn } from '../units/quantity.js';

/** E24 preferred-number mantissas (IEC 60063:2015, "Preferred number series for resistors and capacitors"). */
export const E24 = [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1] as const;

/** E24 values from `min` to `max` ohm inclusive, ascending. */
export function e24Values(min: number, max: number): number[] {
  const out: number[] = [];
  for (let decade = 1e-1; decade <= 1e7; decade *= 10) {
    for (const m of E24) {
      const value = Number((m * decade).toPrecision(3));
      if (value >= min * (1 - 1e-9) && value <= max * (1 + 1e-9)) out.push(value);
    }
  }
  return out;
}

/**
 * Worst-corner combined margin, s: the smaller of the timing margin (min of setup and hold over
 * corners) and the signal-quality margin (V, see qualityMarginVolts) converted to time through the
 * edge's slew rate (swing / full ramp time at the typical corner): a voltage shortfall of dV costs about
 * dV / slew of edge placement. Our definition, common practice, no source.
 */
export function combinedMargin(timingMargin: number, qualityMarginVolts: number, slewVoltsPerSecond: number): number {
  return Math.min(timingMargin, qualityMarginVolts / slewVoltsPerSecond);
}

/** Series resistor range searched, ohm: up to about a 75 Ω line less a strong driver — common practice, no source. */
export const SERIES_RANGE = { min: 10, max: 75 } as const;
/** Parallel (end) resistor range searched, ohm: around common 40–60 Ω lines — common practice, no source. */
export const PARALLEL_RANGE = { min: 22, max: 150 } as const;

export type TerminationKind = TerminationSuggestion['kind'];

/** Where each kind of trial sits and what it costs, in words and numbers, for the note. */
export interface TerminationContext {
  seriesAt: string;
  parallelAt: string;
  /** Voltage of the board rail a parallel termination goes to, V. */
  vtt: number;
  /** Name of that rail (one the board has: the net's own rails). */
  rail?: string;
  /** DC power of a parallel termination of `ohms` with the line high and low, W (50 % duty average shown). */
  power?: (ohms: number) => { high: number; low: number };
}

/**
 * Tries each kind in `kinds` order over its E24 range: every third value first, then the E24 neighbours
 * of the best (the margin is a smooth, single-peaked function of R on these ranges, so this finds the
 * same best value as the full scan in about half the trials). `evaluate` returns the combined margin,
 * s. A later kind must beat an earlier one by more than 0.1 ps to be chosen, so the option the net
 * already uses, tried first, wins a tie (this program's choice).
 */
export function suggestTermination(
  evaluate: (kind: TerminationKind, ohms: number) => number,
  marginBefore: number,
  describe: TerminationContext,
  kinds: readonly TerminationKind[] = ['series', 'parallel-end'],
): TerminationSuggestion | null {
  let best: { kind: TerminationKind; ohms: number; margin: number } | null = null;
  for (const kind of kinds) {
    const range = kind === 'series' ? SERIES_RANGE : PARALLEL_RANGE;
    const values = e24Values(range.min, range.max);
    const tried = new Map<number, number>();
    const trial = (i: number): number => {
      const ohms = values[i];
      let m = tried.get(ohms);
      if (m === undefined) {
        m = evaluate(kind, ohms);
        tried.set(ohms, m);
      }
      return m;
    };
    let bestIndex = 0;
    for (let i = 0; i < values.length; i += 3) if (trial(i) > trial(bestIndex)) bestIndex = i;
    if ((values.length - 1) % 3 !== 0 && trial(values.length - 1) > trial(bestIndex)) bestIndex = values.length - 1;
    for (const d of [-2, -1, 1, 2]) {
      const i = bestIndex + d;
      if (i >= 0 && i < values.length && trial(i) > trial(bestIndex)) bestIndex = i;
    }
    const margin = trial(bestIndex);
    if (!best || margin > best.margin + 0.1e-12) best = { kind, ohms: values[bestIndex], margin };
  }
  if (!best || !(best.margin > marginBefore)) return null;
  const ps = (s: number): string => formatIn(s, 'ps', 0);
  const mW = (w: number): string => formatIn(w, 'mW', 1);
  let where = best.kind === 'series'
    ? `in series at the driver (${describe.seriesAt})`
    : `from ${describe.parallelAt} to the board's ${describe.rail ? `${describe.rail} ` : ''}rail at ${formatIn(describe.vtt, 'V', 2)}`;
  if (best.kind === 'parallel-end' && describe.power) {
    // DC power in the resistor with the line held high and low (P = V²/R, Joule), averaged at 50 % duty
    const p = describe.power(best.ohms);
    where += ` (DC power in the resistor about ${mW((p.high + p.low) / 2)} at 50 % duty: ${mW(p.high)} high, ${mW(p.low)} low)`;
  }
  return {
    kind: best.kind,
    ohms: best.ohms,
    marginBefore,
    marginAfter: best.margin,
    note: `${best.ohms} Ω (E24) ${where} raises the worst-corner combined margin from ${ps(marginBefore)} to ${ps(best.margin)} ` +
      `(gain ${ps(best.margin - marginBefore)}; combined margin = the smaller of the timing margin and the signal-quality margin ` +
      'divided by the edge slew rate)',
  };
}
