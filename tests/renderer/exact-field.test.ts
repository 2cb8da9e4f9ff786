/**
 * Exact editor fields (renderer/src/lib/exact-field.ts) and the part form's cross-field checks
 * (renderer/src/lib/part-form.ts). Workbench issue: "Edits must store exactly what was typed (or the
 * unchanged stored value), in SI, with no round trip through display text."
 */
import { describe, expect, it } from 'vitest';
import { canonicalJson, fieldOf, readField, reshow, sameData, touched, unitText } from '../../renderer/src/lib/exact-field.js';
import { parseInColumn } from '../../renderer/src/lib/quantity-text.js';
import { partCrossChecks } from '../../renderer/src/lib/part-form.js';
import { SI_PER } from '../../core/units/quantity.js';
import type { DriverModel, ReceiverModel } from '../../core/project/model.js';

const milText = (si: number) => unitText(si, SI_PER.mil, 'mil');
const mmText = (si: number) => unitText(si, SI_PER.mm, 'mm');
const parseMil = (t: string) => parseInColumn(t, 'length', 'mil', 'thickness');
const parseMm = (t: string) => parseInColumn(t, 'length', 'mm', 'thickness');

describe('exact fields', () => {
  it('gives back the stored value bit for bit while the text is as shown, although the text is rounded', () => {
    // 125 µm = 4.921259842... mil; shown as "4.92126 mil", which parses to 124.99999... µm, not 125 µm.
    const field = fieldOf(125e-6, milText);
    expect(field.text).toBe('4.92126 mil');
    expect(parseMil(field.text)).not.toBe(125e-6);
    expect(readField(field, parseMil)).toBe(125e-6);
    expect(touched(field)).toBe(false);
  });

  it('parses what was typed once the text changes, bare numbers in the field unit', () => {
    const field = { ...fieldOf(125e-6, milText), text: '5' };
    expect(touched(field)).toBe(true);
    expect(readField(field, parseMil)).toBe(5 * SI_PER.mil); // parseInColumn: "5 mil" = 5 × 25.4 µm
  });

  it('re-renders on a unit switch and keeps the exact value, stored or typed', () => {
    const untouched = reshow(fieldOf(125e-6, milText), mmText, parseMil);
    expect(untouched.text).toBe('0.125 mm');
    expect(readField(untouched, parseMm)).toBe(125e-6);
    const typed = reshow({ ...fieldOf(125e-6, milText), text: '4.2 mil' }, mmText, parseMil);
    expect(typed.text).toBe('0.10668 mm'); // 4.2 × 0.0254 mm, six significant digits
    expect(readField(typed, parseMm)).toBe(parseMil('4.2 mil')); // the typed value, not the rounded mm text
    const bad = { ...fieldOf(125e-6, milText), text: 'thin' };
    expect(reshow(bad, mmText, parseMil)).toBe(bad); // left as typed, still refused
  });

  it('reads an emptied optional field as null and keeps an absent value absent', () => {
    expect(readField({ ...fieldOf(0.02, String), text: ' ' }, Number, true)).toBeNull();
    expect(readField(fieldOf(undefined, String), Number, true)).toBeNull();
  });

  it('compares data whatever the order of keys, ignoring undefined members', () => {
    expect(sameData({ a: 1, b: { c: 2, d: undefined } }, { b: { c: 2 }, a: 1 })).toBe(true);
    expect(sameData({ a: 1 }, { a: 1.0000000000000002 })).toBe(false); // one ulp is a change
    expect(canonicalJson({ b: 1, a: [{ d: 1, c: 2 }] })).toBe('{"a":[{"c":2,"d":1}],"b":1}');
  });
});

describe('part cross checks', () => {
  // Invented part values.
  const receiver: ReceiverModel = { cin: 1e-12, vil: 0.5, vih: 0.7, vref: 0.6, odtOhms: null, odtVtt: 0.6, vmaxAbs: 1.6, vminAbs: -0.4, tsetup: 1e-10, thold: 1e-10 };
  const driver = { vol: 0, voh: 1.2, tcoMin: 1e-10, tcoMax: 3e-10 } as DriverModel;

  it('refuses VIH at or below VIL on the VIH field, in words with the true minus', () => {
    // core/project/validate.ts refuses the same: "VIL must be below VIH"
    expect(partCrossChecks('MEMX', null, { ...receiver, vih: 0.4 })).toEqual({ 'receiver.vih': 'MEMX receiver VIH (AC): 0.4 V must be above VIL (0.5 V)' });
    expect(partCrossChecks('MEMX', null, { ...receiver, vminAbs: 1.7 })['receiver.vmaxAbs']).toMatch(/must be above the absolute minimum/);
    expect(partCrossChecks('MEMX', null, { ...receiver, vil: -0.2, vih: -0.3 })['receiver.vih']).toContain('\u22120.3 V');
    expect(partCrossChecks('MEMX', null, receiver)).toEqual({});
  });

  it('refuses VOH not above VOL and Tco max below Tco min, and skips pairs already in error', () => {
    expect(Object.keys(partCrossChecks('CTL', { ...driver, voh: 0 }, null))).toEqual(['driver.voh']);
    expect(partCrossChecks('CTL', { ...driver, tcoMax: 5e-11 }, null)['driver.tcoMax']).toBe('CTL driver Tco max: 50 ps is below Tco min (100 ps)');
    expect(partCrossChecks('CTL', { ...driver, voh: 0 }, null, { 'driver.voh': 'not a number' })).toEqual({});
  });
});
