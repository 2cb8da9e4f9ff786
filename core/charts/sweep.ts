/**
 * Chart of a what-if sweep (core/engine/sweep.ts, docs/design.md §6.5): the net's worst setup and hold
 * margin (ps) against the swept quantity (mm, mil or Ω), with zero and the guard band as horizontal
 * lines, the present value as a vertical line, the engine's length window shaded (length sweeps), and
 * every value failing a signal-quality check (or never crossing) banded in red with a marker whose
 * tooltip names the checks. The tooltip is drawn on the canvas (no inline-styled HTML).
 */
import type { EChartsOption } from 'echarts';
import type { NetSweep, SweepPoint } from '../engine/sweep.js';
import { niceStep } from './skew.js';
import { baseChartOption, canvasTooltip, chartPalette, CHART_FONT_SIZE, CHART_TITLE_SIZE, STATUS_COLOR, valueAxis, type ChartTheme } from './style.js';

const PS = 1e-12;
/** SI per display unit of the x axis. */
const X_FACTOR = { mm: 1e-3, mil: 25.4e-6, 'Ω': 1 } as const;
export type SweepAxisUnit = keyof typeof X_FACTOR;

export interface SweepChartOptions {
  theme?: ChartTheme;
  /** Unit of a length axis (default mm); a resistance axis is in Ω. */
  lengthUnit?: 'mm' | 'mil';
}

/** The x unit a sweep is drawn in. */
export function sweepAxisUnit(sweep: Pick<NetSweep, 'unit'>, lengthUnit: 'mm' | 'mil' = 'mm'): SweepAxisUnit {
  return sweep.unit === 'Ω' ? 'Ω' : lengthUnit;
}

/** A swept value in the axis unit, with the decimals people read (0.01 mm, 0.1 mil, 0.1 Ω). */
export function sweepValueText(si: number, unit: SweepAxisUnit): string {
  const v = si / X_FACTOR[unit];
  return `${v.toFixed(unit === 'mm' ? 2 : 1)} ${unit}`;
}

const psText = (s: number | null): string => (s === null ? 'unknown (a receiver never crosses)' : `${(s / PS).toFixed(1)} ps`);

/** Why a point fails on signal quality, in words (empty when it passes). */
export function sweepQualityText(p: SweepPoint): string[] {
  const out: string[] = [];
  if (!p.crosses) out.push('a receiver never crosses its thresholds');
  for (const c of p.failingChecks) {
    const where = `${c.receiver} ${c.edge} at ${c.corner}`;
    const amount = c.limit === null ? '' : `: ${c.value.toFixed(3)} V against ${c.limit.toFixed(3)} V`;
    out.push(`${c.name} fails ${c.count}×, worst ${where}${amount}`);
  }
  return out;
}

/** True when the point fails a signal-quality check or never crosses. */
export const failsQuality = (p: SweepPoint): boolean => !p.crosses || p.failingChecks.length > 0;

/** The tooltip text of one sweep point. */
export function sweepPointText(p: SweepPoint, unit: SweepAxisUnit, timed: boolean): string {
  const rows = [sweepValueText(p.value, unit)];
  if (timed) {
    rows.push(`setup margin ${psText(p.setupMargin)}${p.worstSetupCorner ? ` (${p.worstSetupCorner})` : ''}`);
    rows.push(`hold margin ${psText(p.holdMargin)}${p.worstHoldCorner ? ` (${p.worstHoldCorner})` : ''}`);
  }
  rows.push(`status ${p.status}, worst corner ${p.worstCorner}`);
  for (const q of sweepQualityText(p)) rows.push(`signal quality: ${q}`);
  return rows.join('\n');
}

