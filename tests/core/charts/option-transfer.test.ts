import { describe, expect, it } from 'vitest';
import { CALLBACK_KEY, packOption, unpackOption } from '../../../core/charts/transfer.js';
import { skewChartOption, skewWindowBar } from '../../../core/charts/skew.js';
import { waveformChartOption } from '../../../core/charts/waveform.js';
import { loadResult } from '../report/fixture.js';

// Common practice, no source: a worker thread receives a structured clone of what it is sent, and
// the structured-clone algorithm (HTML Living Standard, "StructuredSerialize") refuses functions.
describe('chart options across threads', () => {
  it('packs the skew chart into plain data that survives a structured clone, callback by name', () => {
    const option = skewChartOption(loadResult().buses[0]);
    expect(() => structuredClone(option)).toThrow();
    const packed = packOption(option);
    expect(packed).not.toBeNull();
    const copied = structuredClone(packed);
    expect(JSON.stringify(copied)).toContain(`"${CALLBACK_KEY}":"skewWindowBar"`);
    const restored = unpackOption(copied) as { series: { renderItem: unknown }[] };
    expect(restored.series[0].renderItem).toBe(skewWindowBar);
    // Everything else comes back as it was.
    expect(JSON.stringify(restored)).toBe(JSON.stringify(option));
  });

  it('leaves an option without callbacks as it is, its long number lists shared, not copied', () => {
    const option = waveformChartOption({ title: 'x', traces: [{ edge: 'rising', label: 'rising', t: [0, 1e-9, 2e-9], v: [0, 1, 1] }], levels: { vil: 0.4, vih: 0.6 } });
    const packed = packOption(option) as { series: { data: unknown }[] };
    expect(JSON.stringify(unpackOption(structuredClone(packed)))).toBe(JSON.stringify(option));
    const series = (option as { series: { data: unknown }[] }).series;
    expect(packed.series[0].data).not.toBe(series[0].data); // an array of [t, v] pairs: copied one level
    expect((packed.series[0].data as unknown[])[0]).toBe((series[0].data as unknown[])[0]); // each pair shared
  });

  it('does not pack an option holding a function it does not know (that chart is drawn where it was built)', () => {
    expect(packOption({ title: { text: 'x' }, tooltip: { formatter: () => 'tip' } })).toBeNull();
  });

  it('names the callback it cannot restore', () => {
    expect(() => unpackOption({ series: [{ renderItem: { [CALLBACK_KEY]: 'nowhere' } }] })).toThrow(/unknown callback "nowhere"/);
  });
});
