import { describe, expect, it } from 'vitest';
import { ChartDrawings, type ChartRequest } from '../../../main/services/report/chart-drawings.js';
import { drawChartSvg } from '../../../main/services/report/chart-svg.js';
import { skewChartOption } from '../../../core/charts/skew.js';
import { waveformChartOption } from '../../../core/charts/waveform.js';
import { loadResult } from '../../core/report/fixture.js';

// The drawings must not depend on the thread that drew them (docs/design.md §8.6): each is compared
// with the calling thread's own drawing of the same option, element ids aside (each drawing numbers
// its ids afresh, and its style-class numbers count on per thread). Common practice, no source.
const sameIds = (svg: string) => svg.replace(/\b(?:slc|zr)\d+-/g, 'id-').replace(/\bcls-\d+/g, 'cls-n');

function requests(): ChartRequest[] {
  const result = loadResult();
  const wave = waveformChartOption({
    title: 'DQ0 at U2',
    traces: [
      { edge: 'rising', label: 'rising', t: [0, 1e-9, 2e-9, 3e-9], v: [0, 0.9, 1.3, 1.2] },
      { edge: 'falling', label: 'falling', t: [0, 1e-9, 2e-9, 3e-9], v: [1.2, 0.4, -0.1, 0] },
    ],
    levels: { vil: 0.5, vih: 0.7, railLow: 0, railHigh: 1.2 },
  });
  return [
    ...result.buses.map((bus) => ({ option: skewChartOption(bus), width: 666, height: 300 })),
    { option: wave, width: 666, height: 340 },
  ];
}

describe('ChartDrawings', () => {
  it('draws on a worker thread exactly what the calling thread draws, skew bars (a callback) included', async () => {
    const charts = requests();
    const drawings = new ChartDrawings({ offThreadFrom: 1 });
    drawings.drawAhead(charts);
    const svgs = await Promise.all(charts.map((c) => drawings.svg(c.option, c.width, c.height)));
    await drawings.close();
    expect(drawings.where()).toEqual({ offThread: charts.length, here: 0 });
    svgs.forEach((svg, i) => expect(sameIds(svg)).toBe(sameIds(drawChartSvg(charts[i].option, charts[i].width, charts[i].height))));
    // Every drawing keeps ids of its own, so one HTML page can hold them all.
    const ids = svgs.flatMap((svg) => [...new Set([...svg.matchAll(/\bid="([^"]+)"/g)].map((m) => m[1]))]);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('draws each chart once per size for both formats, and any other size on the calling thread', async () => {
    const [chart] = requests();
    const drawings = new ChartDrawings({ offThreadFrom: 1 });
    drawings.drawAhead([chart]);
    const first = await drawings.svg(chart.option, chart.width, chart.height);
    expect(await drawings.svg(chart.option, chart.width, chart.height)).toBe(first);
    await drawings.svg(chart.option, 400, 200);
    await drawings.close();
    expect(drawings.where()).toEqual({ offThread: 1, here: 1 });
  });

  it('draws on the calling thread below the threshold, when the worker cannot start, or for an option it cannot take', async () => {
    const charts = requests();
    const few = new ChartDrawings({ offThreadFrom: charts.length + 1 });
    few.drawAhead(charts);
    await Promise.all(charts.map((c) => few.svg(c.option, c.width, c.height)));
    expect(few.where()).toEqual({ offThread: 0, here: charts.length });

    const missing = new ChartDrawings({ offThreadFrom: 1, entry: new URL('./no-such-chart-worker.mjs', import.meta.url) });
    missing.drawAhead(charts);
    const svgs = await Promise.all(charts.map((c) => missing.svg(c.option, c.width, c.height)));
    await missing.close();
    expect(missing.where()).toEqual({ offThread: 0, here: charts.length });
    expect(sameIds(svgs[0])).toBe(sameIds(drawChartSvg(charts[0].option, charts[0].width, charts[0].height)));

    const withTooltip = { option: { ...charts[0].option, tooltip: { formatter: () => 'tip' } }, width: 666, height: 300 };
    const mixed = new ChartDrawings({ offThreadFrom: 1 });
    mixed.drawAhead([withTooltip, ...charts.slice(1)]);
    await Promise.all([withTooltip, ...charts.slice(1)].map((c) => mixed.svg(c.option, c.width, c.height)));
    await mixed.close();
    expect(mixed.where()).toEqual({ offThread: charts.length - 1, here: 1 });
  });

  it('stops drawing when the export is closed part-way: what is still pending fails with a clear message', async () => {
    const charts = Array.from({ length: 40 }, () => requests()[0]).map((c, i) => ({ ...c, height: 300 + i }));
    const drawings = new ChartDrawings({ offThreadFrom: 1 });
    drawings.drawAhead(charts);
    await drawings.close();
    const last = charts[charts.length - 1];
    await expect(drawings.svg(last.option, last.width, last.height)).rejects.toThrow(/report export stopped before this chart was drawn/);
  });
});
