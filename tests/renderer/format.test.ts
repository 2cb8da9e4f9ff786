/**
 * Display helpers (renderer/src/lib/format.ts). docs/design.md §8: numbers shown to people carry units
 * and sensible precision (ps, mil/mm, pF, Ω, V); never NaN in output (a dash instead).
 */
import { describe, expect, it } from 'vitest';
import { auto, delayPerLength, editable, length, margin, ohms, prose, ps, thickness, volts, when } from '../../renderer/src/lib/format.js';

const DASH = '—';

describe('times', () => {
  it('shows picoseconds with the unit and the asked decimals', () => {
    // docs/design.md §8: units always shown; 0 decimals for table picoseconds is common practice, no source
    expect(ps(2.3e-10)).toBe('230 ps');
    expect(ps(2.345e-10, 1)).toBe('234.5 ps');
    expect(ps(-12e-12)).toBe('\u221212 ps'); // the true minus sign on every screen (U+2212)
  });

  it('shows a dash for a missing or non-finite time, never NaN', () => {
    // docs/design.md §8: never NaN shown to people
    expect(ps(null)).toBe(DASH);
    expect(ps(undefined)).toBe(DASH);
    expect(ps(Number.NaN)).toBe(DASH);
    expect(ps(Number.POSITIVE_INFINITY)).toBe(DASH);
  });

  it('signs margins: "+12 ps", a true minus "−35 ps", and an unsigned "0 ps" for anything that rounds to zero', () => {
    // common practice, no source: a margin's sign is its meaning; U+2212 minus for typeset tables
    expect(margin(12e-12)).toBe('+12 ps');
    expect(margin(-35e-12)).toBe('\u221235 ps');
    expect(margin(-35.4e-12)).toBe('\u221235 ps');
    expect(margin(0)).toBe('0 ps');
    expect(margin(-0.4e-12)).toBe('0 ps');
    expect(margin(0.4e-12)).toBe('0 ps');
  });

  it('shows a dash for a missing or non-finite margin', () => {
    // docs/design.md §8: never NaN or Infinity shown to people
    expect(margin(null)).toBe(DASH);
    expect(margin(undefined)).toBe(DASH);
    expect(margin(Number.NaN)).toBe(DASH);
    expect(margin(Number.NEGATIVE_INFINITY)).toBe(DASH);
  });

  it('auto picks an engineering unit with 3 significant digits', () => {
    // core/units/quantity.ts formatQuantity contract: 1.7e-10 s -> "170 ps"
    expect(auto(1.7e-10, 'time')).toBe('170 ps');
    expect(auto(2.5e-9, 'time')).toBe('2.5 ns');
    expect(auto(1.234e-12, 'capacitance')).toBe('1.23 pF');
    expect(auto(Number.NaN, 'time')).toBe(DASH);
  });
});

describe('lengths, thicknesses, delay per length', () => {
  it('shows lengths in mil with 1 decimal and in mm with 3 (1 mil = 25.4 µm exactly)', () => {
    // NIST SP 811 (2008) appendix B: 1 in = 0.0254 m exactly; decimals: common practice, no source
    expect(length(0.0254, 'mil')).toBe('1000.0 mil');
    expect(length(0.0254, 'mm')).toBe('25.400 mm');
    expect(length(null, 'mm')).toBe(DASH);
    expect(length(Number.NaN, 'mil')).toBe(DASH);
  });

  it('shows thicknesses with one more digit: 35 µm copper is 1.38 mil / 0.0350 mm', () => {
    // NIST SP 811 (2008): 1 mil = 25.4 µm; 35 µm / 25.4 µm = 1.378
    expect(thickness(35e-6, 'mil')).toBe('1.38 mil');
    expect(thickness(35e-6, 'mm')).toBe('0.0350 mm');
  });

  it('shows delay per length in the unit family of the lengths', () => {
    // arithmetic: 6.9 ns/m = 6.9 ps/mm = 175.26 ps/in (1 in = 25.4 mm, NIST SP 811)
    expect(delayPerLength(6.9e-9, 'mm')).toBe('6.90 ps/mm');
    expect(delayPerLength(6.9e-9, 'mil')).toBe('175.3 ps/in');
  });
});

describe('ohms, volts, dates, editable text', () => {
  it('shows ohms and volts with their units and a dash when missing', () => {
    // docs/design.md §8: Ω and V shown with the number
    expect(ohms(50)).toBe('50.0 Ω');
    expect(ohms(22.46, 0)).toBe('22 Ω');
    expect(ohms(null)).toBe(DASH);
    expect(volts(1.2)).toBe('1.200 V');
    expect(volts(undefined)).toBe(DASH);
    expect(volts(Number.NaN)).toBe(DASH);
  });

  it('says "never" without a solve time and gives back text that is not a date', () => {
    // common practice, no source
    expect(when(null)).toBe('never');
    expect(when('')).toBe('never');
    expect(when('not a date')).toBe('not a date');
    const shown = when('2026-03-14T09:26:53Z');
    expect(shown).toContain('2026');
    expect(shown).not.toContain('T09');
  });

  it('gives an editable value with its unit so it parses back to the same unit', () => {
    // renderer/src/lib/quantity-text.ts contract: a typed unit wins over the column's
    expect(editable(0.03175, 'mil', 1)).toBe('1250.0 mil');
    expect(editable(2.3e-10, 'ps', 1)).toBe('230.0 ps');
    expect(editable(22, 'Ω', 2)).toBe('22.00 Ω');
  });
});

describe('prose', () => {
  it('prints a minus before a number as U+2212 and leaves hyphens in words alone', () => {
    // Typography of the tables (margin() prints U+2212): one minus sign on every screen.
    expect(prose('hold margin -35 ps at fast-corner')).toBe('hold margin \u221235 ps at fast-corner');
    expect(prose('-0.2 V (limit -.3 V), a 10-90 % edge')).toBe('\u22120.2 V (limit \u2212.3 V), a 10-90 % edge');
  });
});
