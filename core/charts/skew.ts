/**
 * Skew chart of one bus: each net's flight-time window [min, max] over all corners as a horizontal
 * bar, coloured by status, against the window of the bus's clock or strobe (the reference nets, drawn
 * as a shaded band). Input in s; the axis shows ps.
 */
import type { EChartsOption } from 'echarts';
import type { BusResult, NetResult } from '../budget/results.js';
import { baseChartOption, chartPalette, CHART_FONT_SIZE, CHART_TITLE_SIZE, STATUS_COLOR, valueAxis, type ChartTheme } from './style.js';

const PS = 1e-12;
const REFERENCE_ROLES = new Set(['strobe', 'clock']);

/** True for the nets the data is timed against (clock or strobe). */
export function isReferenceNet(net: NetResult): boolean {
  return REFERENCE_ROLES.has(net.role);
}

/** Height in px a skew chart needs to give each net a readable row. */
export function skewChartHeight(netCount: number): number {
  return Math.max(220, 140 + 18 * Math.max(netCount, 1));
}

/** [lowest flightMin, highest flightMax] of the reference nets, s; null when the bus has none. */
export function referenceWindow(bus: BusResult): [number, number] | null {
  const refs = bus.nets.filter(isReferenceNet).filter((n) => Number.isFinite(n.flightMin) && Number.isFinite(n.flightMax));
  if (!refs.length) return null;
  return [Math.min(...refs.map((n) => n.flightMin as number)), Math.max(...refs.map((n) => n.flightMax as number))];
}

/** 1, 2 or 5 times a power of ten, at least `rough`: tick steps people read easily. */
export function niceStep(rough: number): number {
  const power = 10 ** Math.floor(Math.log10(Math.max(rough, 1e-9)));
  for (const m of [1, 2, 5, 10]) if (m * power >= rough) return m * power;
  return 10 * power;
}

interface BarDatum {
  value: [number, number, number];
  itemStyle: { color: string };
}

/** What a custom series' renderItem is given of ECharts' API (the part the skew bars use). */
interface BarItemApi {
  value(dim: number): number;
  coord(point: number[]): number[];
  size(value: number[]): number[];
  visual(key: string): unknown;
}

/**
 * One net's flight-time window as a bar from its minimum to its maximum flight time (ECharts custom
 * series renderItem). Module-level and closing over nothing, so a report can name it to a worker
 * thread that draws the chart (core/charts/transfer.ts).
 */
export function skewWindowBar(_params: unknown, api: BarItemApi): Record<string, unknown> {
  const row = api.value(0);
  const start = api.coord([api.value(1), row]);
  const end = api.coord([api.value(2), row]);
  const height = Math.max(4, api.size([0, 1])[1] * 0.55);
  // A zero-width window (one corner) still gets a visible 2 px tick.
  const width = Math.max(2, end[0] - start[0]);
  return {
    type: 'rect',
    shape: { x: start[0], y: start[1] - height / 2, width, height },
    style: { fill: api.visual('color') as string },
  };
}

/**
 * ECharts option for a bus's skew chart. Pure: same input, same option. `options.title` replaces the
 * default title (the report uses it to number the parts of a long bus split over several charts).
 */
export function skewChartOption(bus: BusResult, options: { title?: string; theme?: ChartTheme } = {}): EChartsOption {
  const theme = options.theme ?? 'light';
  const palette = chartPalette(theme);
  const nets = bus.nets.filter((n) => Number.isFinite(n.flightMin) && Number.isFinite(n.flightMax));
  const names = nets.map((n) => n.net);
  const data: BarDatum[] = nets.map((n, i) => ({
    value: [i, (n.flightMin as number) / PS, (n.flightMax as number) / PS],
    itemStyle: { color: isReferenceNet(n) ? palette.level.reference : STATUS_COLOR[n.status] },
  }));
  const window = referenceWindow(bus);
  const refKind = bus.nets.some((n) => n.role === 'strobe') ? 'strobe' : 'clock';
  const title = { text: options.title ?? `${bus.bus}: flight-time window per net`, left: 8, top: 4, textStyle: { fontSize: CHART_TITLE_SIZE, fontWeight: 'bold' as const, color: palette.text } };

  if (!nets.length) {
    return {
      ...baseChartOption(theme),
      title,
      graphic: [{ type: 'text', left: 'center', top: 'middle', style: { text: 'No nets with flight times in this bus', fontSize: CHART_FONT_SIZE + 1, fill: palette.muted } }],
    } as EChartsOption;
  }

  const lows = data.map((d) => d.value[1]).concat(window ? [window[0] / PS] : []);
  const highs = data.map((d) => d.value[2]).concat(window ? [window[1] / PS] : []);
  const span = Math.max(Math.max(...highs) - Math.min(...lows), 1);
  const step = niceStep(span / 6);
  const xMin = Math.floor((Math.min(...lows) - 0.05 * span) / step) * step;
  const xMax = Math.ceil((Math.max(...highs) + 0.05 * span) / step) * step;

  return {
    ...baseChartOption(theme),
    title: {
      ...title,
      subtext: window
        ? `Bars: min to max flight time over all corners (green pass, amber tight, red fail, blue ${refKind}).\nShaded: ${refKind} window, ${(window[0] / PS).toFixed(1)} to ${(window[1] / PS).toFixed(1)} ps.`
        : 'Bars: min to max flight time over all corners (green pass, amber tight, red fail).\nNo clock or strobe net in this bus.',
      subtextStyle: { fontSize: CHART_FONT_SIZE - 1, lineHeight: Math.round((CHART_FONT_SIZE - 1) * 1.4), color: palette.muted },
    },
    grid: { left: 8, right: 24, top: 92, bottom: 44, containLabel: true },
    xAxis: valueAxis(palette, 'Flight time (ps)', 28, { min: xMin, max: xMax, interval: step }),
    yAxis: {
      type: 'category',
      data: names,
      inverse: true,
      axisLabel: { fontSize: CHART_FONT_SIZE - 1, interval: 0, color: palette.text },
      axisLine: { lineStyle: { color: palette.axisLine } },
      axisTick: { show: false },
    },
    series: [
      {
        type: 'custom',
        name: 'flight-time window',
        encode: { x: [1, 2], y: 0 },
        data,
        renderItem: skewWindowBar,
        ...(window
          ? {
              markArea: {
                silent: true,
                itemStyle: { color: 'rgba(31, 95, 168, 0.12)', borderColor: palette.level.reference, borderWidth: 1, borderType: 'dashed' },
                label: { show: true, position: 'top', distance: 3, formatter: `${refKind} window`, fontSize: CHART_FONT_SIZE - 1, color: palette.level.reference },
                data: [[{ xAxis: window[0] / PS }, { xAxis: window[1] / PS }]],
              },
            }
          : {}),
      },
    ],
  } as EChartsOption;
}
