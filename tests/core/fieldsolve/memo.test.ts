/**
 * The in-memory memo of field solutions (core/fieldsolve/memo.ts): same numbers as a direct solve,
 * copies handed out, a different geometry solved anew.
 */
import { describe, expect, it } from 'vitest';
import { cachedFieldPair, cachedFieldSingleLine, clearFieldMemo, fieldPair, pcbCrossSection } from '../../../core/fieldsolve/index.js';

const mil = 25.4e-6;

describe('field solution memo', () => {
  it('returns the direct solution, as a copy, and keys on the whole geometry', () => {
    // Determinism: the solver has no state, so a memoised answer equals a fresh one bit for bit.
    clearFieldMemo();
    const section = pcbCrossSection({ width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3, spacing: 5 * mil });
    const first = cachedFieldPair(section);
    expect(first.zodd).toBe(fieldPair(section).zodd);
    first.zodd = -1;
    expect(cachedFieldPair(section).zodd).toBe(fieldPair(section).zodd);
    const wider = cachedFieldPair(pcbCrossSection({ width: 6 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3, spacing: 5 * mil }));
    expect(wider.zodd).toBeLessThan(cachedFieldPair(section).zodd); // wider strips, lower Zodd (Cohn 1955)
    const single = cachedFieldSingleLine(pcbCrossSection({ width: 5 * mil, thickness: 1.4 * mil, below: 4 * mil, er: 4.3 }));
    expect(single.z0).toBeGreaterThan(cachedFieldPair(section).zodd); // coupling lowers Zodd below Z0
  });
});