/** ECharts option of a sweep. Pure: the same sweep gives the same option. */
export function sweepChartOption(sweep: NetSweep, options: SweepChartOptions = {}): EChartsOption {
  const theme = options.theme ?? 'light';
  const palette = chartPalette(theme);
  const unit = sweepAxisUnit(sweep, options.lengthUnit);
  const f = X_FACTOR[unit];
  const points = [...sweep.points].sort((a, b) => a.value - b.value);
  const x = (si: number) => si / f;
  const y = (s: number | null) => (s === null ? null : s / PS);
  const setupColor = palette.series[0];
  const holdColor = palette.series[1];
  const failColor = theme === 'dark' ? palette.level.limit : STATUS_COLOR.fail;

  // y range: every margin, zero and the guard band, with a little room
  const margins = points.flatMap((p) => [y(p.setupMargin), y(p.holdMargin)]).filter((v): v is number => v !== null);
  const guard = sweep.guardBand / PS;
  const lows = [...margins, 0];
  const highs = [...margins, guard];
  const span = Math.max(Math.max(...highs) - Math.min(...lows), 10);
  const step = niceStep(span / 6);
  const yMin = Math.floor((Math.min(...lows) - 0.04 * span) / step) * step;
  const yMax = Math.ceil((Math.max(...highs) + 0.04 * span) / step) * step;
  const xs = points.map((p) => x(p.value));
  const cell = xs.length > 1 ? (Math.max(...xs) - Math.min(...xs)) / (xs.length - 1) : 1;

  // contiguous runs of values failing on signal quality, each widened by half a cell
  const bands: [number, number][] = [];
  for (const p of points) {
    if (!failsQuality(p)) continue;
    const at = x(p.value);
    const last = bands[bands.length - 1];
    if (last && at - last[1] <= cell * 0.51 + 1e-12) last[1] = at + cell / 2;
    else bands.push([at - cell / 2, at + cell / 2]);
  }
  for (const b of bands) b[1] = Math.max(b[1], b[0]);
  const bandData = bands.map(([a, b]) => [{ xAxis: a, itemStyle: { color: failColor, opacity: theme === 'dark' ? 0.22 : 0.12 } }, { xAxis: b }]);

  const w = sweep.lengthWindow;
  const windowData: unknown[] = [];
  if (w && unit !== 'Ω' && w.min !== null && w.max !== null) {
    windowData.push([
      { name: 'length window', xAxis: x(w.min), itemStyle: { color: STATUS_COLOR.pass, opacity: theme === 'dark' ? 0.2 : 0.1 }, label: { show: true, position: 'insideTop', color: palette.muted, fontSize: CHART_FONT_SIZE - 2, formatter: 'length window' } },
      { xAxis: x(w.max) },
    ]);
  }
  const levelLabel = (text: string, color: string) => ({ formatter: text, position: 'insideEndTop', color, fontSize: CHART_FONT_SIZE - 1 });
  const lines: unknown[] = [
    { name: 'zero margin', yAxis: 0, lineStyle: { color: palette.level.rail, type: 'solid', width: 1 }, label: { show: false } },
    { name: 'guard band', yAxis: guard, lineStyle: { color: palette.level.threshold, type: 'dashed', width: 1.5 }, label: levelLabel(`guard band ${guard.toFixed(0)} ps`, palette.level.threshold) },
    { name: 'present value', xAxis: x(sweep.current), lineStyle: { color: palette.text, type: 'dashed', width: 1.5 }, label: { formatter: `now ${sweepValueText(sweep.current, unit)}`, position: 'end', color: palette.text, fontSize: CHART_FONT_SIZE - 1 } },
  ];
  const byX = new Map(points.map((p) => [x(p.value), p]));
  const quantity = sweep.unit === 'Ω' ? 'Resistance' : 'Length';
  const series: unknown[] = [];
  if (sweep.timed) {
    series.push(
      {
        type: 'line', name: 'Setup margin', data: points.map((p) => [x(p.value), y(p.setupMargin)]), connectNulls: false,
        symbol: 'circle', symbolSize: 6, lineStyle: { color: setupColor, width: 2 }, itemStyle: { color: setupColor },
        markLine: { symbol: 'none', silent: true, animation: false, data: lines },
        markArea: { silent: true, data: [...windowData, ...bandData] },
      },
      {
        type: 'line', name: 'Hold margin', data: points.map((p) => [x(p.value), y(p.holdMargin)]), connectNulls: false,
        symbol: 'rect', symbolSize: 6, lineStyle: { color: holdColor, width: 2, type: [6, 3] }, itemStyle: { color: holdColor },
      },
    );
  }
  // one marker per value failing on signal quality, at its worst margin (or on the zero line when unknown)
  const failing = points.filter(failsQuality);
  series.push({
    type: 'scatter', name: 'Signal-quality fail', symbol: 'triangle', symbolSize: 12,
    itemStyle: { color: failColor, borderColor: palette.background, borderWidth: 1 },
    data: failing.map((p) => [x(p.value), sweep.timed ? y(p.worstMargin) ?? 0 : 0]),
    ...(sweep.timed ? {} : {
      markLine: { symbol: 'none', silent: true, animation: false, data: lines.slice(2) },
      markArea: { silent: true, data: bandData },
    }),
  });
  return {
    ...baseChartOption(theme),
    title: {
      text: `${sweep.net}: worst margins against ${sweep.element}`,
      subtext: sweep.timed
        ? 'Worst setup and hold margin over every corner and edge at each value; red bands: a signal-quality check fails there.'
        : 'Signal quality only (this net has no margins of its own); red bands: a signal-quality check fails there.',
      left: 8, top: 4,
      textStyle: { fontSize: CHART_TITLE_SIZE, fontWeight: 'bold', color: palette.text },
      subtextStyle: { fontSize: CHART_FONT_SIZE - 1, color: palette.muted },
    },
    legend: {
      top: 48, left: 8, itemGap: 16,
      textStyle: { fontSize: CHART_FONT_SIZE - 1, color: palette.text },
      inactiveColor: palette.splitLine,
    },
    grid: { left: 68, right: 28, top: 84, bottom: 52 },
    xAxis: valueAxis(palette, `${quantity} of ${sweep.element} (${unit})`, 30, { min: Math.min(...xs, x(sweep.current)), max: Math.max(...xs, x(sweep.current)) }),
    yAxis: valueAxis(palette, 'Margin (ps)', 48, { min: yMin, max: yMax, interval: step }),
    tooltip: canvasTooltip(palette, (params: unknown) => {
      const list = Array.isArray(params) ? params : [params];
      const first = list[0] as { value?: [number, number] | number[]; axisValue?: number } | undefined;
      const at = Number(first?.value?.[0] ?? first?.axisValue);
      const p = byX.get(at);
      return p ? sweepPointText(p, unit, sweep.timed) : '';
    }),
    series,
  } as EChartsOption;
}
