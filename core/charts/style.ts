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

/** Light charts for paper and the light workbench; dark charts for the dark workbench. */
export type ChartTheme = 'light' | 'dark';

/** Colours of everything a chart draws that is not data-specific. */
export interface ChartPalette {
  background: string;
  text: string;
  muted: string;
  axisLine: string;
  splitLine: string;
  /** Levels (thresholds, rails, limits) as in LEVEL_COLOR, readable on this background. */
  level: { threshold: string; rail: string; limit: string; reference: string };
  /**
   * Trace colours in order: corner i's rising edge takes series[2i], its falling edge series[2i+1].
   * The first pair is the rising/falling pair of TRACE_COLOR. The rest follow the colour-blind-safe
   * set of Okabe & Ito, "Color Universal Design" (2008), lightened on the dark background.
   */
  series: string[];
  crossingFill: string;
  crossingBorder: string;
}

const LIGHT: ChartPalette = {
  background: '#ffffff',
  text: '#1d1f21',
  muted: '#555555',
  axisLine: '#6e7079',
  splitLine: '#e4e4e4',
  level: LEVEL_COLOR,
  series: [TRACE_COLOR.rising, TRACE_COLOR.falling, '#009e73', '#cc79a7', '#56b4e9', '#e69f00', '#000000', '#8c564b', '#7f7f7f', '#b8860b'],
  crossingFill: '#ffffff',
  crossingBorder: '#222222',
};

const DARK: ChartPalette = {
  background: '#1f2226',
  text: '#e6e6e3',
  muted: '#a3a8ae',
  axisLine: '#8a9099',
  splitLine: '#33383f',
  level: { threshold: '#c39bea', rail: '#b0b4ba', limit: '#f0877a', reference: '#6ea6d8' },
  series: ['#6ea6d8', '#f0a35e', '#3fd0a0', '#e8a0cc', '#9ed3f5', '#f5c242', '#e6e6e3', '#d39c8e', '#b8bcc2', '#e2bd55'],
  crossingFill: '#1f2226',
  crossingBorder: '#e6e6e3',
};

export function chartPalette(theme: ChartTheme = 'light'): ChartPalette {
  return theme === 'dark' ? DARK : LIGHT;
}

/** Options every chart starts from. */
export function baseChartOption(theme: ChartTheme = 'light'): {
  animation: false; textStyle: { fontFamily: string; fontSize: number; color: string }; backgroundColor: string;
} {
  const palette = chartPalette(theme);
  return {
    animation: false,
    textStyle: { fontFamily: CHART_FONT_FAMILY, fontSize: CHART_FONT_SIZE, color: palette.text },
    backgroundColor: palette.background,
  };
}

/**
 * A value axis in the shared look: its name (with the unit) centred along it, labels that never
 * print over each other, the palette's line colours. `extra` adds range, interval or scale.
 */
export function valueAxis(palette: ChartPalette, name: string, nameGap: number, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    type: 'value',
    name,
    nameLocation: 'middle',
    nameGap,
    ...extra,
    nameTextStyle: { color: palette.text },
    axisLabel: { fontSize: CHART_FONT_SIZE - 1, color: palette.text, hideOverlap: true },
    axisLine: { lineStyle: { color: palette.axisLine } },
    splitLine: { lineStyle: { color: palette.splitLine } },
  };
}

/**
 * An axis-triggered tooltip drawn on the canvas: an HTML tooltip needs inline styles, which the
 * workbench page's style policy refuses (docs/workbench.md).
 */
export function canvasTooltip(palette: ChartPalette, formatter: (params: unknown) => string, fontSize = CHART_FONT_SIZE): Record<string, unknown> {
  return {
    trigger: 'axis',
    renderMode: 'richText',
    confine: true,
    backgroundColor: palette.background,
    borderColor: palette.axisLine,
    textStyle: { color: palette.text, fontSize },
    axisPointer: { type: 'line', label: { show: false } },
    formatter,
  };
}
