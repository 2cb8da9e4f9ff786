/**
 * ECharts options of an IBIS model's curves (docs/ibis.md §9, "Curves for views"; display convention
 * in docs/ibis.md §10): the V-I tables against the pad voltage, each converted from its table voltage
 * with the reference it is tabulated from (§4, "The pad current"), current into the pin in mA; and the
 * V-T tables against time in ns, each named with its fixture. Pure: the workbench draws these; a
 * report could too.
 */
import type { EChartsOption } from 'echarts';
import type { ModelCurves, ViCurveView, VtCurveView } from '../ibis/curves.js';
import { baseChartOption, canvasTooltip, chartPalette, CHART_FONT_SIZE, CHART_TITLE_SIZE, valueAxis, type ChartPalette, type ChartTheme } from './style.js';

const NS = 1e-9;
const MA = 1e-3;
const PF = 1e-12;
/** Width of the legend column beside the plot, px. */
const LEGEND_WIDTH = 240;

/** The four V-I tables, in the order drawn, and how each table voltage maps onto the pad voltage. */
export const VI_TABLES = [
  { key: 'pullup', label: '[Pullup]', fromBelow: true },
  { key: 'pulldown', label: '[Pulldown]', fromBelow: false },
  { key: 'gndClamp', label: '[GND Clamp]', fromBelow: false },
  { key: 'powerClamp', label: '[POWER Clamp]', fromBelow: true },
] as const;

/**
 * A V-I table as (pad voltage V, current into the pin A) points, ascending in V. `[Pullup]` and
 * `[POWER Clamp]` are tabulated against the voltage below their reference (V = reference − table V),
 * `[Pulldown]` and `[GND Clamp]` against the voltage above theirs (V = reference + table V), §4.
 */
export function viAtPad(curve: ViCurveView, fromBelow: boolean): [number, number][] {
  const points = curve.v.map((v, k): [number, number] => [fromBelow ? curve.reference - v : curve.reference + v, curve.i[k]]);
  return points.sort((a, b) => a[0] - b[0]);
}

/** "50 Ω to 0 V" and, where the fixture has a capacitor, ", 5 pF": what a waveform was recorded into. */
export function fixtureText(w: VtCurveView): string {
  const r = `${Number(w.rFixture.toPrecision(4))} Ω to ${Number(w.vFixture.toFixed(3))} V`;
  return w.cFixture > 0 ? `${r}, ${Number((w.cFixture / PF).toPrecision(3))} pF` : r;
}

function axis(name: string, palette: ChartPalette, gap: number): Record<string, unknown> {
  return valueAxis(palette, name, gap, { scale: true });
}

function frame(title: string, subtitle: string, palette: ChartPalette, theme: ChartTheme): Record<string, unknown> {
  return {
    ...baseChartOption(theme),
    title: {
      text: title,
      subtext: subtitle,
      left: 8,
      top: 4,
      textStyle: { fontSize: CHART_TITLE_SIZE, fontWeight: 'bold', color: palette.text },
      subtextStyle: { fontSize: CHART_FONT_SIZE - 1, color: palette.muted },
    },
    // One legend row per table, beside the plot: the names carry the references and fixtures in full.
    legend: {
      orient: 'vertical', top: 64, right: 8, width: LEGEND_WIDTH, type: 'scroll', itemWidth: 24, itemGap: 10,
      textStyle: { fontSize: CHART_FONT_SIZE - 1, color: palette.text, width: LEGEND_WIDTH - 32, overflow: 'break' },
      pageTextStyle: { color: palette.text },
      inactiveColor: palette.splitLine,
    },
    grid: { left: 72, right: LEGEND_WIDTH + 24, top: 64, bottom: 52 },
  };
}

/** The canvas tooltip (canvasTooltip) listing each table's value at the pointer. */
function tooltip(palette: ChartPalette, x: (value: number) => string, y: (value: number) => string): Record<string, unknown> {
  return canvasTooltip(palette, (params: unknown) => {
    const list = (Array.isArray(params) ? params : [params]) as { seriesName?: string; value?: [number, number] }[];
    const first = list[0]?.value;
    if (!first) return '';
    return [x(first[0]), ...list.filter((p) => p.value).map((p) => `${p.seriesName}: ${y(p.value![1])}`)].join('\n');
  });
}

/** V-I chart: every table of the model at its column, against the pad voltage (V), current into the pin (mA). */
export function ibisViChartOption(curves: ModelCurves, options: { theme?: ChartTheme; subtitle?: string } = {}): EChartsOption {
  const theme = options.theme ?? 'light';
  const palette = chartPalette(theme);
  const series = VI_TABLES.flatMap((table, index) => {
    const curve = curves[table.key];
    if (!curve) return [];
    const color = palette.series[index];
    return [{
      type: 'line',
      name: `${table.label} ref ${Number(curve.reference.toFixed(3))} V`,
      data: viAtPad(curve, table.fromBelow).map(([v, i]) => [v, i / MA]),
      showSymbol: false,
      lineStyle: { width: 2, color },
      itemStyle: { color },
    }];
  });
  return {
    ...frame(`V-I tables of ${curves.model} (${curves.column} column)`, options.subtitle ?? 'current into the pin against the pad voltage', palette, theme),
    tooltip: tooltip(palette, (v) => `V = ${v.toFixed(3)} V`, (i) => `${i.toFixed(2)} mA`),
    xAxis: axis('Pad voltage (V)', palette, 30),
    yAxis: axis('Current into the pin (mA)', palette, 52),
    series,
  } as EChartsOption;
}

/** V-T chart: every [Rising Waveform] and [Falling Waveform] at the column, named with its fixture; time in ns. */
export function ibisVtChartOption(curves: ModelCurves, options: { theme?: ChartTheme; subtitle?: string } = {}): EChartsOption {
  const theme = options.theme ?? 'light';
  const palette = chartPalette(theme);
  const tables = [
    ...curves.rising.map((w, k) => ({ w, label: `[Rising Waveform] ${k + 1}: ${fixtureText(w)}`, color: palette.series[(2 * k) % palette.series.length] })),
    ...curves.falling.map((w, k) => ({ w, label: `[Falling Waveform] ${k + 1}: ${fixtureText(w)}`, color: palette.series[(2 * k + 1) % palette.series.length] })),
  ];
  const series = tables.map(({ w, label, color }) => ({
    type: 'line',
    name: label,
    data: w.t.map((t, k) => [t / NS, w.v[k]]),
    showSymbol: false,
    lineStyle: { width: 2, color, type: label.startsWith('[Falling') ? 'dashed' : 'solid' },
    itemStyle: { color },
  }));
  return {
    ...frame(`V-T tables of ${curves.model} (${curves.column} column)`, options.subtitle ?? 'pin voltage into each waveform\'s fixture', palette, theme),
    tooltip: tooltip(palette, (t) => `t = ${t.toFixed(3)} ns`, (v) => `${v.toFixed(3)} V`),
    // From t = 0 (the tables' time origin, §4) unless a table starts earlier.
    xAxis: { ...axis('Time (ns)', palette, 30), scale: false, min: Math.min(0, ...tables.map(({ w }) => (w.t[0] ?? 0) / NS)) },
    yAxis: axis('Pin voltage (V)', palette, 48),
    series,
  } as EChartsOption;
}
