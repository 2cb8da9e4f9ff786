/** Package of a pin as net elements (docs/ibis.md §4 "Package"; per-pin [Pin] values replace [Package], ANSI/EIA-656). */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseIbis } from '../../../core/ibis/parse.js';
import { packageElements, pinPackage } from '../../../core/ibis/package.js';

const mc = parseIbis(readFileSync(new URL('../../../fixtures/ibis/wren_mc7.ibs', import.meta.url), 'utf8'), 'wren_mc7.ibs').components[0];

describe('pin package', () => {
  it('uses [Package] at the corner where the pin gives none', () => {
    // wren_mc7.ibs [Package]: R_pkg 0.25 0.2 0.3, L_pkg 2.4nH 2.0nH 2.8nH, C_pkg 0.9pF 0.8pF 1.0pF.
    const p = pinPackage(mc, 'A1', 'max');
    expect(p).toMatchObject({ rPkg: 0.3, from: 'package' });
    expect(p.lPkg).toBeCloseTo(2.8e-9, 20);
    expect(p.cPkg).toBeCloseTo(1e-12, 24);
  });
  it('uses the per-pin values of [Pin] where given', () => {
    // wren_mc7.ibs [Pin] A2: 0.21 2.1nH 0.85pF.
    const p = pinPackage(mc, 'A2', 'min');
    expect(p).toMatchObject({ rPkg: 0.21, from: 'pin' });
    expect(p.lPkg).toBeCloseTo(2.1e-9, 20);
  });
  it('writes R and L in series and C at the pin', () => {
    const e = packageElements(pinPackage(mc, 'A1', 'typ'), 'pad', 'pin');
    expect(e.map((x) => [x.kind, x.a, 'b' in x ? x.b : null])).toEqual([
      ['resistor', 'pad', 'pad#pkg'], ['inductor', 'pad#pkg', 'pin'], ['capacitor', 'pin', 'gnd'],
    ]);
  });
  it('names a pin that is not there', () => {
    expect(() => pinPackage(mc, 'Z9', 'typ')).toThrow(/no pin "Z9"/);
  });
});
