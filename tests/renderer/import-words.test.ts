/**
 * The import preview's per-row words (renderer/src/lib/import-words.ts). Workbench issue: "Show per
 * row what will happen and why, in words"; the mapping rule is core/lengths/length-report.ts's.
 */
import { describe, expect, it } from 'vitest';
import { ordinals, rowWords } from '../../renderer/src/lib/import-words.js';
import type { ImportRow } from '../../core/contract/api.js';

// Invented rows.
const row = (over: Partial<ImportRow>): ImportRow => ({ net: 'DQ3', layer: 'L3', length: 0.0254, width: null, line: 2, status: 'matched', previous: null, elementIndex: 2, ...over });

describe('rowWords', () => {
  it('says a changed row is written, naming the element and both lengths', () => {
    const w = rowWords(row({ status: 'changed', previous: 0.0127 }), 'mil', 1);
    expect(w.writes).toBe(true);
    expect(w.verdict).toBe('will be written');
    expect(w.why).toBe('1st row of DQ3 on L3: sets element 3 from 500.0 mil to 1000.0 mil (+500.0 mil).'); // 12.7 mm = 500 mil, 25.4 mm = 1000 mil
    // A change below the display step (0.1 mil) is given in µm, never as "+0.0 mil": 1 µm = 0.039 mil.
    expect(rowWords(row({ status: 'changed', previous: 0.0254, length: 0.0254 - 1e-6 }), 'mil').why).toMatch(/\(\u22121 µm, below the display step\)\.$/);
  });

  it('says why new, unknown-layer and unknown-net rows write nothing', () => {
    expect(rowWords(row({ status: 'new', elementIndex: null }), 'mm', 2)).toMatchObject({ writes: false, verdict: 'not written' });
    expect(rowWords(row({ status: 'new', elementIndex: null }), 'mm', 2).why).toMatch(/^2nd row of DQ3 on L3: DQ3 has fewer trace segments on L3 than the report has rows/);
    expect(rowWords(row({ status: 'unknown-layer', layer: 'L9' }), 'mm').why).toBe('L9 is not a copper layer of the stackup.');
    expect(rowWords(row({ status: 'unknown-net', net: 'X1' }), 'mm').why).toMatch(/^the project has no net named X1/);
    expect(rowWords(row({}), 'mm', 3)).toEqual({ writes: false, verdict: 'no change', why: '3rd row of DQ3 on L3: element 3 is already 25.400 mm long.' });
  });

  it('keeps the services\' own words when a row carries them', () => {
    const w = rowWords({ ...row({ status: 'new' }), action: 'added as a new segment', reason: 'placed after element 3' }, 'mm');
    expect(w.verdict).toBe('added as a new segment');
    expect(w.why).toBe('placed after element 3');
  });

  it('numbers rows per net and layer in file order', () => {
    expect(ordinals([row({}), row({ layer: 'L1' }), row({}), row({ net: 'DQ4' }), row({})])).toEqual([1, 1, 2, 1, 3]);
  });
});
