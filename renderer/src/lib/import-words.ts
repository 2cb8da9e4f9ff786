/**
 * What the length import will do with each previewed row, in words, and why — from the row the
 * services returned (core/lengths/length-report.ts states the mapping rule; this only words it).
 * A row that carries its own `action`/`reason` text from the services keeps it.
 */
import type { ImportRow } from '../../../core/contract/api.js';
import { length, type LengthUnit } from './format.js';

/** The rule rows are matched to segments by, shown above the preview. */
export const MAPPING_RULE =
  'Rows are grouped by net and layer in file order: the Nth row of a net on a layer sets the length of the Nth trace segment of that net on that layer (in the net\'s element order). Only those lengths are written.';

export interface RowWords {
  /** Will the row change the project? */
  writes: boolean;
  /** Short verdict: "will be written", "no change", "not written". */
  verdict: string;
  /** Why, in a sentence naming the segment or what is missing. */
  why: string;
}

export function rowWords(row: ImportRow & { action?: string; reason?: string }, unit: LengthUnit, ordinal?: number): RowWords {
  const seg = row.elementIndex === null || row.elementIndex === undefined ? 'its segment' : `element ${row.elementIndex + 1}`;
  const nth = ordinal ? `${ordinalWord(ordinal)} row of ${row.net} on ${row.layer}` : `row of ${row.net} on ${row.layer}`;
  let words: RowWords;
  switch (row.status) {
    case 'changed':
      words = { writes: true, verdict: 'will be written', why: `${nth}: sets ${seg} from ${length(row.previous, unit)} to ${length(row.length, unit)} (${changeText(row.length - (row.previous ?? row.length), unit)}).` };
      break;
    case 'matched':
      words = { writes: false, verdict: 'no change', why: `${nth}: ${seg} is already ${length(row.length, unit)} long.` };
      break;
    case 'new':
      words = {
        writes: false, verdict: 'not written',
        why: `${nth}: ${row.net} has fewer trace segments on ${row.layer} than the report has rows, so there is no segment for this length; adding a segment to the topology is an edit for people.`,
      };
      break;
    case 'unknown-layer':
      words = { writes: false, verdict: 'not written', why: `${row.layer} is not a copper layer of the stackup.` };
      break;
    case 'unknown-net':
      words = { writes: false, verdict: 'not written', why: `the project has no net named ${row.net} (a board-wide report lists nets outside the buses under review).` };
      break;
    default:
      words = { writes: false, verdict: row.status, why: '' };
  }
  return { ...words, ...(row.action ? { verdict: row.action } : {}), ...(row.reason ? { why: row.reason } : {}) };
}

/** The length change, signed with U+2212; below the display step it is given in µm so it never reads as zero. */
function changeText(delta: number, unit: LengthUnit): string {
  const shown = length(Math.abs(delta), unit);
  const sign = delta < 0 ? '\u2212' : '+';
  if (Number.parseFloat(shown) !== 0) return `${sign}${shown}`;
  return `${sign}${Number((Math.abs(delta) / 1e-6).toPrecision(3))} µm, below the display step`;
}

function ordinalWord(n: number): string {
  const suffix = n % 100 >= 11 && n % 100 <= 13 ? 'th' : ({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th';
  return `${n}${suffix}`;
}

/** Per row, its place among the rows of the same net and layer (1-based, file order). */
export function ordinals(rows: readonly ImportRow[]): number[] {
  const seen = new Map<string, number>();
  return rows.map((row) => {
    const key = `${row.net}\u0000${row.layer}`;
    const n = (seen.get(key) ?? 0) + 1;
    seen.set(key, n);
    return n;
  });
}
