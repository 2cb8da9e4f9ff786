/**
 * Shared look of every chart Slackline draws (workbench and reports): fonts large enough to read on a
 * printed page, no animation (an animated chart exported mid-animation comes out blank), and one
 * palette so a status reads the same everywhere.
 */
import type { Status } from '../budget/results.js';

/** A sans-serif with the Ω and µ glyphs first; the renderers map it onto the fonts they have. */
export const CHART_FONT_FAMILY = 'DejaVu Sans, Helvetica, Arial, sans-serif';
export const CHART_FONT_SIZE = 12;
export const CHART_TITLE_SIZE = 14;

export const STATUS_COLOR: Record<Status, string> = {
  pass: '#2f7d4f',
  tight: '#b8860b',
  fail: '#c0392b',
};

/** Rising and falling edges, and the marked levels. */
export const TRACE_COLOR = { rising: '#1f5fa8', falling: '#d2691e' } as const;
export const LEVEL_COLOR = { threshold: '#6a3d9a', rail: '#555555', limit: '#c0392b', reference: '#1f5fa8' } as const;

/** Options every chart starts from. */
export function baseChartOption(): { animation: false; textStyle: { fontFamily: string; fontSize: number }; backgroundColor: string } {
  return {
    animation: false,
    textStyle: { fontFamily: CHART_FONT_FAMILY, fontSize: CHART_FONT_SIZE },
    backgroundColor: '#ffffff',
  };
}
