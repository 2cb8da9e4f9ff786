/**
 * The IBIS parser on the invented fixture files (fixtures/ibis/, provenance in its README) and on
 * malformed text: every error names the file, line and keyword (ANSI/EIA-656 keyword rules: case
 * does not matter, "_" and " " are the same).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseIbis } from '../../../core/ibis/parse.js';
import { InputError } from '../../../core/errors.js';

const fixture = (name: string) => readFileSync(new URL(`../../../fixtures/ibis/${name}`, import.meta.url), 'utf8');

const MINIMAL = `[IBIS Ver] 4.2
[Comment char] #_char
# a comment line
[Component] TOY_1
[Manufacturer] Nobody (invented)
[Package]
R_pkg 0.2 NA NA
L_pkg 1.5nH 1nH 2nH
C_pkg 0.5pF NA NA
[Pin] signal_name model_name R_pin L_pin C_pin
1 D0 toy_in 0.1 1.1nH 0.4pF
2 GND GND
[Model] toy_in
Model_type Input
Vinl = 0.8
Vinh = 2.0
C_comp 2.0pF NA 2.5pF
[Voltage Range] 3.3 3.0 3.6
[GND_Clamp]
-3.3 -1.0 NA NA
 0.0  0.0 NA NA
 3.3  0.0 NA NA
[Algorithmic Model]
Executable Linux_gcc_64 toy.so toy.ami
[End Algorithmic Model]
[End]
`;

function error(text: string): InputError {
  try {
    parseIbis(text, 'bad.ibs');
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError');
}

describe('parseIbis on well-formed text', () => {
  it('reads component, package, pins, model, tables and suffixes', () => {
    const f = parseIbis(MINIMAL, 'toy.ibs');
    expect(f.version).toBe('4.2');
    expect(f.components[0].name).toBe('TOY_1');
    expect(f.components[0].package!.lPkg).toEqual({ typ: 1.5e-9, min: 1e-9, max: 2e-9 });
    expect(f.components[0].pins[0]).toMatchObject({ pin: '1', model: 'toy_in', rPin: 0.1, lPin: 1.1e-9 });
    const m = f.models[0];
    expect(m.modelType).toBe('Input');
    expect(m.cComp).toEqual({ typ: 2e-12, min: null, max: 2.5e-12 }); // NA -> null (typ used, standard's NA rule)
    expect(m.vinh).toBe(2.0);
    expect(m.gndClamp!.v).toEqual([-3.3, 0, 3.3]); // [GND_Clamp] = [GND Clamp]: "_" and " " are the same (standard)
    expect(m.gndClamp!.i.min).toBeNull();
    // [Comment char] #_char makes "#" the comment character.
    expect(f.skipped.map((s) => [s.line, s.keyword])).toEqual([[23, 'Algorithmic Model'], [25, 'End Algorithmic Model']]);
  });

  it('reads the invented controller and memory files', () => {
    const mc = parseIbis(fixture('wren_mc7.ibs'), 'wren_mc7.ibs');
    expect(mc.models.map((m) => m.name)).toEqual(['dq_drv40', 'dq_drv60', 'ck_ramp']);
    expect(mc.selectors[0].options.map((o) => o.model)).toEqual(['dq_drv40', 'dq_drv60']);
    const dq = mc.models[0];
    expect(dq.rising.length).toBe(2);
    expect(dq.falling.length).toBe(2);
    expect(dq.rising[1].fixture.vFixture).toEqual({ typ: 1.5, min: 1.425, max: 1.575 });
    expect(dq.ramp!.rLoad).toBe(50);
    expect(mc.models[2].rising.length).toBe(0);
    expect(mc.skipped).toEqual([]);
    const mem = parseIbis(fixture('heron_m4.ibs'), 'heron_m4.ibs');
    expect(mem.models[0].modelType).toBe('Input');
  });
});

describe('parseIbis on malformed text names file, line and keyword', () => {
  it('a row with a missing column', () => {
    const e = error(MINIMAL.replace(' 0.0  0.0 NA NA', ' 0.0  0.0 NA'));
    expect(e.where).toBe('bad.ibs line 21 [GND_Clamp]');
    expect(e.reason).toMatch(/expected 4 columns/);
  });
  it('a voltage column that is not monotonic', () => {
    const e = error(MINIMAL.replace(' 3.3  0.0 NA NA', '-0.5  0.0 NA NA'));
    expect(e.where).toBe('bad.ibs line 22 [GND_Clamp]');
    expect(e.reason).toMatch(/not monotonic/);
  });
  it('NA in the typ column', () => {
    const e = error(MINIMAL.replace(' 0.0  0.0 NA NA', ' 0.0  NA NA NA'));
    expect(e.where).toBe('bad.ibs line 21 [GND_Clamp]');
    expect(e.reason).toMatch(/typ column/);
  });
  it('NA where a typ value is required (C_comp)', () => {
    const e = error(MINIMAL.replace('C_comp 2.0pF NA 2.5pF', 'C_comp NA NA 2.5pF'));
    expect(e.where).toBe('bad.ibs line 17 [Model]');
    expect(e.reason).toMatch(/typ value is NA/);
  });
  it('an unknown model name in [Pin]', () => {
    const e = error(MINIMAL.replace('1 D0 toy_in', '1 D0 toy_out'));
    expect(e.where).toBe('bad.ibs line 11 [Pin]');
    expect(e.reason).toMatch(/unknown model name "toy_out"/);
  });
  it('a number that is not one, and a missing [IBIS Ver]', () => {
    expect(error(MINIMAL.replace('-3.3 -1.0 NA NA', '-3.3 -1.0x2 NA NA')).where).toBe('bad.ibs line 20 [GND_Clamp]');
    expect(error(MINIMAL.replace('[IBIS Ver] 4.2', '')).where).toBe('bad.ibs line 1 [IBIS Ver]');
  });
  it('an output model without [Pulldown]', () => {
    const e = error(MINIMAL.replace('Model_type Input', 'Model_type Output'));
    expect(e.where).toBe('bad.ibs line 13 [Model]');
    expect(e.reason).toMatch(/\[Pulldown\] is missing/);
  });
});
