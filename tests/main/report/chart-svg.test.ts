import { describe, expect, it } from 'vitest';
import { renderChartSvg, inlineSvg } from '../../../main/services/report/chart-svg.js';
import { skewChartOption } from '../../../core/charts/skew.js';
import { waveformChartOption } from '../../../core/charts/waveform.js';
import { loadResult } from '../../core/report/fixture.js';

describe('renderChartSvg', () => {
  it('renders a static SVG with the axis name and no hover style sheet', () => {
    const svg = renderChartSvg(skewChartOption(loadResult().buses[0]), 720, 300);
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).toContain('Flight time (ps)');
    expect(svg).not.toContain('<style');
    expect(svg).not.toContain('ecmeta_');
  });

  it('gives each chart its own element ids so charts can share one HTML page', () => {
    // Line series are clipped to the plot area through a clipPath with an id.
    const option = waveformChartOption({ title: 'x', traces: [{ edge: 'rising', label: 'rising', t: [0, 1e-9, 2e-9], v: [0, 1, 1] }], levels: { vil: 0.4, vih: 0.6 } });
    const ids = (svg: string) => [...svg.matchAll(/\bid="([^"]+)"/g)].map((m) => m[1]);
    const a = ids(renderChartSvg(option, 720, 300));
    const b = ids(renderChartSvg(option, 720, 300));
    expect(a.length).toBeGreaterThan(0);
    expect(a.filter((id) => b.includes(id))).toEqual([]);
  });

  it('drops the namespace URLs for inline HTML use', () => {
    const svg = inlineSvg(renderChartSvg(skewChartOption(loadResult().buses[1]), 600, 240));
    expect(svg).not.toMatch(/http/);
  });
});
