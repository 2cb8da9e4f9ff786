/**
 * The client listing of a stored IBIS file (docs/ibis.md §9, "What clients see"): name, SHA-256,
 * size in characters and the §6 summary, never the text; a stored text that no longer parses is
 * listed with the parser's located message instead of a summary, so the project still loads.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ibisFileInfo } from '../../../core/netbuild/ibis-parts.js';
import { sha256Hex } from '../../../core/hash/sha256.js';
import { parseIbis } from '../../../core/ibis/parse.js';
import { summariseIbis } from '../../../core/ibis/summary.js';

const HERON = readFileSync(new URL('../../../fixtures/ibis/heron_m4.ibs', import.meta.url), 'utf8');

describe('ibisFileInfo', () => {
  it('lists name, hash, size and the summary `slackline ibis` prints, without the text', () => {
    const info = ibisFileInfo({ name: 'heron_m4.ibs', sha256: sha256Hex(HERON), text: HERON });
    expect(info).toEqual({
      name: 'heron_m4.ibs', sha256: sha256Hex(HERON), characters: HERON.length,
      summary: summariseIbis(parseIbis(HERON, 'heron_m4.ibs')), problem: null,
    });
    expect(Object.keys(info)).not.toContain('text');
    // Asked again for the same content: the same summary object (kept by hash, not recomputed).
    expect(ibisFileInfo({ name: 'heron_m4.ibs', sha256: sha256Hex(HERON), text: HERON }).summary).toBe(info.summary);
  });

  it('gives the parser\'s located message for a stored text that does not parse', () => {
    const text = HERON.replace(/\[GND Clamp\]/i, '[GND Clamp]\n 0.0 nonsense 1 2');
    const info = ibisFileInfo({ name: 'bad.ibs', sha256: sha256Hex(text), text });
    expect(info.summary).toBeNull();
    // docs/ibis.md §1: errors name the file, the line and the keyword.
    expect(info.problem).toMatch(/^bad\.ibs line \d+ \[GND Clamp\]: /);
  });
});
